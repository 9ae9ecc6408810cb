import { CoreInputError } from "../errors";
import type { EvacuationUnit } from "../vocabulary";

/** Conversion factors used by REFERENCE.md §2.3: 1 in Hg = 0.49115 psi = 3.38639 kPa. */
export const PSI_PER_IN_HG = 0.49115;
export const KPA_PER_IN_HG = 3.38639;
export const MM_HG_PER_IN_HG = 25.4;
export const MICRONS_PER_IN_HG = 25_400;
export const KPA_PER_PSI = KPA_PER_IN_HG / PSI_PER_IN_HG;

/**
 * The atmosphere a gauge reading is referenced to.
 * - "cfr": 29.9 in Hg, the atmosphere of 40 CFR 82.156 Table 1 (vacuum "relative to a standard
 *   atmosphere of 29.9 inches of mercury"). Used for every evacuation comparison.
 * - "standard": 14.696 psia (29.92 in Hg), the basis of the shipped P-T tables (psig columns).
 */
export type AtmosphereBasis = "cfr" | "standard";
export const CFR_ATMOSPHERE_IN_HG = 29.9;
export const STANDARD_ATMOSPHERE_PSIA = 14.696;

export function atmosphereInHg(basis: AtmosphereBasis): number {
  return basis === "cfr" ? CFR_ATMOSPHERE_IN_HG : STANDARD_ATMOSPHERE_PSIA / PSI_PER_IN_HG;
}

/** Every pressure unit the core reads: the evacuation units plus psia and in Hg absolute. */
export type PressureUnit = EvacuationUnit | "psia" | "in_hg_abs";

/**
 * Absolute pressure in inches of mercury for a reading in any unit. Gauge units (psig, in Hg
 * vacuum) are referenced to `basis` (default "cfr", 29.9 in Hg, the evacuation-table basis).
 */
export function toAbsoluteInHg(value: number, unit: PressureUnit, basis: AtmosphereBasis = "cfr"): number {
  if (!Number.isFinite(value)) throw new CoreInputError("The pressure must be a finite number", "value");
  switch (unit) {
    case "in_hg_vacuum":
      return atmosphereInHg(basis) - value;
    case "psig":
      return atmosphereInHg(basis) + value / PSI_PER_IN_HG;
    case "psia":
      return value / PSI_PER_IN_HG;
    case "in_hg_abs":
      return value;
    case "mm_hg_abs":
      return value / MM_HG_PER_IN_HG;
    case "microns":
      return value / MICRONS_PER_IN_HG;
    case "kpa_abs":
      return value / KPA_PER_IN_HG;
  }
}

/** The inverse of {@link toAbsoluteInHg}: expresses an absolute pressure in `unit`. */
export function fromAbsoluteInHg(inHgAbs: number, unit: PressureUnit, basis: AtmosphereBasis = "cfr"): number {
  switch (unit) {
    case "in_hg_vacuum":
      return atmosphereInHg(basis) - inHgAbs;
    case "psig":
      return (inHgAbs - atmosphereInHg(basis)) * PSI_PER_IN_HG;
    case "psia":
      return inHgAbs * PSI_PER_IN_HG;
    case "in_hg_abs":
      return inHgAbs;
    case "mm_hg_abs":
      return inHgAbs * MM_HG_PER_IN_HG;
    case "microns":
      return inHgAbs * MICRONS_PER_IN_HG;
    case "kpa_abs":
      return inHgAbs * KPA_PER_IN_HG;
  }
}

/** Converts between any two pressure units; gauge units use `basis` (default "cfr", 29.9 in Hg). */
export function convertPressure(value: number, from: PressureUnit, to: PressureUnit, basis: AtmosphereBasis = "cfr"): number {
  return fromAbsoluteInHg(toAbsoluteInHg(value, from, basis), to, basis);
}

/** Absolute pressure in psia for an evacuation reading, on the CFR basis (29.9 in Hg atmosphere). */
export function evacuationReadingToPsia(value: number, unit: EvacuationUnit): number {
  return toAbsoluteInHg(value, unit, "cfr") * PSI_PER_IN_HG;
}

/** psig → psia on the standard atmosphere (14.696 psia), the basis of the P-T tables. */
export function psigToPsia(psig: number): number {
  return psig + STANDARD_ATMOSPHERE_PSIA;
}

/** psia → psig on the standard atmosphere (14.696 psia), the basis of the P-T tables. */
export function psiaToPsig(psia: number): number {
  return psia - STANDARD_ATMOSPHERE_PSIA;
}

export function psiaToKpa(psia: number): number {
  return psia * KPA_PER_PSI;
}

export function kpaToPsia(kpa: number): number {
  return kpa / KPA_PER_PSI;
}
