import { ForbiddenError, subject } from "@casl/ability";
import { voidRecordInput } from "@coldtrail/core";
import { DomainError, getPurchase, scopeByAbility, voidPurchase } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../../jobs/_lib/record-route-helpers";

export const POST = route<undefined, typeof voidRecordInput, { id: string }>(
  { can: ["void", "Purchase"], body: voidRecordInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such purchase");
    const purchase = await getPurchase(db, { scope: scopeByAbility(ability, "read", "Purchase", "p"), id });
    if (!purchase) throw new DomainError("not_found", "No such purchase");
    ForbiddenError.from(ability).throwUnlessCan(
      "void",
      subject("Purchase", { organisationId: purchase.organisationId, branchId: purchase.branchId }),
    );
    await voidPurchase(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id, reason: body.reason });
    return { id, voided: true };
  },
);
