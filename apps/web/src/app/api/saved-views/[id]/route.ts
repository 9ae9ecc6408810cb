import { deleteSavedView } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { pathId } from "../../findings/_lib/access";

/** Delete one of one's own saved views. */
export const DELETE = route<undefined, undefined, { id: string }>({ can: ["read", "Finding"] }, async ({ actor, db, params }) => {
  await deleteSavedView(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: pathId(params.id, "saved view") });
  return { deleted: true };
});
