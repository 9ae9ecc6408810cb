import { cylinderUpdateInput } from "@coldtrail/core";
import { DomainError, getCylinder, listCylinderAmendments, listRegisterActivity, scopeByAbility, updateCylinder } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeRegisterRecord, parseId, registerPermissions } from "../../appliances/_shared/register-access";

type Params = { id: string };

/** One cylinder with its fill and requalification (rules core), corrections and, where allowed, activity. */
export const GET = route<undefined, undefined, Params>({ can: ["read", "Cylinder"] }, async ({ ability, db, params }) => {
  const id = parseId(params.id, "cylinder");
  const cylinder = await getCylinder(db, { scope: scopeByAbility(ability, "read", "Cylinder", "cylinders"), id });
  if (!cylinder) throw new DomainError("not_found", "No such cylinder");
  const permissions = registerPermissions(ability, "cylinder", cylinder);
  const [amendments, activity] = await Promise.all([
    listCylinderAmendments(db, { organisationId: cylinder.organisationId, cylinderId: id }),
    permissions.readActivity
      ? listRegisterActivity(db, { organisationId: cylinder.organisationId, subjectType: "Cylinder", subjectId: id })
      : null,
  ]);
  return { cylinder, amendments, activity, permissions };
});

/** Edits a cylinder; a new water capacity, tare or requalification date is kept as an amendment. */
export const PATCH = route<undefined, typeof cylinderUpdateInput, Params>(
  { can: ["update", "Cylinder"], body: cylinderUpdateInput },
  async ({ actor, ability, db, body, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "cylinder", params.id, "update");
    return updateCylinder(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: ref.id, input: body });
  },
);
