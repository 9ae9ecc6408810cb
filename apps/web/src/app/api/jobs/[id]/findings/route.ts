import { DomainError, listFindingsOfRecord, scopeByAbility, type Knex } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { idParams } from "@/lib/api/params";

/**
 * The findings a job raised or closed (its own, and those the re-checks after its writes opened or
 * closed), limited to the findings the signed-in person may read. 404 when the job cannot be read.
 */
export const GET = route({ can: ["read", "Job"], params: idParams("id") }, async ({ actor, ability, db, params }) => {
  const id = params.id;
  const jobScope = scopeByAbility(ability, "read", "Job", "jobs");
  const job = await db("jobs")
    .where("jobs.id", id)
    .where(function inScope(this: Knex.QueryBuilder) {
      jobScope(this);
    })
    .first("jobs.id");
  if (!job) throw new DomainError("not_found", "No such job");
  const rows = await listFindingsOfRecord(db, {
    scope: scopeByAbility(ability, "read", "Finding", "findings"),
    organisationId: actor.organisationId,
    recordType: "job",
    recordId: id,
    subjectTypes: ["job", "Job"],
  });
  return { rows };
});
