import { registerVoidInput } from "@coldtrail/core";
import { voidCylinderWeighing } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeRegisterRecord, parseId } from "../../../../../appliances/_shared/register-access";

/** Voids a weighing entered in error, with the reason; nothing is deleted. */
export const POST = route<undefined, typeof registerVoidInput, { id: string; weighingId: string }>(
  { can: ["update", "Cylinder"], body: registerVoidInput },
  async ({ actor, ability, db, body, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "cylinder", params.id, "update");
    const weighingId = parseId(params.weighingId, "weighing");
    await voidCylinderWeighing(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      cylinderId: ref.id,
      weighingId,
      reason: body.reason,
    });
    return { ok: true };
  },
);
