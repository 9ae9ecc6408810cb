import { addDays, type IsoDate } from "../dates/local-date";
import type { Severity } from "../vocabulary";

/**
 * Days a branch has to fix a finding when the rule sets no deadline of its own. A product choice, not
 * a regulation: the worse the gap, the sooner it must be fixed.
 */
export const DAYS_TO_FIX_BY_SEVERITY: Readonly<Record<Severity, number>> = {
  critical: 7,
  major: 30,
  minor: 60,
};

/**
 * When a finding is due: the rule's own deadline where it sets one (leak repair, verification test,
 * requalification, chronic-leak report …), otherwise the severity's number of days from the date the
 * finding was first raised (a calendar date in the branch's zone).
 */
export function findingDueOn(finding: { severity: Severity; dueOn?: string | null }, raisedOn: IsoDate): IsoDate {
  if (finding.dueOn) return finding.dueOn;
  return addDays(raisedOn, DAYS_TO_FIX_BY_SEVERITY[finding.severity]);
}

export type DueStatus = "overdue" | "due_soon" | "later" | "none";

/** Overdue (before today), due within `soonDays` (today included), later, or no due date. */
export function dueStatus(dueOn: IsoDate | null, today: IsoDate, soonDays = 7): DueStatus {
  if (!dueOn) return "none";
  if (dueOn < today) return "overdue";
  if (dueOn <= addDays(today, soonDays)) return "due_soon";
  return "later";
}
