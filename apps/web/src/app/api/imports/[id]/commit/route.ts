import { startImportCommit, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { importFor } from "../../_lib/import-access";
import { queueCommit } from "../../_lib/import-worker";

/** Imports the valid rows (checked again) in one transaction, in the background. */
export const POST = route<undefined, undefined, { id: string }>({ can: ["create", "Import"] }, async ({ actor, ability, db, params }) => {
  const detail = await importFor(db, actor, ability, params.id, "create");
  const ref = { userId: actor.userId, organisationId: actor.organisationId };
  await writeTransaction(db, async (trx) => {
    await startImportCommit(trx, { actor: ref, id: detail.id });
    await queueCommit(trx, detail.id, ref);
  });
  return { id: detail.id, state: "importing" };
});
