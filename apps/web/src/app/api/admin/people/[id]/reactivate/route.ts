import { ForbiddenError, subject } from "@casl/ability";
import { setPersonActive } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { visiblePerson } from "../../_shared";

/** Let a deactivated person sign in again. */
export const POST = route<undefined, undefined, { id: string }>({ can: ["update", "User"] }, async ({ actor, ability, db, params }) => {
  const person = await visiblePerson(db, ability, params.id);
  ForbiddenError.from(ability).throwUnlessCan("update", subject("User", { organisationId: person.organisationId, id: person.id }));
  await setPersonActive(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: person.id, active: true });
  return visiblePerson(db, ability, params.id);
});
