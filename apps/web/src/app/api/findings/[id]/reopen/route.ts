import { reopenFindingInput } from "@coldtrail/core";
import { reopenFinding, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { deliverFindingMailLater } from "@/lib/server/finding-mail";
import { pathId } from "../../_lib/access";

/** The compliance officer sends a finding back to open, with the reason. */
export const POST = route<undefined, typeof reopenFindingInput, { id: string }>(
  { can: ["reopen", "Finding"], body: reopenFindingInput },
  async ({ actor, ability, db, params, body }) => {
    const res = await reopenFinding(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      scope: scopeByAbility(ability, "reopen", "Finding", "findings"),
      id: pathId(params.id, "finding"),
      reason: body.reason,
    });
    deliverFindingMailLater(db, res.notificationIds);
    return { id: res.id, state: res.state };
  },
);
