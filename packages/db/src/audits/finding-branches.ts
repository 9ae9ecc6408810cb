import type { Knex } from "knex";

/**
 * Which branches a finding shows in. A branch-level finding shows in its own branch
 * (`findings.branch_id`); a person-level finding (a technician's card …) is one finding for the
 * organisation and shows in every branch listed for it in `finding_branches` (its `branch_id` is one
 * of them). Lists, counts and permission scopes ask through these helpers so both kinds answer alike.
 */

/** Restricts `qb` to findings (table alias `table`) shown in one of `branchIds`. */
export function whereFindingShowsIn(qb: Knex.QueryBuilder, branchIds: readonly number[], table = "findings"): void {
  const ids = [...branchIds];
  qb.where((w) => {
    w.whereIn(`${table}.branch_id`, ids).orWhereExists((sub) => {
      sub.select(1).from("finding_branches as fbx").whereRaw(`fbx.finding_id = ${table}.id`).whereIn("fbx.branch_id", ids);
    });
  });
}

/** The branches each finding shows in (its own branch first, then the others by id). */
export async function findingBranchIds(
  db: Knex | Knex.Transaction,
  findings: readonly { id: number; branchId: number }[],
): Promise<Map<number, number[]>> {
  const out = new Map<number, number[]>(findings.map((f) => [f.id, [f.branchId]]));
  const ids = findings.map((f) => f.id);
  for (let i = 0; i < ids.length; i += 500) {
    const rows = await db("finding_branches")
      .whereIn("finding_id", ids.slice(i, i + 500))
      .orderBy(["finding_id", "branch_id"])
      .select("finding_id", "branch_id");
    for (const r of rows) {
      const list = out.get(Number(r.finding_id));
      if (list && !list.includes(Number(r.branch_id))) list.push(Number(r.branch_id));
    }
  }
  return out;
}
