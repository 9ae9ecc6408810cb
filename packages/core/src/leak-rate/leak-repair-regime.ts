import { getRefrigerant } from "../refrigerants/catalogue";
import { toGrams } from "../units/mass";
import type { ApplianceCategory } from "../vocabulary";
import type { IsoDate } from "../dates/local-date";

/** Leak-rate use classes of 82.157(c) / 84.106 (refrigerated transport is AIM-only and not a category yet). */
export type LeakUseClass = "comfort_cooling" | "commercial_refrigeration" | "industrial_process" | "other";

export interface CategoryLeakRules {
  /** Use class for thresholds; null = never covered by leak repair. */
  useClass: LeakUseClass | null;
  /** Excluded from AIM leak repair (40 CFR 84.106: residential and light-commercial A/C and heat pumps). */
  aimExcluded: boolean;
  note: string;
}

/**
 * Appliance category → leak-repair use class and AIM exclusion. Reviewable data: change it here,
 * the rules follow. Definitions from 84.102 (REFERENCE.md §3.2 [S10]).
 */
export const CATEGORY_LEAK_RULES: Readonly<Record<ApplianceCategory, CategoryLeakRules>> = {
  small_appliance: { useClass: null, aimExcluded: true, note: "Small appliances hold ≤ 5 lb and are never covered." },
  residential_split: {
    useClass: "comfort_cooling",
    aimExcluded: true,
    note: "Residential and light-commercial A/C and heat pumps are outside 84.106.",
  },
  packaged_rooftop: {
    useClass: "comfort_cooling",
    aimExcluded: false,
    note: "84.102 names packaged rooftop units as comfort cooling. Review: a light-commercial rooftop unit may belong to the excluded subsector.",
  },
  commercial_refrigeration: {
    useClass: "commercial_refrigeration",
    aimExcluded: false,
    note: "Retail food and cold-storage warehouse appliances.",
  },
  industrial_process: { useClass: "industrial_process", aimExcluded: false, note: "Industrial process refrigeration." },
  chiller: { useClass: "comfort_cooling", aimExcluded: false, note: "84.102 names chillers as comfort cooling." },
  other: { useClass: "other", aimExcluded: false, note: "Other appliances share the comfort-cooling rate." },
};

export type LeakRegime = "us_608_ods" | "us_608_substitute" | "us_aim_hfc";

/**
 * Applicability thresholds. Sources: 82.157(a) [S3] (≥ 50 lb ODS; older text "more than 50 lb");
 * 84.106 [S9] (≥ 15 lb HFC or substitute with GWP > 53 from 2026-01-01). The 2019-01-01 to
 * 2020-04-09 extension of Part 82 to HFC substitutes is from memory.
 */
export const LEAK_REGIME_THRESHOLDS = {
  odsMinChargeG: toGrams(50, "lb"),
  odsCurrentTextFrom: "2019-01-01",
  substituteFrom: "2019-01-01",
  substituteUntil: "2020-04-10",
  aimFrom: "2026-01-01",
  aimMinChargeG: toGrams(15, "lb"),
  aimGwpAbove: 53,
} as const;

export interface LeakRegimeInput {
  refrigerant: string;
  fullChargeG: number | null;
  category: ApplianceCategory;
  /** The calendar date the question is asked for (e.g. the addition date). */
  on: IsoDate;
}

export interface LeakRegimeResult {
  regime: LeakRegime | null;
  useClass: LeakUseClass | null;
  reason: string;
  citation: string | null;
}

/** Which leak-repair regime covers an appliance on a date, and why (REFERENCE.md §1.5, §3.2). */
export function leakRepairRegime(input: LeakRegimeInput): LeakRegimeResult {
  const t = LEAK_REGIME_THRESHOLDS;
  const rules = CATEGORY_LEAK_RULES[input.category];
  const useClass = rules.useClass;
  const r = getRefrigerant(input.refrigerant);
  const none = (reason: string): LeakRegimeResult => ({ regime: null, useClass, reason, citation: null });
  if (!useClass) return none("Small appliances are not subject to leak repair");
  if (!r) return none(`${input.refrigerant} is not in the refrigerant catalogue`);
  if (input.fullChargeG === null || input.fullChargeG <= 0) return none("The full charge is not recorded");
  const charge = input.fullChargeG;
  if (r.odsClass) {
    const covered = input.on >= t.odsCurrentTextFrom ? charge >= t.odsMinChargeG : charge > t.odsMinChargeG;
    return covered
      ? {
          regime: "us_608_ods",
          useClass,
          reason: `${r.designation} is an ozone-depleting refrigerant and the charge is 50 lb or more`,
          citation: "40 CFR 82.157(a)",
        }
      : none(`${r.designation} appliance holds less than 50 lb`);
  }
  const gwp = r.gwp.usExchange;
  const hfcCovered = r.containsHfc && gwp !== null && gwp > t.aimGwpAbove;
  if (input.on >= t.aimFrom) {
    if (!hfcCovered) return none(`${r.designation} is neither ozone-depleting nor an HFC with GWP above 53`);
    if (rules.aimExcluded) return none("Residential and light-commercial air conditioning is outside the AIM leak-repair rule");
    if (charge < t.aimMinChargeG) return none("The charge is below 15 lb");
    return {
      regime: "us_aim_hfc",
      useClass,
      reason: `${r.designation} contains an HFC with GWP above 53 and the charge is 15 lb or more`,
      citation: "40 CFR 84.106",
    };
  }
  if (input.on >= t.substituteFrom && input.on < t.substituteUntil && r.containsHfc && charge >= t.odsMinChargeG) {
    return {
      regime: "us_608_substitute",
      useClass,
      reason: `${r.designation} substitute appliance of 50 lb or more (2019–2020 rule)`,
      citation: "40 CFR 82.157(a) (2016 text)",
    };
  }
  return none(`No leak-repair rule covers a ${r.designation} appliance on ${input.on}`);
}

/**
 * Trigger rates (%). Since 2019-01-01: 82.157(c)(2) [S3], same in 84.106 [S9]. Before: old 82.156(i) [S5].
 */
export const LEAK_RATE_THRESHOLDS: readonly {
  from: IsoDate | null;
  until: IsoDate | null;
  rates: Readonly<Record<LeakUseClass, number>>;
}[] = [
  { from: null, until: "2019-01-01", rates: { commercial_refrigeration: 35, industrial_process: 35, comfort_cooling: 15, other: 15 } },
  { from: "2019-01-01", until: null, rates: { commercial_refrigeration: 20, industrial_process: 30, comfort_cooling: 10, other: 10 } },
];

export function leakRateThreshold(useClass: LeakUseClass, on: IsoDate): number {
  const row = LEAK_RATE_THRESHOLDS.find((r) => (r.from === null || on >= r.from) && (r.until === null || on < r.until));
  return row!.rates[useClass];
}

/** "Over the applicable leak rate": exactly at the threshold does not exceed (inference, REFERENCE.md §3.2). */
export function exceedsLeakThreshold(percent: number, threshold: number): boolean {
  return percent > threshold;
}
