import { registerPickerQuery } from "@coldtrail/core";
import { listCustomerOptions, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Customers of one branch for the appliance form. */
export const GET = route({ can: ["read", "Customer"], query: registerPickerQuery }, async ({ ability, db, query }) => {
  return {
    rows: await listCustomerOptions(db, {
      scope: scopeByAbility(ability, "read", "Customer", "customers"),
      branchId: query.branchId,
      q: query.q,
      limit: query.limit,
    }),
  };
});
