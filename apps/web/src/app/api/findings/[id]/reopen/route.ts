import { reopenFindingInput } from "@coldtrail/core";
import { reopenFinding, scopeByAbility, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { queueFindingMail } from "@/lib/server/finding-mail";
import { kickTaskRunner } from "@/lib/server/task-kick";
import { pathId } from "../../_lib/access";

/** The compliance officer sends a finding back to open, with the reason. */
export const POST = route<undefined, typeof reopenFindingInput, { id: string }>(
  { can: ["reopen", "Finding"], body: reopenFindingInput },
  async ({ actor, ability, db, params, body }) => {
    const res = await writeTransaction(db, async (trx) => {
      const r = await reopenFinding(trx, {
        actor: { userId: actor.userId, organisationId: actor.organisationId },
        scope: scopeByAbility(ability, "reopen", "Finding", "findings"),
        id: pathId(params.id, "finding"),
        reason: body.reason,
      });
      await queueFindingMail(trx, r.notificationIds);
      return r;
    });
    kickTaskRunner();
    return { id: res.id, state: res.state };
  },
);
