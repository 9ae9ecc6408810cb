import { notificationReadInput } from "@coldtrail/core";
import { markNotificationsRead } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Marks some or all of the signed-in person's notifications read (only their own). */
export const POST = route({ can: ["read", "Branch"], body: notificationReadInput }, async ({ actor, db, body }) => {
  const changed = await markNotificationsRead(db, {
    userId: actor.userId,
    organisationId: actor.organisationId,
    ...("all" in body ? { all: true } : { ids: body.ids }),
  });
  return { changed };
});
