import { ForbiddenError, subject } from "@casl/ability";
import { personAccessInput } from "@coldtrail/core";
import { updatePersonAccess } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { visiblePerson } from "../_shared";

type Params = { id: string };

/** One person: roles, branches, status and any invitation still waiting. */
export const GET = route<undefined, undefined, Params>({ can: ["read", "User"] }, async ({ ability, db, params }) => {
  return visiblePerson(db, ability, params.id);
});

/** Replace a person's roles and branches (the last-owner and self-promotion guards live in the database layer). */
export const PATCH = route<undefined, typeof personAccessInput, Params>(
  { can: ["update", "Membership"], body: personAccessInput },
  async ({ actor, ability, db, body, params }) => {
    const person = await visiblePerson(db, ability, params.id);
    ForbiddenError.from(ability).throwUnlessCan(
      "update",
      subject("Membership", { organisationId: person.organisationId, userId: person.id }),
    );
    await updatePersonAccess(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: person.id, input: body });
    return visiblePerson(db, ability, params.id);
  },
);
