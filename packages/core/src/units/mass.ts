import { CoreInputError } from "../errors";
import type { MassDisplayUnit } from "../vocabulary";

/** Exact by definition: 1 lb = 0.45359237 kg (international avoirdupois pound). */
export const GRAMS_PER_LB = 453.59237;
/** 1 oz = 1/16 lb. */
export const GRAMS_PER_OZ = GRAMS_PER_LB / 16;
export const GRAMS_PER_KG = 1000;

export type MassUnit = "lb" | "oz" | "kg" | "g";

const GRAMS_PER: Record<MassUnit, number> = { lb: GRAMS_PER_LB, oz: GRAMS_PER_OZ, kg: GRAMS_PER_KG, g: 1 };

/** Converts an entered amount to the stored unit: integer grams (half a gram rounds away from zero). */
export function toGrams(value: number, unit: MassUnit): number {
  if (!Number.isFinite(value)) throw new CoreInputError("The amount must be a finite number", "value");
  const grams = value * GRAMS_PER[unit];
  return Math.sign(grams) * Math.round(Math.abs(grams));
}

export function gramsToLb(grams: number): number {
  return grams / GRAMS_PER_LB;
}

export function gramsToKg(grams: number): number {
  return grams / GRAMS_PER_KG;
}

export function gramsToOz(grams: number): number {
  return grams / GRAMS_PER_OZ;
}

/** Rounds half away from zero at `decimals` places, avoiding the 1.005 → 1.00 binary artefact. */
export function roundTo(value: number, decimals: number): number {
  const factor = 10 ** decimals;
  const scaled = Math.abs(value) * factor;
  const rounded = Math.round(Number(scaled.toPrecision(15)));
  return (Math.sign(value) * rounded) / factor || 0;
}

/**
 * Whole pounds and ounces (ounces rounded to `ozDecimals`, carried into pounds at 16 oz).
 * Negative masses (e.g. a mass-balance shortfall) keep the sign on both parts.
 */
export function gramsToLbOz(grams: number, ozDecimals = 1): { lb: number; oz: number } {
  const sign = grams < 0 ? -1 : 1;
  const totalOz = roundTo(Math.abs(grams) / GRAMS_PER_OZ, ozDecimals);
  let lb = Math.floor(totalOz / 16);
  let oz = roundTo(totalOz - lb * 16, ozDecimals);
  if (oz >= 16) {
    lb += 1;
    oz = roundTo(oz - 16, ozDecimals);
  }
  return { lb: sign * lb || 0, oz: sign * oz || 0 };
}

export interface FormatMassOptions {
  /** For "lb_oz" branches: "decimal" (default) gives "12.40 lb"; "lb_oz" gives "12 lb 6.4 oz". */
  style?: "decimal" | "lb_oz";
  /** Decimal places: default 2 for lb, 3 for kg, 1 for the ounces of "lb_oz". */
  decimals?: number;
}

/**
 * Formats stored grams in a branch's display unit: "12.40 lb", "12 lb 6.4 oz" or "5.625 kg".
 * The number always carries its unit; a negative mass starts with a minus sign.
 */
export function formatMass(grams: number, displayUnit: MassDisplayUnit, opts: FormatMassOptions = {}): string {
  if (displayUnit === "kg") {
    const d = opts.decimals ?? 3;
    return `${roundTo(gramsToKg(grams), d).toFixed(d)} kg`;
  }
  if (opts.style === "lb_oz") {
    const d = opts.decimals ?? 1;
    const { lb, oz } = gramsToLbOz(grams, d);
    const sign = grams < 0 && (lb !== 0 || oz !== 0) ? "-" : "";
    return `${sign}${Math.abs(lb)} lb ${Math.abs(oz).toFixed(d)} oz`;
  }
  const d = opts.decimals ?? 2;
  return `${roundTo(gramsToLb(grams), d).toFixed(d)} lb`;
}

/**
 * The shortest decimal in `unit` that converts back to exactly `grams` (at most 6 places). Used to
 * re-open a stored mass for correction when the entered figure is not known: leaving it untouched
 * then sends back the same grams, never a drifted value.
 */
export function shortestAmountFor(grams: number, unit: MassUnit): number {
  for (let d = 0; d <= 6; d++) {
    const v = roundTo(grams / GRAMS_PER[unit], d);
    if (toGrams(v, unit) === grams) return v;
  }
  return roundTo(grams / GRAMS_PER[unit], 6);
}

/**
 * The amount as the person typed it, while it still describes the stored grams. Grams are what the
 * rules compute with; a pound or an ounce is not a whole number of grams, so the typed figure and
 * unit are kept beside them (95 lb is stored as 43,091 g, which reads back as 94.9994 lb). If the
 * grams were changed without a typed figure (an import, a correction in grams), the typed figure no
 * longer matches and null is returned, so nothing stale is shown.
 */
export function enteredAmount(
  grams: number,
  amount: number | null | undefined,
  unit: string | null | undefined,
): { amount: number; unit: MassUnit } | null {
  if (amount === null || amount === undefined || !unit || !(unit in GRAMS_PER)) return null;
  if (!Number.isFinite(amount) || toGrams(amount, unit as MassUnit) !== grams) return null;
  return { amount, unit: unit as MassUnit };
}

/** An amount and its unit as text, e.g. "95 lb", "12.5 oz", "43.091 kg". */
export function formatEnteredAmount(e: { amount: number; unit: MassUnit }): string {
  return `${e.amount.toLocaleString("en-US", { maximumFractionDigits: 6 })} ${e.unit}`;
}
