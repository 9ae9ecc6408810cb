import { UnknownRefrigerantError } from "../errors";
import { getRefrigerant, type Refrigerant } from "../refrigerants/catalogue";
import { celsiusToFahrenheit } from "../units/temperature";
import type { PressureClass } from "../vocabulary";

/**
 * 40 CFR 82.152 pressure classes as in force since 12 March 2004, by the liquid saturation pressure
 * at 104 °F. Source: REFERENCE.md §1.3 [S7].
 *
 * Boundary convention (the rule text says "between 45 and 170 psia" without saying which end
 * belongs where): each band includes its lower bound; "very high" is strictly above 355 psia, as the
 * text says "above". So: low < 45 ≤ medium < 170 ≤ high ≤ 355 < very high. A refrigerant whose
 * critical temperature is below 104 °F is very high whatever its pressure.
 */
export const PRESSURE_CLASS_BANDS_2004 = {
  lowBelowPsia: 45,
  mediumBelowPsia: 170,
  highUpToPsia: 355,
  veryHighCriticalTempBelowF: 104,
} as const;

export interface PressureProperties {
  /** Liquid (bubble) saturation pressure at 104 °F, psia; null if supercritical or unknown. */
  pSat104Psia: number | null;
  criticalTempC: number | null;
}

export function classifyPressureFromProperties(props: PressureProperties): PressureClass | null {
  const b = PRESSURE_CLASS_BANDS_2004;
  if (props.criticalTempC !== null && celsiusToFahrenheit(props.criticalTempC) < b.veryHighCriticalTempBelowF) {
    return "very_high";
  }
  const p = props.pSat104Psia;
  if (p === null) return null;
  if (p < b.lowBelowPsia) return "low";
  if (p < b.mediumBelowPsia) return "medium";
  if (p <= b.highUpToPsia) return "high";
  return "very_high";
}

function resolve(designationOrRefrigerant: string | Refrigerant): Refrigerant {
  if (typeof designationOrRefrigerant !== "string") return designationOrRefrigerant;
  const r = getRefrigerant(designationOrRefrigerant);
  if (!r) throw new UnknownRefrigerantError(designationOrRefrigerant);
  return r;
}

/**
 * Pressure class of a refrigerant by the 2004 definitions, from the catalogue's data.
 * Note R-32 (359.4 psia) comes out very high: derived from the numbers, not stated by EPA.
 */
export function classifyPressure(designation: string | Refrigerant): PressureClass {
  const r = resolve(designation);
  const cls = classifyPressureFromProperties({ pSat104Psia: r.pSat104Psia?.bubble ?? null, criticalTempC: r.criticalTempC });
  if (!cls) throw new UnknownRefrigerantError(`${r.designation} (no pressure data)`);
  return cls;
}

/** The superseded 1993 scheme (boiling point at 29.9 in Hg; no medium class). Source: REFERENCE.md §1.4 [S8]. */
export type PressureClass1993 = "low" | "high" | "very_high";

export const PRESSURE_CLASS_BANDS_1993 = { veryHighBelowC: -50, lowAboveC: 10 } as const;

/** Kept only to show how the old wording differs (R-410A very high in 1993, high since 2004). Do not use for rules. */
export function classifyPressure1993(designation: string | Refrigerant): PressureClass1993 {
  const r = resolve(designation);
  const nbp = r.normalBoilingPointC;
  if (nbp === null) return "very_high";
  if (nbp < PRESSURE_CLASS_BANDS_1993.veryHighBelowC) return "very_high";
  if (nbp > PRESSURE_CLASS_BANDS_1993.lowAboveC) return "low";
  return "high";
}
