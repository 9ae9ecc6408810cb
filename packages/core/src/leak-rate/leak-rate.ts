import { CoreInputError } from "../errors";
import { addDays, daysBetween, type IsoDate } from "../dates/local-date";
import { roundedRatioRange } from "../units/rounded-ratio";

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
  /**
   * The earlier job whose leak this addition also tops up (the technician said so on the job): the
   * two are summed into one leak event, as 82.152 sums "multiple additions related to the same leak".
   */
  sameLeakAsJobId?: number | null;
}

/** Where the first interval of the annualizing method starts when no earlier addition is counted. */
export type IntervalStart = "addition" | "installation";

export interface LeakRateEvent {
  /** The date the rate is calculated: the last addition of the event. */
  on: IsoDate;
  /** The first addition of the event (earlier than `on` when additions for one leak span several days). */
  firstOn: IsoDate;
  /** Counted grams added in this event (all additions of one day, plus those marked as the same leak). */
  addedG: number;
  excludedG: number;
  /** Leak rate in %, or null when everything added was excluded. */
  percent: number | null;
  /**
   * The lowest rate the amounts as entered could give (stored grams are rounded to the gram): a rate
   * exceeds a threshold only when this does, so 20 lb on 100 lb is exactly 20 %.
   */
  percentLow: number | null;
  /** Days of the interval the annualizing method used (before the 365-day cap); null = none, 365 used. */
  daysSinceLastAddition: number | null;
  /** What the interval starts from: the previous addition or the installation; null = none (365 days). */
  intervalStartsFrom: IntervalStart | null;
  intervalStartOn: IsoDate | null;
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
  /**
   * Installation date of the appliance. Without an earlier counted addition, the first interval runs
   * from it (the installation charge is an addition; 82.152 "leak rate" counts the days "since the
   * last day refrigerant was added"). Unknown, or before `countFrom`: 365 days.
   */
  installedOn?: IsoDate | null;
}

/** The latest date in a sorted list that is before `date`, or null. */
function lastBefore(sorted: readonly IsoDate[], date: IsoDate): IsoDate | null {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if ((sorted[mid] as IsoDate) < date) lo = mid + 1;
    else hi = mid;
  }
  return lo > 0 ? (sorted[lo - 1] as IsoDate) : null;
}

interface EventGroup {
  firstOn: IsoDate;
  on: IsoDate;
  addedG: number;
  excludedG: number;
  terms: number;
  sourceIds: number[];
}

/**
 * Additions grouped into leak events: all additions of one calendar date are one event (one visit),
 * and an addition marked as the same leak as an earlier job joins that job's event.
 */
function groupAdditions(additions: readonly RefrigerantAddition[], countFrom: IsoDate | null | undefined): EventGroup[] {
  const counted = additions.filter((a) => !(countFrom && a.on < countFrom));
  for (const a of counted) if (a.amountG < 0) throw new CoreInputError("An addition cannot be negative", "amountG");
  const groupOfJob = new Map<number, EventGroup>();
  const byDate = new Map<IsoDate, EventGroup>();
  const groups: EventGroup[] = [];
  const sorted = [...counted].sort((x, y) => (x.on < y.on ? -1 : x.on > y.on ? 1 : (x.sourceId ?? 0) - (y.sourceId ?? 0)));
  for (const a of sorted) {
    const linked = a.sameLeakAsJobId !== null && a.sameLeakAsJobId !== undefined ? groupOfJob.get(a.sameLeakAsJobId) : undefined;
    let g = linked ?? (a.sourceId !== undefined ? groupOfJob.get(a.sourceId) : undefined) ?? byDate.get(a.on);
    if (!g) {
      g = { firstOn: a.on, on: a.on, addedG: 0, excludedG: 0, terms: 0, sourceIds: [] };
      groups.push(g);
      byDate.set(a.on, g);
    }
    if (a.on > g.on) g.on = a.on;
    if (a.excluded) g.excludedG += a.amountG;
    else {
      g.addedG += a.amountG;
      g.terms += 1;
    }
    if (a.sourceId !== undefined) {
      if (!g.sourceIds.includes(a.sourceId)) g.sourceIds.push(a.sourceId);
      groupOfJob.set(a.sourceId, g);
    }
  }
  return groups.sort((x, y) => (x.on < y.on ? -1 : x.on > y.on ? 1 : x.firstOn < y.firstOn ? -1 : x.firstOn > y.firstOn ? 1 : 0));
}

