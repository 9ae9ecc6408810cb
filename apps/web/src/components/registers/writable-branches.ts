import "server-only";
import { subject } from "@casl/ability";
import type { Actor, AppAbility, SubjectName } from "@coldtrail/core";
import { listBranches, type Knex } from "@coldtrail/db";

/** Branches where the person may add a record of `subject` (for the branch picker of a form). */
export async function writableBranches(db: Knex, actor: Actor, ability: AppAbility, subjectName: SubjectName) {
  const branches = await listBranches(db, { organisationId: actor.organisationId });
  return branches
    .filter((b) => ability.can("create", subject(subjectName, { organisationId: actor.organisationId, branchId: b.id })))
    .map((b) => ({ id: b.id, name: b.name, massUnit: b.massUnit, timeZone: b.timeZone }));
}
