import { waiveFindingInput } from "@coldtrail/core";
import { scopeByAbility, waiveFinding, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { queueFindingMail } from "@/lib/server/finding-mail";
import { kickTaskRunner } from "@/lib/server/task-kick";
import { pathId } from "../../_lib/access";

/** The compliance officer decides no fix is needed; the reason is required. */
export const POST = route<undefined, typeof waiveFindingInput, { id: string }>(
  { can: ["waive", "Finding"], body: waiveFindingInput },
  async ({ actor, ability, db, params, body }) => {
    const res = await writeTransaction(db, async (trx) => {
      const r = await waiveFinding(trx, {
        actor: { userId: actor.userId, organisationId: actor.organisationId },
        scope: scopeByAbility(ability, "waive", "Finding", "findings"),
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
