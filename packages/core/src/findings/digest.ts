import { addDays, type IsoDate } from "../dates/local-date";
import type { FindingState, Severity } from "../vocabulary";

export interface DigestFinding {
  id: number;
  branchId: number;
  /** Every branch the finding shows in, when it shows in more than its own (a person-level finding). */
  branchIds?: readonly number[];
  branchName: string;
  ruleId: string;
  title: string;
  severity: Severity;
  state: FindingState;
  dueOn: string | null;
  assigneeId: number | null;
}

export interface DigestRecipient {
  userId: number;
  /** Organisation-wide roles see every branch; others the branches they manage. */
  wholeOrganisation: boolean;
  managedBranchIds: readonly number[];
}

export interface DigestLine extends DigestFinding {
  overdue: boolean;
  daysLeft: number;
}

export const DIGEST_WINDOW_DAYS = 7;

const days = (from: IsoDate, to: IsoDate) => Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000);

/**
 * The daily digest: for each person, the active findings due within 7 days (today included) or
 * overdue that are theirs — assigned to them, or, unassigned, in a branch they manage; the whole
 * organisation's for compliance officers and owners. Overdue first, then by due date and id.
 * People with nothing due get nothing.
 */
export function buildDigests(
  findings: readonly DigestFinding[],
  recipients: readonly DigestRecipient[],
  today: IsoDate,
): Map<number, DigestLine[]> {
  const horizon = addDays(today, DIGEST_WINDOW_DAYS);
  const due = findings
    .filter((f) => (f.state === "open" || f.state === "fix_proposed") && f.dueOn !== null && f.dueOn <= horizon)
    .map((f) => ({ ...f, overdue: (f.dueOn as string) < today, daysLeft: days(today, f.dueOn as string) }))
    .sort((a, b) => (a.dueOn! < b.dueOn! ? -1 : a.dueOn! > b.dueOn! ? 1 : a.id - b.id));
  const out = new Map<number, DigestLine[]>();
  for (const r of recipients) {
    const mine = due.filter(
      (f) =>
        r.wholeOrganisation ||
        f.assigneeId === r.userId ||
        (f.assigneeId === null && (f.branchIds ?? [f.branchId]).some((b) => r.managedBranchIds.includes(b))),
    );
    if (mine.length) out.set(r.userId, mine);
  }
  return out;
}
