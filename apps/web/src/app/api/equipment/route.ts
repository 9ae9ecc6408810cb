import { NextResponse } from "next/server";
import { equipmentInput, equipmentListQuery } from "@coldtrail/core";
import { createEquipment, listEquipment, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeCreateInBranch } from "../appliances/_shared/register-access";

/** The recovery-equipment register, one page at a time. */
export const GET = route({ can: ["read", "RecoveryEquipment"], query: equipmentListQuery }, async ({ ability, db, query }) => {
  return listEquipment(db, { scope: scopeByAbility(ability, "read", "RecoveryEquipment", "recovery_equipment"), query });
});

/** Adds a recovery unit to a branch's register. */
export const POST = route(
  { idempotent: true, can: ["create", "RecoveryEquipment"], body: equipmentInput },
  async ({ actor, ability, db, body }) => {
    authorizeCreateInBranch(ability, actor, "equipment", body.branchId);
    const id = await createEquipment(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
    return NextResponse.json({ id }, { status: 201 });
  },
);
