import { notificationListQuery } from "@coldtrail/core";
import { listNotifications } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/**
 * The signed-in person's own notifications, newest first. An inbox is personal: the query is pinned
 * to the person's user id and organisation, for every role. Anyone signed in with a role may read theirs.
 */
export const GET = route({ can: ["read", "Branch"], query: notificationListQuery }, async ({ actor, db, query }) => {
  return listNotifications(db, {
    userId: actor.userId,
    organisationId: actor.organisationId,
    page: query.page,
    pageSize: query.pageSize,
    unreadOnly: query.unread,
  });
});
