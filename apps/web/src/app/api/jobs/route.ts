import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { jobListQuery, recoveryJobInput } from "@coldtrail/core";
import { createRecoveryJob, DomainError, getApplianceRef, listJobs, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Jobs the signed-in person may read, one page at a time. */
export const GET = route({ can: ["read", "Job"], query: jobListQuery }, async ({ ability, db, query }) => {
  return listJobs(db, { scope: scopeByAbility(ability, "read", "Job", "jobs"), query });
});

/** Log a recovery job. The technician on the job is the person signed in. */
export const POST = route({ can: ["create", "Job"], body: recoveryJobInput }, async ({ actor, ability, db, body }) => {
  const appliance = await getApplianceRef(db, { organisationId: actor.organisationId, id: body.applianceId });
  if (!appliance) {
    throw new DomainError("invalid", "That appliance is not in your organisation's register", "applianceId");
  }
  ForbiddenError.from(ability).throwUnlessCan(
    "create",
    subject("Job", { organisationId: actor.organisationId, branchId: appliance.branchId, technicianId: actor.userId }),
  );
  const id = await createRecoveryJob(db, {
    actor: { userId: actor.userId, organisationId: actor.organisationId },
    branchId: appliance.branchId,
    input: body,
  });
  return NextResponse.json({ id }, { status: 201 });
});
