import { acceptFindingInput } from "@coldtrail/core";
import { acceptFindingFix, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { pathId } from "../../_lib/access";

/** The compliance officer accepts the proposed fix; the finding is closed. */
export const POST = route<undefined, typeof acceptFindingInput, { id: string }>(
  { can: ["accept", "Finding"], body: acceptFindingInput },
  async ({ actor, ability, db, params, body }) => {
    const res = await acceptFindingFix(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      scope: scopeByAbility(ability, "accept", "Finding", "findings"),
      id: pathId(params.id, "finding"),
      note: body.note ?? null,
    });
    // Acceptance is told in the app only (no e-mail).
    return { id: res.id, state: res.state };
  },
);
