import type { AuditPeriod, Finding } from "../audit/finding";
import { getRule } from "../audit/rule-registry";
import type { IsoDate } from "../dates/local-date";
import type { FindingState, RulePack } from "../vocabulary";
import { findingDueOn } from "./due-dates";

/** What the database holds about a finding, as much as reconciliation needs. */
export interface StoredFinding {
  id: number;
  identityKey: string;
  ruleId: string;
  state: FindingState;
  /** Date of the event the finding is about; null for a standing obligation. */
  occurredOn: string | null;
  dueOn: string | null;
}

/** What the rules were asked to look at: only stored findings inside it can be "no longer found". */
export interface ReconcileScope {
  period: AuditPeriod;
  packs: readonly RulePack[];
}

export interface FindingToCreate {
  finding: Finding;
  dueOn: IsoDate;
}

export interface FindingToUpdate {
  id: number;
  finding: Finding;
  dueOn: IsoDate | null;
  /** The state after this run (differs from the stored one only when it was no longer found and is found again). */
  state: FindingState;
  foundAgain: boolean;
}

export interface FindingToResolve {
  id: number;
  from: FindingState;
}

export interface Reconciliation {
  create: FindingToCreate[];
  update: FindingToUpdate[];
  resolve: FindingToResolve[];
  /** Stored findings outside the scope, or in a final state and not found: left as they are. */
  untouched: number[];
}

/** Whether a stored finding is one this run could have found again (same packs, event within the period). */
export function inReconcileScope(stored: Pick<StoredFinding, "ruleId" | "occurredOn">, scope: ReconcileScope): boolean {
  const rule = getRule(stored.ruleId);
  if (rule && !scope.packs.includes(rule.pack)) return false;
  if (stored.occurredOn === null) return true;
  return stored.occurredOn >= scope.period.from && stored.occurredOn <= scope.period.to;
}

/**
 * Matches a run's findings with the stored ones by identity (rule + record):
 * - found and stored: the same finding; its words and deadline are refreshed, its state kept —
 *   except "no longer found", which opens again;
 * - stored, in scope, still open or with a proposed fix, and not found: "no longer found";
 * - found and not stored: a new open finding, due by the rule's deadline or its severity.
 * Closed and waived findings keep their state whether or not they are found (people decided them).
 */
export function reconcileFindings(opts: {
  stored: readonly StoredFinding[];
  found: readonly Finding[];
  scope: ReconcileScope;
  /** Calendar date (branch zone) a new finding is raised on. */
  today: IsoDate;
}): Reconciliation {
  const byKey = new Map(opts.stored.map((s) => [s.identityKey, s]));
  const seen = new Set<string>();
  const out: Reconciliation = { create: [], update: [], resolve: [], untouched: [] };
  for (const finding of opts.found) {
    if (seen.has(finding.identityKey)) continue;
    seen.add(finding.identityKey);
    const stored = byKey.get(finding.identityKey);
    if (!stored) {
      out.create.push({ finding, dueOn: findingDueOn(finding, opts.today) });
      continue;
    }
    const foundAgain = stored.state === "no_longer_found";
    out.update.push({
      id: stored.id,
      finding,
      dueOn: foundAgain ? findingDueOn(finding, opts.today) : (finding.dueOn ?? stored.dueOn),
      state: foundAgain ? "open" : stored.state,
      foundAgain,
    });
  }
  for (const stored of opts.stored) {
    if (seen.has(stored.identityKey)) continue;
    if ((stored.state === "open" || stored.state === "fix_proposed") && inReconcileScope(stored, opts.scope)) {
      out.resolve.push({ id: stored.id, from: stored.state });
    } else {
      out.untouched.push(stored.id);
    }
  }
  return out;
}
