import { ForbiddenError, subject } from "@casl/ability";
import { voidRecordInput } from "@coldtrail/core";
import { DomainError, getShipment, scopeByAbility, voidShipment } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../../jobs/_lib/record-route-helpers";

/** Void a shipment entered in error: the cylinders get their contents back on record. */
export const POST = route<undefined, typeof voidRecordInput, { id: string }>(
  { can: ["void", "ReclaimShipment"], body: voidRecordInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such shipment");
    const shipment = await getShipment(db, { scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"), id });
    if (!shipment) throw new DomainError("not_found", "No such shipment");
    ForbiddenError.from(ability).throwUnlessCan(
      "void",
      subject("ReclaimShipment", { organisationId: shipment.organisationId, branchId: shipment.branchId }),
    );
    await voidShipment(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id, reason: body.reason });
    return { id, voided: true };
  },
);
