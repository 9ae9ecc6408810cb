import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { reclaimShipmentInput, shipmentListQuery } from "@coldtrail/core";
import { createShipment, listShipments, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Reclaim shipments the signed-in person may read, one page at a time. */
export const GET = route({ can: ["read", "ReclaimShipment"], query: shipmentListQuery }, async ({ ability, db, query }) => {
  return listShipments(db, { scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"), query });
});

/** Record cylinders sent to a reclaimer; each ships its recorded contents and is emptied. */
export const POST = route(
  { idempotent: true, can: ["create", "ReclaimShipment"], body: reclaimShipmentInput },
  async ({ actor, ability, db, body }) => {
    ForbiddenError.from(ability).throwUnlessCan(
      "create",
      subject("ReclaimShipment", { organisationId: actor.organisationId, branchId: body.branchId }),
    );
    const id = await createShipment(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
    return NextResponse.json({ id }, { status: 201 });
  },
);
