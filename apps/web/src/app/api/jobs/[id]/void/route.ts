import { ForbiddenError, subject } from "@casl/ability";
import { voidRecordInput } from "@coldtrail/core";
import { DomainError, getJob, scopeByAbility, voidJob } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../_lib/record-route-helpers";

/** Void a job entered in error, with a reason. The row and its history stay; its refrigerant leaves the cylinders again. */
export const POST = route<undefined, typeof voidRecordInput, { id: string }>(
  { can: ["void", "Job"], body: voidRecordInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such job");
    const job = await getJob(db, { scope: scopeByAbility(ability, "read", "Job", "jobs"), id });
    if (!job) throw new DomainError("not_found", "No such job");
    ForbiddenError.from(ability).throwUnlessCan(
      "void",
      subject("Job", {
        organisationId: job.organisationId,
        branchId: job.branchId,
        technicianId: job.technicianId,
        performedOn: job.performedOn,
      }),
    );
    await voidJob(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id, reason: body.reason });
    return { id, voided: true };
  },
);
