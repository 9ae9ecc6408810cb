import { OutOfTableRangeError } from "../errors";
import { getRefrigerant } from "../refrigerants/catalogue";
import { normaliseDesignation } from "../refrigerants/normalise-designation";
import { saturationPressurePsig } from "../refrigerants/saturation-pressure";

export type CylinderPressureStatus = "consistent" | "non_condensables_suspected" | "below_saturation" | "no_data";

export interface CylinderPressureCheck {
  status: CylinderPressureStatus;
  /** Saturation pressure at the cylinder temperature (psig), bubble column for blends. */
  saturationPsig: number | null;
  /** Reading minus saturation pressure, psi. */
  differencePsi: number | null;
  reason: string;
}

/**
 * Non-condensables check on a recovery cylinder at room temperature: compare the gauge reading with
 * the saturation pressure at the cylinder temperature (bubble column for a zeotropic blend). A
 * reading more than `tolerancePsi` above it suggests air or other non-condensables. The rule of thumb
 * is from EPA 608 training texts (REFERENCE.md §6.3, from memory); the tolerance is a product setting.
 */
export function checkCylinderPressure(input: {
  refrigerant: string;
  temperatureF: number;
  pressurePsig: number;
  tolerancePsi: number;
}): CylinderPressureCheck {
  const designation = normaliseDesignation(input.refrigerant);
  let saturation: number | null;
  try {
    saturation = saturationPressurePsig(designation, input.temperatureF, "bubble");
  } catch (e) {
    if (e instanceof OutOfTableRangeError) {
      return { status: "no_data", saturationPsig: null, differencePsi: null, reason: e.message };
    }
    throw e;
  }
  if (saturation === null) {
    const known = getRefrigerant(designation) ? "" : " (not in the catalogue)";
    return { status: "no_data", saturationPsig: null, differencePsi: null, reason: `No P-T table is shipped for ${designation}${known}` };
  }
  const diff = input.pressurePsig - saturation;
  const at = `${saturation.toFixed(1)} psig at ${input.temperatureF} °F`;
  if (diff > input.tolerancePsi) {
    return {
      status: "non_condensables_suspected",
      saturationPsig: saturation,
      differencePsi: diff,
      reason: `Reads ${input.pressurePsig} psig, ${diff.toFixed(1)} psi above ${designation} saturation (${at})`,
    };
  }
  if (diff < -input.tolerancePsi) {
    return {
      status: "below_saturation",
      saturationPsig: saturation,
      differencePsi: diff,
      reason: `Reads ${diff.toFixed(1)} psi below saturation (${at}): the cylinder may not have settled, or holds little liquid`,
    };
  }
  return {
    status: "consistent",
    saturationPsig: saturation,
    differencePsi: diff,
    reason: `Within ${input.tolerancePsi} psi of saturation (${at})`,
  };
}
