import "server-only";
import { recordIdSchema } from "@/lib/api/params";
import { ForbiddenError, subject } from "@casl/ability";
import type { Action, Actor, AppAbility, ImportKind, SubjectName } from "@coldtrail/core";
import { DomainError, getImport, scopeByAbility, type ImportDetail, type Knex } from "@coldtrail/db";

/** The register an import writes into, for the permission check of each row's record. */
export const RECORD_SUBJECT: Record<ImportKind, SubjectName> = { appliances: "Appliance", cylinders: "Cylinder", jobs: "Job" };

/** Importing needs `create` on the import and on the records it writes, in that branch. */
export function assertMayImport(ability: AppAbility, actor: Actor, kind: ImportKind, branchId: number): void {
  // A fresh object for each check: CASL's subject() tags the object it is given with its type.
  const where = () => ({ organisationId: actor.organisationId, branchId });
  ForbiddenError.from(ability).throwUnlessCan("create", subject("Import", where()));
  ForbiddenError.from(ability).throwUnlessCan("create", subject(RECORD_SUBJECT[kind], where()));
}

/** The import named in the URL if the person may read it (404 otherwise); with `action` "create" also the import permission. */
export async function importFor(
  db: Knex,
  actor: Actor,
  ability: AppAbility,
  rawId: string,
  action: Action = "read",
): Promise<ImportDetail> {
  const id = recordIdSchema.safeParse(rawId);
  if (!id.success) throw new DomainError("not_found", "No such import");
  const detail = await getImport(db, { scope: scopeByAbility(ability, "read", "Import", "imports"), id: id.data });
  if (!detail) throw new DomainError("not_found", "No such import");
  if (action === "create") assertMayImport(ability, actor, detail.kind, detail.branchId);
  return detail;
}
