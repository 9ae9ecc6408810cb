import { getRefrigerant } from "../refrigerants/catalogue";
import { section608Scope } from "../refrigerants/section-608-scope";
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
 * 84.106 [S9] (≥ 15 lb, refrigerant containing an HFC or a substitute with GWP > 53, from
 * 2026-01-01). From 2019-01-01 until the 2020 rule took effect on 2020-04-10, 82.157 covered
 * appliances of 50 lb or more of a class I/II refrigerant or a non-exempt substitute (2016 rule text,
 * REFERENCE.md §1.5 "since 10 Apr 2020, not for appliances that contain only substitutes").
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
  /**
   * The full charge is not recorded. An unknown charge takes the stricter side: the appliance is
   * treated as covered when a charge at the rule's minimum would be, and the leak rate cannot be shown.
   */
  chargeUnknown: boolean;
}

/**
 * GWP used for the AIM test of a substitute that is not an HFC: the exchange value where there is
 * one, else AR4, else AR5, else the EU figure (from memory: EPA uses AR4 values for such substitutes).
 */
function aimGwp(r: NonNullable<ReturnType<typeof getRefrigerant>>): number | null {
  return r.gwp.usExchange ?? r.gwp.ar4 ?? r.gwp.ar5 ?? r.gwp.eu;
}

/**
 * AIM coverage (40 CFR 84.106, REFERENCE.md §1.5): the refrigerant contains an HFC, or it is a
 * substitute for an HFC with a GWP above 53. ODS fall under Part 82 instead.
 */
export function aimCoversRefrigerant(refrigerant: string): boolean {
  const r = getRefrigerant(refrigerant);
  if (!r || r.odsClass) return false;
  if (r.containsHfc) return true;
  const gwp = aimGwp(r);
  return gwp !== null && gwp > LEAK_REGIME_THRESHOLDS.aimGwpAbove;
}

/** Which leak-repair regime covers an appliance on a date, and why (REFERENCE.md §1.5, §3.2). */
export function leakRepairRegime(input: LeakRegimeInput): LeakRegimeResult {
  const t = LEAK_REGIME_THRESHOLDS;
  const rules = CATEGORY_LEAK_RULES[input.category];
  const useClass = rules.useClass;
  const r = getRefrigerant(input.refrigerant);
  const chargeUnknown = input.fullChargeG === null || input.fullChargeG <= 0;
  const none = (reason: string): LeakRegimeResult => ({ regime: null, useClass, reason, citation: null, chargeUnknown });
  if (!useClass) return none("Small appliances are not subject to leak repair");
  if (!r) return none(`${input.refrigerant} is not in the refrigerant catalogue`);
  const unknown = " The full charge is not recorded, so the appliance is treated as covered.";
  const covered = (regime: LeakRegime, reason: string, citation: string): LeakRegimeResult => ({
    regime,
    useClass,
    reason: chargeUnknown ? `${reason}.${unknown}` : reason,
    citation,
    chargeUnknown,
  });
  // An unknown charge meets every minimum (the stricter side).
  const atLeast = (minG: number) => chargeUnknown || (input.fullChargeG as number) >= minG;
  if (r.odsClass) {
    const big =
      chargeUnknown || (input.on >= t.odsCurrentTextFrom ? atLeast(t.odsMinChargeG) : (input.fullChargeG as number) > t.odsMinChargeG);
    return big
      ? covered("us_608_ods", `${r.designation} is an ozone-depleting refrigerant and the charge is 50 lb or more`, "40 CFR 82.157(a)")
      : none(`${r.designation} appliance holds less than 50 lb`);
  }
  if (input.on >= t.aimFrom) {
    if (!aimCoversRefrigerant(r.designation)) return none(`${r.designation} neither contains an HFC nor has a GWP above 53`);
    if (rules.aimExcluded) return none("Residential and light-commercial air conditioning is outside the AIM leak-repair rule");
    if (!atLeast(t.aimMinChargeG)) return none("The charge is below 15 lb");
    return covered(
      "us_aim_hfc",
      `${r.designation} ${r.containsHfc ? "contains an HFC" : "is a substitute with GWP above 53"} and the charge is 15 lb or more`,
      "40 CFR 84.106",
    );
  }
  if (input.on >= t.substituteFrom && input.on < t.substituteUntil) {
    if (!section608Scope(r.designation, input.category).covered)
      return none(`${r.designation} is an exempt substitute in this use (40 CFR 82.154(a)(1))`);
    if (atLeast(t.odsMinChargeG))
      return covered(
        "us_608_substitute",
        `${r.designation} is a non-exempt substitute and the appliance holds 50 lb or more (2019–2020 rule)`,
        "40 CFR 82.157(a) (2016 text)",
      );
    return none(`${r.designation} appliance holds less than 50 lb`);
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

/**
 * "Over the applicable leak rate": exactly at the threshold does not exceed (inference, REFERENCE.md
 * §3.2). A difference within floating-point noise (0.2 × 100 = 20.000000000000004) is not "over".
 */
export function exceedsLeakThreshold(percent: number, threshold: number): boolean {
  return percent - threshold > 1e-9 * Math.max(1, Math.abs(threshold));
}

/**
 * Whether a leak-rate event is over the threshold for the amounts as entered: its lowest possible
 * rate, given the rounding of stored grams, must exceed it (20 lb added to 100 lb is 20 %, not over).
 */
export function eventExceedsThreshold(event: { percent: number | null; percentLow?: number | null }, threshold: number): boolean {
  const p = event.percentLow ?? event.percent;
  return p !== null && exceedsLeakThreshold(p, threshold);
}
