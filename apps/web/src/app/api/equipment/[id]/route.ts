import { equipmentUpdateInput } from "@coldtrail/core";
import { DomainError, getEquipment, listAmendments, listRegisterActivity, scopeByAbility, updateEquipment } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeRegisterRecord, parseId, registerPermissions } from "../../appliances/_shared/register-access";

type Params = { id: string };

/** One recovery unit with its corrections and, for those who may read it, its activity. */
export const GET = route<undefined, undefined, Params>({ can: ["read", "RecoveryEquipment"] }, async ({ ability, db, params }) => {
  const id = parseId(params.id, "recovery equipment");
  const equipment = await getEquipment(db, { scope: scopeByAbility(ability, "read", "RecoveryEquipment", "recovery_equipment"), id });
  if (!equipment) throw new DomainError("not_found", "No such recovery equipment");
  const permissions = registerPermissions(ability, "equipment", equipment);
  const [amendments, activity] = await Promise.all([
    listAmendments(db, { organisationId: equipment.organisationId, subjectType: "RecoveryEquipment", subjectId: id }),
    permissions.readActivity
      ? listRegisterActivity(db, { organisationId: equipment.organisationId, subjectType: "RecoveryEquipment", subjectId: id })
      : null,
  ]);
  return { equipment, amendments, activity, permissions };
});

/** Edits a recovery unit; a new manufacture date or certification status is kept as an amendment. */
export const PATCH = route<undefined, typeof equipmentUpdateInput, Params>(
  { can: ["update", "RecoveryEquipment"], body: equipmentUpdateInput },
  async ({ actor, ability, db, body, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "equipment", params.id, "update");
    return updateEquipment(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: ref.id, input: body });
  },
);
