import { cancelImport } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { importFor } from "../../_lib/import-access";

/** Cancels an import that has not been written; nothing is imported. */
export const POST = route<undefined, undefined, { id: string }>({ can: ["create", "Import"] }, async ({ actor, ability, db, params }) => {
  const detail = await importFor(db, actor, ability, params.id, "create");
  await cancelImport(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: detail.id });
  return { id: detail.id, state: "cancelled" };
});
