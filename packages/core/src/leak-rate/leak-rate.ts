import { CoreInputError } from "../errors";
import { addDays, daysBetween, type IsoDate } from "../dates/local-date";

/** 40 CFR 82.152 (and 84.102): the two ways to calculate a leak rate. One is used facility-wide. */
export type LeakRateMethod = "annualizing" | "rolling_average";
/** Additions that are not counted (82.152 "leak rate"; REFERENCE.md §3.1). */
export type AdditionExclusion = "retrofit" | "installation" | "seasonal_variance";

export const LEAK_RATE_MAX_DAYS = 365;

function assertCharge(fullCharge: number): void {
  if (!(fullCharge > 0)) throw new CoreInputError("The full charge must be known and greater than zero", "fullCharge");
}

/**
 * Annualizing method (82.152): added / full charge × 365 / min(days since the last addition, 365) × 100.
 * Amounts in any one unit. `daysSinceLastAddition` null (no earlier addition) uses 365 days — the
 * AIM rule says so for the first calculation; we apply the same to Part 82 (assumption).
 * Additions made on one visit must be summed first: 0 days is rejected.
 */
export function annualizingLeakRate(added: number, fullCharge: number, daysSinceLastAddition: number | null): number {
  assertCharge(fullCharge);
  if (added < 0) throw new CoreInputError("An addition cannot be negative", "added");
  const days = daysSinceLastAddition === null ? LEAK_RATE_MAX_DAYS : Math.min(daysSinceLastAddition, LEAK_RATE_MAX_DAYS);
  if (!(days >= 1)) throw new CoreInputError("Sum additions made on one visit before calculating (0 days)", "daysSinceLastAddition");
  return (added / fullCharge) * (LEAK_RATE_MAX_DAYS / days) * 100;
}

/** Rolling-average method (82.152): sum of additions in the window / full charge × 100. */
export function rollingAverageLeakRate(addedInWindow: number, fullCharge: number): number {
  assertCharge(fullCharge);
  if (addedInWindow < 0) throw new CoreInputError("Additions cannot be negative", "addedInWindow");
  return (addedInWindow / fullCharge) * 100;
}

export interface RefrigerantAddition {
  /** Calendar date in the branch's zone. */
  on: IsoDate;
  amountG: number;
  excluded?: AdditionExclusion | null;
  /** The job the addition belongs to, carried through to the event. */
  sourceId?: number;
}

export interface LeakRateEvent {
  on: IsoDate;
  /** Counted grams added on this date (all additions of one day form one event). */
  addedG: number;
  excludedG: number;
  /** Leak rate in %, or null when everything added that day was excluded. */
  percent: number | null;
  /** Days since the previous addition of any kind; null for the first. */
  daysSinceLastAddition: number | null;
  sourceIds: number[];
}

export interface LeakRateHistoryInput {
  fullChargeG: number;
  additions: readonly RefrigerantAddition[];
  method: LeakRateMethod;
  /** Dates of successful follow-up verification tests: the rolling window restarts after each. */
  followUpVerificationsPassedOn?: readonly IsoDate[];
  /** Only additions on/after this date count (AIM: 2026-01-01). */
  countFrom?: IsoDate | null;
}

/**
 * The leak rate at every addition. Additions on the same calendar date are one event (one visit).
 * Rolling window: additions dated after (on − 365 days) and after the last passed follow-up
 * verification test before `on`. Excluded additions are not counted, but they still mark the start of
 * the next annualizing interval (the circuit was topped up then).
 */
export function leakRateHistory(input: LeakRateHistoryInput): LeakRateEvent[] {
  assertCharge(input.fullChargeG);
  const byDate = new Map<IsoDate, { addedG: number; excludedG: number; sourceIds: number[] }>();
  for (const a of input.additions) {
    if (input.countFrom && a.on < input.countFrom) continue;
    if (a.amountG < 0) throw new CoreInputError("An addition cannot be negative", "amountG");
    const e = byDate.get(a.on) ?? { addedG: 0, excludedG: 0, sourceIds: [] };
    if (a.excluded) e.excludedG += a.amountG;
    else e.addedG += a.amountG;
    if (a.sourceId !== undefined) e.sourceIds.push(a.sourceId);
    byDate.set(a.on, e);
  }
  const dates = [...byDate.keys()].sort();
  const resets = [...(input.followUpVerificationsPassedOn ?? [])].sort();
  const events: LeakRateEvent[] = [];
  // Two-pointer window over the counted additions (linear after sorting).
  let windowStart = 0;
  let windowSum = 0;
  let resetIdx = -1;
  const counted: { on: IsoDate; g: number }[] = [];
  let previous: IsoDate | null = null;
  for (const on of dates) {
    const e = byDate.get(on)!;
    const days = previous === null ? null : daysBetween(previous, on);
    let percent: number | null = null;
    if (e.addedG > 0 || e.excludedG === 0) {
      counted.push({ on, g: e.addedG });
      windowSum += e.addedG;
      while (resetIdx + 1 < resets.length && (resets[resetIdx + 1] as string) < on) resetIdx++;
      const reset = resetIdx >= 0 ? (resets[resetIdx] as string) : null;
      const earliest = addDays(on, -LEAK_RATE_MAX_DAYS);
      while (windowStart < counted.length) {
        const first = counted[windowStart]!;
        if (first.on > earliest && (reset === null || first.on > reset)) break;
        windowSum -= first.g;
        windowStart++;
      }
      percent =
        input.method === "annualizing"
          ? annualizingLeakRate(e.addedG, input.fullChargeG, days)
          : rollingAverageLeakRate(windowSum, input.fullChargeG);
    }
    events.push({
      on,
      addedG: e.addedG,
      excludedG: e.excludedG,
      percent,
      daysSinceLastAddition: days,
      sourceIds: e.sourceIds.sort((a, b) => a - b),
    });
    previous = on;
  }
  return events;
}
