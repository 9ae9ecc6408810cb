import { disposalListQuery } from "@coldtrail/core";
import { listDisposals, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Disposal records or signed statements (`type`) the signed-in person may read, one page at a time. */
export const GET = route({ can: ["read", "Disposal"], query: disposalListQuery }, async ({ ability, db, query }) => {
  return listDisposals(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), query });
});
