import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { jobInput, jobListQuery } from "@coldtrail/core";
import { createJob, DomainError, getApplianceRef, listJobs, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Jobs the signed-in person may read, one page at a time. Voided jobs only when `voided` asks. */
export const GET = route({ can: ["read", "Job"], query: jobListQuery }, async ({ ability, db, query }) => {
  return listJobs(db, { scope: scopeByAbility(ability, "read", "Job", "jobs"), query });
});

/** Log a job of any kind (recovery, charge, leak repair, verification test, disposal). The technician on the job is the person signed in. */
export const POST = route({ idempotent: true, can: ["create", "Job"], body: jobInput }, async ({ actor, ability, db, body }) => {
  const appliance = await getApplianceRef(db, { organisationId: actor.organisationId, id: body.applianceId });
  if (!appliance) {
    throw new DomainError("invalid", "That appliance is not in your organisation's register", "applianceId");
  }
  ForbiddenError.from(ability).throwUnlessCan(
    "create",
    subject("Job", {
      organisationId: actor.organisationId,
      branchId: appliance.branchId,
      technicianId: actor.userId,
      performedOn: body.performedOn,
    }),
  );
  const id = await createJob(db, {
    actor: { userId: actor.userId, organisationId: actor.organisationId },
    branchId: appliance.branchId,
    input: body,
  });
  // Continuous audit: route() re-checks the branch's findings in the background after the save.
  return NextResponse.json({ id }, { status: 201 });
});
