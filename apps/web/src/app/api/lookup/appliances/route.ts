import { z } from "zod";
import { listApplianceOptions, listBranches, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

const query = z.object({
  q: z.string().trim().max(100).optional(),
  branchId: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(50).default(20),
});

/** Appliances for the job form's picker: in service, in the branches the person may log work for. */
export const GET = route({ can: ["read", "Appliance"], query }, async ({ actor, ability, db, query }) => {
  const [options, branches] = await Promise.all([
    listApplianceOptions(db, {
      scope: scopeByAbility(ability, "read", "Appliance", "appliances"),
      q: query.q,
      branchIds: query.branchId ? [query.branchId] : undefined,
      limit: query.limit,
    }),
    listBranches(db, { organisationId: actor.organisationId }),
  ]);
  const branchById = new Map(branches.map((b) => [b.id, b]));
  return {
    rows: options.map((o) => ({
      ...o,
      branchName: branchById.get(o.branchId)?.name ?? "",
      massUnit: branchById.get(o.branchId)?.massUnit ?? "lb_oz",
      timeZone: branchById.get(o.branchId)?.timeZone ?? "UTC",
    })),
  };
});
