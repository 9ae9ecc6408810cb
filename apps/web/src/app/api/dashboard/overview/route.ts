import { RECORD_HEALTH_EXPLANATION } from "@coldtrail/core";
import { getOrganisationOverview, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { branchesAllowed, todayUtc } from "../../findings/_lib/access";

/** Every branch the person may read findings of: open findings by severity, record health, trend since the last audit. */
export const GET = route({ can: ["read", "Finding"] }, async ({ actor, ability, db }) => {
  const branches = await branchesAllowed(db, actor, ability, "read", "Finding");
  const overview = await getOrganisationOverview(db, {
    organisationId: actor.organisationId,
    branchIds: branches.map((b) => b.id),
    findingScope: scopeByAbility(ability, "read", "Finding", "findings"),
    today: todayUtc(),
  });
  return { ...overview, healthExplanation: RECORD_HEALTH_EXPLANATION };
});
