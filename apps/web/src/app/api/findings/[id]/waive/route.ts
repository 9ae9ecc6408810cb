import { waiveFindingInput } from "@coldtrail/core";
import { scopeByAbility, waiveFinding } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { deliverFindingMailLater } from "@/lib/server/finding-mail";
import { pathId } from "../../_lib/access";

/** The compliance officer decides no fix is needed; the reason is required. */
export const POST = route<undefined, typeof waiveFindingInput, { id: string }>(
  { can: ["waive", "Finding"], body: waiveFindingInput },
  async ({ actor, ability, db, params, body }) => {
    const res = await waiveFinding(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      scope: scopeByAbility(ability, "waive", "Finding", "findings"),
      id: pathId(params.id, "finding"),
      reason: body.reason,
    });
    deliverFindingMailLater(db, res.notificationIds);
    return { id: res.id, state: res.state };
  },
);
