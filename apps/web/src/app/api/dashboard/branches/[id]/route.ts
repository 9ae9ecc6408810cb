import { subject } from "@casl/ability";
import { dashboardQuery, RECORD_HEALTH_EXPLANATION, toLocalDate } from "@coldtrail/core";
import { DomainError, getBranchDashboard, getOrganisationOverview, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { pathId } from "../../../findings/_lib/access";

/** One branch's dashboard; 404 unless the person may read the branch's findings. */
export const GET = route<typeof dashboardQuery, undefined, { id: string }>(
  { can: ["read", "Finding"], query: dashboardQuery },
  async ({ actor, ability, db, params, query }) => {
    const branchId = pathId(params.id, "branch");
    const org = actor.organisationId;
    if (!ability.can("read", subject("Finding", { organisationId: org, branchId }))) throw new DomainError("not_found", "No such branch");
    const branch = await db("branches").where({ id: branchId, organisation_id: org }).first<{ time_zone: string } | undefined>("time_zone");
    if (!branch) throw new DomainError("not_found", "No such branch");
    const today = toLocalDate(new Date(), branch.time_zone);
    const findingScope = scopeByAbility(ability, "read", "Finding", "findings");
    const dashboard = await getBranchDashboard(db, {
      organisationId: org,
      branchId,
      today,
      months: query.months,
      findingScope,
      jobScope: scopeByAbility(ability, "read", "Job", "jobs"),
      purchaseScope: scopeByAbility(ability, "read", "Purchase", "purchases"),
      shipmentScope: scopeByAbility(ability, "read", "ReclaimShipment", "reclaim_shipments"),
      // The watchlist reads every job of the branch: only for people who may read all of them.
      includeLeakWatchlist: ability.can("read", subject("Job", { organisationId: org, branchId })),
    });
    const overview = await getOrganisationOverview(db, { organisationId: org, branchIds: [branchId], findingScope, today });
    return { ...dashboard, overview: overview.branches[0] ?? null, healthExplanation: RECORD_HEALTH_EXPLANATION };
  },
);
