import { ForbiddenError, subject } from "@casl/ability";
import { shipmentAmendmentInput } from "@coldtrail/core";
import { amendShipment, DomainError, getShipment, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../jobs/_lib/record-route-helpers";

export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "ReclaimShipment"] }, async ({ ability, db, params }) => {
  const id = recordId(params.id, "No such shipment");
  const shipment = await getShipment(db, { scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"), id });
  if (!shipment) throw new DomainError("not_found", "No such shipment");
  return shipment;
});

export const PATCH = route<undefined, typeof shipmentAmendmentInput, { id: string }>(
  { can: ["update", "ReclaimShipment"], body: shipmentAmendmentInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such shipment");
    const shipment = await getShipment(db, { scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"), id });
    if (!shipment) throw new DomainError("not_found", "No such shipment");
    ForbiddenError.from(ability).throwUnlessCan(
      "update",
      subject("ReclaimShipment", { organisationId: shipment.organisationId, branchId: shipment.branchId }),
    );
    const amendmentId = await amendShipment(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id, input: body });
    return { id, amendmentId };
  },
);
