import { CoreInputError, UnknownRefrigerantError } from "../errors";
import { getRefrigerant, type EuAnnex } from "../refrigerants/catalogue";

/** t CO2e = charge (kg) × GWP / 1000. Source: Regulation (EU) 2024/573 Art. 3 (REFERENCE.md §7 [S21]). */
export function co2eTonnes(chargeKg: number, gwp: number): number {
  return (chargeKg * gwp) / 1000;
}

/** Charge in kg that reaches `tonnes` t CO2e for a given GWP (e.g. the 5 t threshold). */
export function chargeKgForCo2e(tonnes: number, gwp: number): number {
  if (!(gwp > 0)) throw new CoreInputError("The GWP must be greater than zero", "gwp");
  return (tonnes * 1000) / gwp;
}

/**
 * Leak-check bands. Annex I gases by t CO2e (517/2014 Art. 4 carried into 2024/573 Art. 5; gov.uk
 * tables [S21]); Annex II section 1 gases (HFO/HCFO) by kg (from memory, REFERENCE.md §7).
 * Lower bounds inclusive; intervals in months, halved-then-doubled with a leak-detection system.
 */
export const EU_LEAK_CHECK_BANDS: Readonly<
  Record<
    EuAnnex,
    {
      measure: "t_co2e" | "kg";
      bands: readonly { from: number; months: number; monthsWithLds: number }[];
      ldsRequiredFrom: number;
      hermeticExemptBelow: number;
    }
  >
> = {
  annex_i: {
    measure: "t_co2e",
    bands: [
      { from: 5, months: 12, monthsWithLds: 24 },
      { from: 50, months: 6, monthsWithLds: 12 },
      { from: 500, months: 3, monthsWithLds: 6 },
    ],
    ldsRequiredFrom: 500,
    hermeticExemptBelow: 10,
  },
  annex_ii_1: {
    measure: "kg",
    bands: [
      { from: 1, months: 12, monthsWithLds: 24 },
      { from: 10, months: 6, monthsWithLds: 12 },
      { from: 100, months: 3, monthsWithLds: 6 },
    ],
    ldsRequiredFrom: 100,
    hermeticExemptBelow: 2,
  },
};

export interface EuLeakCheckInput {
  refrigerant: string;
  chargeKg: number;
  hasLeakDetectionSystem?: boolean;
  /** Hermetically sealed and labelled as such. */
  hermeticallySealed?: boolean;
}

export interface EuLeakCheckResult {
  required: boolean;
  /** Months between checks, or null when no check is required. */
  intervalMonths: number | null;
  /** Unrounded t CO2e (compared unrounded); null for Annex II gases measured in kg. */
  co2eTonnes: number | null;
  leakDetectionSystemRequired: boolean;
  reason: string;
}

/**
 * EU leak-check interval. Compares the unrounded CO2e (REFERENCE.md §7.1 note): 2.39 kg R-410A is
 * 4.990 t → no check; 2.40 kg is 5.011 t → every 12 months.
 */
export function euLeakCheckInterval(input: EuLeakCheckInput): EuLeakCheckResult {
  const r = getRefrigerant(input.refrigerant);
  if (!r) throw new UnknownRefrigerantError(input.refrigerant);
  if (!r.euAnnex) {
    return {
      required: false,
      intervalMonths: null,
      co2eTonnes: null,
      leakDetectionSystemRequired: false,
      reason: `${r.designation} is not a fluorinated gas listed in Annex I or II`,
    };
  }
  const spec = EU_LEAK_CHECK_BANDS[r.euAnnex];
  let amount: number;
  let co2e: number | null = null;
  if (spec.measure === "t_co2e") {
    if (r.gwp.eu === null) throw new CoreInputError(`No EU GWP for ${r.designation}`, "refrigerant");
    co2e = co2eTonnes(input.chargeKg, r.gwp.eu);
    amount = co2e;
  } else {
    amount = input.chargeKg;
  }
  const unit = spec.measure === "t_co2e" ? "t CO2e" : "kg";
  const shown = `${amount.toFixed(spec.measure === "t_co2e" ? 2 : 1)} ${unit}`;
  const ldsRequired = amount >= spec.ldsRequiredFrom;
  const band = [...spec.bands].reverse().find((b) => amount >= b.from);
  if (!band) {
    return {
      required: false,
      intervalMonths: null,
      co2eTonnes: co2e,
      leakDetectionSystemRequired: false,
      reason: `${shown} is below ${spec.bands[0]!.from} ${unit}`,
    };
  }
  if (input.hermeticallySealed && amount < spec.hermeticExemptBelow) {
    return {
      required: false,
      intervalMonths: null,
      co2eTonnes: co2e,
      leakDetectionSystemRequired: false,
      reason: `Hermetically sealed and labelled, ${shown} is below ${spec.hermeticExemptBelow} ${unit}`,
    };
  }
  const months = input.hasLeakDetectionSystem ? band.monthsWithLds : band.months;
  return {
    required: true,
    intervalMonths: months,
    co2eTonnes: co2e,
    leakDetectionSystemRequired: ldsRequired,
    reason: `${shown}: check every ${months} months${input.hasLeakDetectionSystem ? " (leak-detection system fitted)" : ""}`,
  };
}
