import { route } from "@/lib/api/route";
import { sendDailyDigests } from "@/lib/server/finding-mail";
import { kickTaskRunner } from "@/lib/server/task-kick";

/**
 * Sends the signed-in person today's digest now (findings theirs that are overdue or due within 7
 * days), unless they already had it today. The daily scheduler sends everyone theirs.
 */
export const POST = route({ can: ["read", "Finding"] }, async ({ actor, db }) => {
  const res = await sendDailyDigests(db, { onlyUserId: actor.userId, organisationIds: [actor.organisationId] });
  kickTaskRunner();
  return { sent: res.sent };
});
