import "server-only";
import { recordIdSchema } from "@/lib/api/params";
import type { Action, Actor, AppAbility } from "@coldtrail/core";
import {
  ActionForbiddenError,
  DomainError,
  canOnCertification,
  getCertificationRef,
  type CertificationRef,
  type Knex,
} from "@coldtrail/db";

/**
 * The card named in the URL, when the person may read it (404 otherwise: we do not reveal that it
 * exists) and may do `action` to it (403 otherwise).
 */
export async function cardFor(db: Knex, actor: Actor, ability: AppAbility, rawId: string, action: Action): Promise<CertificationRef> {
  const id = recordIdSchema.safeParse(rawId);
  if (!id.success) throw new DomainError("not_found", "No such certification card");
  const ref = await getCertificationRef(db, { organisationId: actor.organisationId, id: id.data });
  if (!ref || !canOnCertification(ability, "read", ref)) throw new DomainError("not_found", "No such certification card");
  if (action !== "read" && !canOnCertification(ability, action, ref)) {
    throw new ActionForbiddenError(
      action === "update" && ref.userId === actor.userId
        ? "A card can be corrected by its holder only while it awaits verification"
        : "You do not have permission to do that",
    );
  }
  return ref;
}
