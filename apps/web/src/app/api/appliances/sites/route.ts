import { registerPickerQuery } from "@coldtrail/core";
import { listSiteOptions, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Sites of one branch for the appliance form. */
export const GET = route({ can: ["read", "Site"], query: registerPickerQuery }, async ({ ability, db, query }) => {
  return {
    rows: await listSiteOptions(db, {
      scope: scopeByAbility(ability, "read", "Site", "sites"),
      branchId: query.branchId,
      q: query.q,
      limit: query.limit,
    }),
  };
});
