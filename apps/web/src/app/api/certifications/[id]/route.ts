import { DomainError, canOnCertification, getCertification, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { cardFor } from "../_lib/card-access";

/** One card with its history of corrections, if the signed-in person may read it, and what they may do to it. */
export const GET = route<undefined, undefined, { id: string }>(
  { can: ["read", "Certification"] },
  async ({ actor, ability, db, params }) => {
    const ref = await cardFor(db, actor, ability, params.id, "read");
    const card = await getCertification(db, { scope: scopeByAbility(ability, "read", "Certification", "certifications"), id: ref.id });
    if (!card) throw new DomainError("not_found", "No such certification card");
    const open = !card.voidedAt;
    return {
      ...card,
      can: {
        verify: open && card.state === "pending" && card.userId !== actor.userId && canOnCertification(ability, "verify", ref),
        correct: open && canOnCertification(ability, "update", ref),
        withdraw: open && canOnCertification(ability, "void", ref),
      },
    };
  },
);
