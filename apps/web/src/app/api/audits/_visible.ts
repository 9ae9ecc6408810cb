import "server-only";
import type { Actor, AppAbility, Severity } from "@coldtrail/core";
import type { AuditRun, AuditSummary, Knex } from "@coldtrail/db";
import { branchesAllowed } from "../findings/_lib/access";

/**
 * What of an audit a person may see: the run itself (scope, period, progress) and the summary of the
 * branches whose findings they may read. Totals are recomputed from those branches only.
 */
export function visibleAudit<T extends AuditRun>(run: T, readableBranchIds: Set<number>): T & { partial: boolean } {
  if (!run.summary) return { ...run, partial: run.branchIds.some((b) => !readableBranchIds.has(b)) };
  const branches = run.summary.branches.filter((b) => readableBranchIds.has(b.branchId));
  // Whoever reads every branch gets the stored totals, which count a finding shown in two branches
  // (a technician's card) once.
  if (branches.length === run.summary.branches.length && run.branchIds.every((b) => readableBranchIds.has(b)))
    return { ...run, partial: false };
  const totals: AuditSummary["totals"] = {
    found: 0,
    created: 0,
    noLongerFound: 0,
    foundAgain: 0,
    bySeverity: { critical: 0, major: 0, minor: 0 },
  };
  const byRule: Record<string, number> = {};
  for (const b of branches) {
    totals.found += b.found;
    totals.created += b.created;
    totals.noLongerFound += b.noLongerFound;
    totals.foundAgain += b.foundAgain;
    for (const s of Object.keys(b.foundBySeverity) as Severity[]) totals.bySeverity[s] += b.foundBySeverity[s];
    for (const [rule, n] of Object.entries(b.foundByRule)) byRule[rule] = (byRule[rule] ?? 0) + n;
  }
  return {
    ...run,
    summary: { branches, totals, byRule },
    partial: branches.length < run.summary.branches.length || run.branchIds.some((b) => !readableBranchIds.has(b)),
  };
}

/** Branches whose findings the person may read (branch-level permission). */
export async function readableFindingBranches(db: Knex, actor: Actor, ability: AppAbility): Promise<Set<number>> {
  return new Set((await branchesAllowed(db, actor, ability, "read", "Finding")).map((b) => b.id));
}
