import { certificationWithdrawInput } from "@coldtrail/core";
import { withdrawCertification } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { cardFor } from "../../_lib/card-access";

/** Withdraws a card entered in error (voided with a reason; its row and history stay). */
export const POST = route<undefined, typeof certificationWithdrawInput, { id: string }>(
  { can: ["void", "Certification"], body: certificationWithdrawInput },
  async ({ actor, ability, db, params, body }) => {
    const ref = await cardFor(db, actor, ability, params.id, "void");
    await withdrawCertification(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id: ref.id,
      reason: body.reason,
    });
    return { id: ref.id, withdrawn: true };
  },
);
