import type { Severity } from "../vocabulary";

/**
 * Record health: a 0–100 score per branch, our own measure of how clean its records are.
 *
 *   points  = 10 × open critical + 4 × open major + 1 × open minor   (findings open or with a fix proposed)
 *   health  = 100 − points × 100 ÷ max(records audited, 100)          (never below 0, one decimal)
 *
 * "Records audited" counts the jobs in the audited period and the branch's appliances, cylinders,
 * recovery equipment and technicians' certifications. Dividing by the number of records keeps a busy
 * branch from scoring worse only for being busy; the floor of 100 keeps a tiny branch from swinging
 * wildly on one finding. A branch with no open findings scores 100.
 */
export const HEALTH_WEIGHTS: Readonly<Record<Severity, number>> = { critical: 10, major: 4, minor: 1 };
export const HEALTH_MIN_RECORDS = 100;

export const RECORD_HEALTH_EXPLANATION =
  "Record health starts at 100. Each open finding takes points — 10 for critical, 4 for major, 1 for minor — per 100 records audited (jobs in the period plus appliances, cylinders, recovery equipment and certifications; at least 100). A score of 100 means no open findings.";

export interface RecordHealthInput {
  open: Readonly<Record<Severity, number>>;
  recordsAudited: number;
}

export interface RecordHealth {
  score: number;
  points: number;
  /** The divisor used: records audited, at least HEALTH_MIN_RECORDS. */
  basis: number;
  /** The calculation in words, e.g. "100 − (10 × 2 + 4 × 3 + 1 × 0) × 100 ÷ 612 = 94.8". */
  formula: string;
}

const round1 = (x: number) => Math.round(x * 10) / 10;

export function recordHealth(input: RecordHealthInput): RecordHealth {
  const { critical, major, minor } = input.open;
  for (const n of [critical, major, minor, input.recordsAudited]) {
    if (!Number.isInteger(n) || n < 0) throw new Error("Counts must be whole numbers of zero or more");
  }
  const points = HEALTH_WEIGHTS.critical * critical + HEALTH_WEIGHTS.major * major + HEALTH_WEIGHTS.minor * minor;
  const basis = Math.max(input.recordsAudited, HEALTH_MIN_RECORDS);
  const score = Math.max(0, round1(100 - (points * 100) / basis));
  const formula = `100 − (10 × ${critical} + 4 × ${major} + 1 × ${minor}) × 100 ÷ ${basis.toLocaleString("en-US")} = ${score.toFixed(1)}`;
  return { score, points, basis, formula };
}

export interface HealthTrend {
  /** Change in the score since the earlier measurement (positive = healthier). */
  scoreChange: number;
  /** Change in the number of open findings (negative = fewer). */
  openChange: number;
  direction: "better" | "worse" | "same";
  words: string;
}

/** How a branch moved between two measurements (the last audit and now, or two audits). */
export function healthTrend(before: { score: number; open: number }, after: { score: number; open: number }): HealthTrend {
  const scoreChange = round1(after.score - before.score);
  const openChange = after.open - before.open;
  const direction = scoreChange > 0 ? "better" : scoreChange < 0 ? "worse" : openChange < 0 ? "better" : openChange > 0 ? "worse" : "same";
  const signed = (n: number) => (n > 0 ? `+${n}` : `${n}`);
  const words =
    direction === "same"
      ? "No change"
      : `${direction === "better" ? "Better" : "Worse"}: health ${signed(scoreChange)}, open findings ${signed(openChange)}`;
  return { scoreChange, openChange, direction, words };
}
