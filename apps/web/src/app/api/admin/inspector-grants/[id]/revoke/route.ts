import { ForbiddenError, subject } from "@casl/ability";
import { DomainError, getInspectorGrantRef, revokeInspectorGrant } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../../_lib/params";

/** Withdraw an inspector's access at once. */
export const POST = route<undefined, undefined, { id: string }>(
  { can: ["update", "InspectorGrant"] },
  async ({ actor, ability, db, params }) => {
    const id = recordId(params.id, "inspector access");
    const grant = await getInspectorGrantRef(db, id);
    if (!grant || !ability.can("read", subject("InspectorGrant", { ...grant })))
      throw new DomainError("not_found", "No such inspector access");
    ForbiddenError.from(ability).throwUnlessCan("update", subject("InspectorGrant", { ...grant }));
    await revokeInspectorGrant(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id });
    return { id, revoked: true };
  },
);