/**
 * The leak rate at every leak event. Additions on the same calendar date are one event (one visit);
 * additions marked as the same leak as an earlier job are summed into that job's event, dated at the
 * last of them. Rolling window: additions dated after (on − 365 days) and after the last passed
 * follow-up verification test before `on`. Excluded additions are not counted, but they still mark
 * the start of the next annualizing interval (the circuit was topped up then).
 */
export function leakRateHistory(input: LeakRateHistoryInput): LeakRateEvent[] {
  assertCharge(input.fullChargeG);
  const groups = groupAdditions(input.additions, input.countFrom);
  const resets = [...(input.followUpVerificationsPassedOn ?? [])].sort();
  const events: LeakRateEvent[] = [];
  // Two-pointer window over the counted events (linear after sorting).
  let windowStart = 0;
  let windowSum = 0;
  let windowTerms = 0;
  let resetIdx = -1;
  const counted: { on: IsoDate; g: number; terms: number }[] = [];
  // Dates on which refrigerant was added (any event, excluded or not), to find the last addition
  // before each event began: an event that sums additions for one leak starts at its first addition.
  const ends = [...new Set(input.additions.filter((a) => !(input.countFrom && a.on < input.countFrom)).map((a) => a.on))].sort();
  const installed = input.installedOn ?? null;
  // The first interval runs from the installation (its charge is the last addition before the first
  // counted one). An appliance installed before `countFrom` (AIM: 2026-01-01) takes 365 days for its
  // first calculation instead (REFERENCE.md §3.1 AIM specifics, M/L), as does an unknown installation.
  const firstStart: { on: IsoDate; from: IntervalStart } | null =
    installed !== null && !(input.countFrom && installed < input.countFrom) ? { on: installed, from: "installation" } : null;
  for (const e of groups) {
    const previous = lastBefore(ends, e.firstOn);
    let start: { on: IsoDate; from: IntervalStart } | null = previous !== null ? { on: previous, from: "addition" } : null;
    if (start === null && firstStart && firstStart.on < e.firstOn) start = firstStart;
    const days = start === null ? null : Math.max(1, daysBetween(start.on, e.firstOn));
    let percent: number | null = null;
    let percentLow: number | null = null;
    if (e.addedG > 0 || e.excludedG === 0) {
      counted.push({ on: e.on, g: e.addedG, terms: e.terms });
      windowSum += e.addedG;
      windowTerms += e.terms;
      while (resetIdx + 1 < resets.length && (resets[resetIdx + 1] as string) < e.on) resetIdx++;
      const reset = resetIdx >= 0 ? (resets[resetIdx] as string) : null;
      const earliest = addDays(e.on, -LEAK_RATE_MAX_DAYS);
      while (windowStart < counted.length) {
        const first = counted[windowStart]!;
        if (first.on > earliest && (reset === null || first.on > reset)) break;
        windowSum -= first.g;
        windowTerms -= first.terms;
        windowStart++;
      }
      if (input.method === "annualizing") {
        percent = annualizingLeakRate(e.addedG, input.fullChargeG, days);
        const factor = LEAK_RATE_MAX_DAYS / (days === null ? LEAK_RATE_MAX_DAYS : Math.min(days, LEAK_RATE_MAX_DAYS));
        percentLow = roundedRatioRange(e.addedG, input.fullChargeG, { numeratorTerms: Math.max(1, e.terms) }).low * factor;
      } else {
        percent = rollingAverageLeakRate(windowSum, input.fullChargeG);
        percentLow = roundedRatioRange(windowSum, input.fullChargeG, { numeratorTerms: Math.max(1, windowTerms) }).low;
      }
    }
    events.push({
      on: e.on,
      firstOn: e.firstOn,
      addedG: e.addedG,
      excludedG: e.excludedG,
      percent,
      percentLow,
      daysSinceLastAddition: days,
      intervalStartsFrom: start?.from ?? null,
      intervalStartOn: start?.on ?? null,
      sourceIds: e.sourceIds.sort((a, b) => a - b),
    });
  }
  return events;
}
