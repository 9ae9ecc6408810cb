import { ForbiddenError, subject } from "@casl/ability";
import { disposalMonthlyQuery } from "@coldtrail/core";
import { monthlyDisposalTotals } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** A branch's monthly quantities recovered from disposed 5–50 lb appliances, and its transfers for reclaim (82.155(c)(2)–(3)). */
export const GET = route({ can: ["read", "Disposal"], query: disposalMonthlyQuery }, async ({ actor, ability, db, query }) => {
  ForbiddenError.from(ability).throwUnlessCan(
    "read",
    subject("Disposal", { organisationId: actor.organisationId, branchId: query.branchId }),
  );
  return monthlyDisposalTotals(db, { organisationId: actor.organisationId, branchId: query.branchId, year: query.year });
});
