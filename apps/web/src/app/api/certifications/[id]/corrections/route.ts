import { certificationCorrectionInput } from "@coldtrail/core";
import { correctCertification } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { cardFor } from "../../_lib/card-access";

/** Corrects a card's details: an amendment with the reason and the previous values. */
export const POST = route<undefined, typeof certificationCorrectionInput, { id: string }>(
  { can: ["update", "Certification"], body: certificationCorrectionInput },
  async ({ actor, ability, db, params, body }) => {
    const ref = await cardFor(db, actor, ability, params.id, "update");
    const amendmentId = await correctCertification(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id: ref.id,
      input: body,
    });
    return { id: ref.id, amendmentId };
  },
);
