import { ForbiddenError, subject } from "@casl/ability";
import { setPersonActive } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { visiblePerson } from "../../_shared";

/** Deactivate a person: they can no longer sign in; their records and history stay. */
export const POST = route<undefined, undefined, { id: string }>({ can: ["update", "User"] }, async ({ actor, ability, db, params }) => {
  const person = await visiblePerson(db, ability, params.id);
  ForbiddenError.from(ability).throwUnlessCan("update", subject("User", { organisationId: person.organisationId, id: person.id }));
  await setPersonActive(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: person.id, active: false });
  return visiblePerson(db, ability, params.id);
});
