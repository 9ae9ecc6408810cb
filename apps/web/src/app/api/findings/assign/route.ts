import { assignFindingsInput } from "@coldtrail/core";
import { assignFindings, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { deliverFindingMailLater } from "@/lib/server/finding-mail";

/** Assign one or many findings to a branch manager (or take the assignment away). Officers and owners. */
export const POST = route({ can: ["assign", "Finding"], body: assignFindingsInput }, async ({ actor, ability, db, body }) => {
  const res = await assignFindings(db, {
    actor: { userId: actor.userId, organisationId: actor.organisationId },
    scope: scopeByAbility(ability, "assign", "Finding", "findings"),
    findingIds: body.findingIds,
    assigneeId: body.assigneeId,
  });
  deliverFindingMailLater(db, res.notificationIds);
  return { assigned: res.assigned };
});
