import { ForbiddenError, subject } from "@casl/ability";
import { jobAmendmentInput } from "@coldtrail/core";
import { amendJob, DomainError, getJob, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../_lib/record-route-helpers";

/** One job, if the signed-in person may read it; otherwise 404 (we do not reveal that it exists). */
export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Job"] }, async ({ ability, db, params }) => {
  const id = recordId(params.id, "No such job");
  const job = await getJob(db, { scope: scopeByAbility(ability, "read", "Job", "jobs"), id });
  if (!job) throw new DomainError("not_found", "No such job");
  return job;
});

/**
 * Correct a job by amendment (a reason is required; the previous values are kept and shown).
 * The job's technician may correct their own jobs, the branch manager any job of the branch.
 */
export const PATCH = route<undefined, typeof jobAmendmentInput, { id: string }>(
  { can: ["update", "Job"], body: jobAmendmentInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such job");
    const job = await getJob(db, { scope: scopeByAbility(ability, "read", "Job", "jobs"), id });
    if (!job) throw new DomainError("not_found", "No such job");
    ForbiddenError.from(ability).throwUnlessCan(
      "update",
      subject("Job", {
        organisationId: job.organisationId,
        branchId: job.branchId,
        technicianId: job.technicianId,
        performedOn: job.performedOn,
      }),
    );
    const amendmentId = await amendJob(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id, input: body });
    return { id, amendmentId };
  },
);
