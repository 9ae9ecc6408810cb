import { peopleListQuery } from "@coldtrail/core";
import { listPeople, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** People the signed-in person may see, with roles and branches, one page at a time. */
export const GET = route({ can: ["read", "User"], query: peopleListQuery }, async ({ ability, db, query }) => {
  return listPeople(db, { scope: scopeByAbility(ability, "read", "User", "pb"), query });
});
