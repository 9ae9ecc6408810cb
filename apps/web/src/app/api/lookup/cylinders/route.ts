import { z } from "zod";
import { listCylinderOptions, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

const query = z.object({ branchId: z.coerce.number({ error: "Choose a branch" }).int().positive() });

/** Recovery cylinders of one branch for the job form. */
export const GET = route({ can: ["read", "Cylinder"], query }, async ({ ability, db, query }) => {
  const rows = await listCylinderOptions(db, {
    scope: scopeByAbility(ability, "read", "Cylinder", "cylinders"),
    branchId: query.branchId,
  });
  return { rows };
});
