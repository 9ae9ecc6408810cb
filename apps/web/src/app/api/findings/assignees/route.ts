import { z } from "zod";
import { listAssignableUsers } from "@coldtrail/db";
import { route } from "@/lib/api/route";

const query = z.object({
  branchIds: z
    .string()
    .optional()
    .transform((v, ctx) => {
      if (!v) return undefined;
      const ids = v.split(",").map(Number);
      if (ids.some((n) => !Number.isInteger(n) || n <= 0)) {
        ctx.addIssue({ code: "custom", message: "Give branch ids separated by commas" });
        return z.NEVER;
      }
      return ids;
    }),
});

/** People who may be given findings of the branches named: their branch managers and the owners. */
export const GET = route({ can: ["assign", "Finding"], query }, async ({ actor, db, query }) => {
  const rows = await listAssignableUsers(db, {
    organisationId: actor.organisationId,
    ...(query.branchIds ? { branchIds: query.branchIds } : {}),
  });
  return { rows: rows.map((u) => ({ id: u.id, name: u.name, role: u.role, branchIds: u.branchIds })) };
});
