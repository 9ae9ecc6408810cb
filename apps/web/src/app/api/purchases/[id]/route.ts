import { ForbiddenError, subject } from "@casl/ability";
import { purchaseAmendmentInput } from "@coldtrail/core";
import { amendPurchase, DomainError, getPurchase, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../jobs/_lib/record-route-helpers";

export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Purchase"] }, async ({ ability, db, params }) => {
  const id = recordId(params.id, "No such purchase");
  const purchase = await getPurchase(db, { scope: scopeByAbility(ability, "read", "Purchase", "p"), id });
  if (!purchase) throw new DomainError("not_found", "No such purchase");
  return purchase;
});

export const PATCH = route<undefined, typeof purchaseAmendmentInput, { id: string }>(
  { can: ["update", "Purchase"], body: purchaseAmendmentInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such purchase");
    const purchase = await getPurchase(db, { scope: scopeByAbility(ability, "read", "Purchase", "p"), id });
    if (!purchase) throw new DomainError("not_found", "No such purchase");
    ForbiddenError.from(ability).throwUnlessCan(
      "update",
      subject("Purchase", { organisationId: purchase.organisationId, branchId: purchase.branchId }),
    );
    const amendmentId = await amendPurchase(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id, input: body });
    return { id, amendmentId };
  },
);
