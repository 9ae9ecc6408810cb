import { cylinderWeighingAmendInput } from "@coldtrail/core";
import { amendCylinderWeighing } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeRegisterRecord, parseId } from "../../../../appliances/_shared/register-access";

/** Corrects a weighing by amendment: the previous values and the reason stay in its history. */
export const PATCH = route<undefined, typeof cylinderWeighingAmendInput, { id: string; weighingId: string }>(
  { can: ["update", "Cylinder"], body: cylinderWeighingAmendInput },
  async ({ actor, ability, db, body, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "cylinder", params.id, "update");
    const weighingId = parseId(params.weighingId, "weighing");
    const amendmentId = await amendCylinderWeighing(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      cylinderId: ref.id,
      weighingId,
      input: body,
    });
    return { amendmentId };
  },
);
