import { findingListQuery } from "@coldtrail/core";
import { listFindings, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { todayUtc } from "./_lib/access";

/** Findings the signed-in person may read: filtered, sorted, grouped and paged on the server. */
export const GET = route({ can: ["read", "Finding"], query: findingListQuery }, async ({ actor, ability, db, query }) => {
  return listFindings(db, {
    organisationId: actor.organisationId,
    scope: scopeByAbility(ability, "read", "Finding", "findings"),
    query,
    today: todayUtc(),
  });
});
