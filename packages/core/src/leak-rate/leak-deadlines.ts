import { addDays, addMonths, toLocalDate, yearOf, type IsoDate } from "../dates/local-date";
import { toGrams } from "../units/mass";
import { compareRoundedRatio } from "../units/rounded-ratio";
import type { LeakRegime, LeakUseClass } from "./leak-repair-regime";

/**
 * Deadlines after a leak rate over the threshold. Source: 82.157(d)–(i), mirrored in 84.106
 * (REFERENCE.md §3.3): repair 30 days (120 for IPR needing a shutdown); follow-up verification within
 * 10 days of the initial test; retrofit/retirement plan within 30 days, completed within 12 months;
 * chronic leaker (≥ 125 % of the charge in a calendar year) reported by 1 March of the next year.
 */
export const LEAK_DEADLINE_RULES = {
  repairDays: 30,
  repairDaysIndustrialShutdown: 120,
  followUpVerificationDays: 10,
  retrofitPlanDays: 30,
  retrofitCompletionMonths: 12,
  chronicLeakPercent: 125,
  chronicReportMonth: 3,
  chronicReportDay: 1,
} as const;

export interface LeakDeadlineInput {
  /** Date (or instant) the leak rate over the threshold was found. */
  exceededOn: string;
  /** IANA zone of the branch; instants are converted to its calendar date. */
  timeZone: string;
  useClass: LeakUseClass;
  /** IPR repair that needs an industrial-process shutdown: 120 days. */
  needsIndustrialShutdown?: boolean;
}

export interface LeakDeadlines {
  exceededOn: IsoDate;
  repairDueOn: IsoDate;
  /** The initial verification test is done at the end of the repair, inside the repair window. */
  initialVerificationDueOn: IsoDate;
  retrofitPlanDueOn: IsoDate;
}

export function leakDeadlines(input: LeakDeadlineInput): LeakDeadlines {
  const exceededOn = toLocalDate(input.exceededOn, input.timeZone);
  const r = LEAK_DEADLINE_RULES;
  const days = input.useClass === "industrial_process" && input.needsIndustrialShutdown ? r.repairDaysIndustrialShutdown : r.repairDays;
  const repairDueOn = addDays(exceededOn, days);
  return { exceededOn, repairDueOn, initialVerificationDueOn: repairDueOn, retrofitPlanDueOn: addDays(exceededOn, r.retrofitPlanDays) };
}

export function followUpVerificationDueOn(initialTestOn: string, timeZone: string): IsoDate {
  return addDays(toLocalDate(initialTestOn, timeZone), LEAK_DEADLINE_RULES.followUpVerificationDays);
}

export function retrofitCompletionDueOn(planOn: string, timeZone: string): IsoDate {
  return addMonths(toLocalDate(planOn, timeZone), LEAK_DEADLINE_RULES.retrofitCompletionMonths);
}

export interface ChronicLeakResult {
  calendarYear: number;
  totalAddedG: number;
  percentOfCharge: number;
  chronic: boolean;
  /** 1 March of the following year. */
  reportDueOn: IsoDate;
}

/**
 * Chronic-leaker test for one calendar year: counted additions (exclusions left out) ≥ 125 % of the
 * full charge. Source: EPA fact sheet [S4] (125 %); 1 March from secondary sources and memory.
 */
export function chronicLeakTest(
  fullChargeG: number,
  additions: readonly { on: IsoDate; amountG: number; excluded?: unknown }[],
  calendarYear: number,
): ChronicLeakResult {
  const inYear = additions.filter((a) => !a.excluded && yearOf(a.on) === calendarYear);
  const total = inYear.reduce((s, a) => s + a.amountG, 0);
  const percent = fullChargeG > 0 ? (total / fullChargeG) * 100 : 0;
  const r = LEAK_DEADLINE_RULES;
  return {
    calendarYear,
    totalAddedG: total,
    percentOfCharge: percent,
    // "125 % or more" for the amounts as entered: 500 lb added to 400 lb is 125 % even though the
    // stored grams (226,796 of 181,437) come to 124.99999 %.
    chronic:
      fullChargeG > 0 &&
      total > 0 &&
      compareRoundedRatio(total, fullChargeG, r.chronicLeakPercent, { numeratorTerms: Math.max(1, inYear.length) }) >= 0,
    reportDueOn: `${calendarYear + 1}-${String(r.chronicReportMonth).padStart(2, "0")}-${String(r.chronicReportDay).padStart(2, "0")}`,
  };
}

export type InspectionInterval = "quarterly" | "annual";

export interface PeriodicInspectionPlan {
  interval: InspectionInterval | null;
  /** When the inspections may stop. */
  until: string;
  reason: string;
}

const LARGE_PLANT_G = toGrams(500, "lb");

/**
 * Periodic leak inspections after an exceedance (82.157(g); 84.106). Source: REFERENCE.md §3.4
 * (quarterly for commercial/IPR ≥ 500 lb until 4 quarters below the threshold [S37]; otherwise once
 * a year until a year below — from memory). Automatic leak detection replaces them.
 */
export function periodicInspectionPlan(input: {
  useClass: LeakUseClass;
  fullChargeG: number;
  regime: LeakRegime;
  hasAutomaticLeakDetection?: boolean;
}): PeriodicInspectionPlan {
  if (input.hasAutomaticLeakDetection) {
    return { interval: null, until: "", reason: "Automatic leak detection replaces periodic inspections" };
  }
  const refrigeration = input.useClass === "commercial_refrigeration" || input.useClass === "industrial_process";
  if (refrigeration && input.fullChargeG >= LARGE_PLANT_G) {
    return {
      interval: "quarterly",
      until: "four consecutive quarters below the threshold",
      reason: "Commercial or industrial refrigeration of 500 lb or more",
    };
  }
  return { interval: "annual", until: "one year below the threshold", reason: "Once a calendar year after an exceedance" };
}

/** Next inspection due after the last one (or after the exceedance): +3 months or +1 year. */
export function nextInspectionDueOn(lastOn: IsoDate, interval: InspectionInterval): IsoDate {
  return addMonths(lastOn, interval === "quarterly" ? 3 : 12);
}
