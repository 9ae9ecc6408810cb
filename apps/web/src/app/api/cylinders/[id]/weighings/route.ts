import { NextResponse } from "next/server";
import { cylinderWeighingInput, registerHistoryQuery } from "@coldtrail/core";
import { listCylinderWeighings, recordCylinderWeighing } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeRegisterRecord } from "../../../appliances/_shared/register-access";

type Params = { id: string };

/** A cylinder's weighings, newest first (voided ones marked). */
export const GET = route<typeof registerHistoryQuery, undefined, Params>(
  { can: ["read", "Cylinder"], query: registerHistoryQuery },
  async ({ actor, ability, db, query, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "cylinder", params.id, "read");
    return listCylinderWeighings(db, { cylinderId: ref.id, query });
  },
);

/** Records a scale reading: net contents = reading − tare. */
export const POST = route<undefined, typeof cylinderWeighingInput, Params>(
  { idempotent: true, can: ["update", "Cylinder"], body: cylinderWeighingInput },
  async ({ actor, ability, db, body, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "cylinder", params.id, "update");
    const result = await recordCylinderWeighing(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      cylinderId: ref.id,
      input: body,
    });
    return NextResponse.json(result, { status: 201 });
  },
);
