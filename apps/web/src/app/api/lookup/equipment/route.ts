import { z } from "zod";
import { listEquipmentOptions, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

const query = z.object({ branchId: z.coerce.number({ error: "Choose a branch" }).int().positive() });

/** Recovery equipment of one branch for the job form. */
export const GET = route({ can: ["read", "RecoveryEquipment"], query }, async ({ ability, db, query }) => {
  const rows = await listEquipmentOptions(db, {
    scope: scopeByAbility(ability, "read", "RecoveryEquipment", "recovery_equipment"),
    branchId: query.branchId,
  });
  return { rows };
});
