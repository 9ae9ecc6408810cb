import { assignFindingsInput } from "@coldtrail/core";
import { assignFindings, scopeByAbility, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { queueFindingMail } from "@/lib/server/finding-mail";
import { kickTaskRunner } from "@/lib/server/task-kick";

/** Assign one or many findings to a branch manager (or take the assignment away). Officers and owners. */
export const POST = route({ can: ["assign", "Finding"], body: assignFindingsInput }, async ({ actor, ability, db, body }) => {
  const res = await writeTransaction(db, async (trx) => {
    const r = await assignFindings(trx, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      scope: scopeByAbility(ability, "assign", "Finding", "findings"),
      findingIds: body.findingIds,
      assigneeId: body.assigneeId,
    });
    await queueFindingMail(trx, r.notificationIds);
    return r;
  });
  kickTaskRunner();
  return { assigned: res.assigned };
});
