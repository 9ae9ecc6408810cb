import { classifyPressure } from "../../classification/classify-pressure";
import { isSmallAppliance } from "../../classification/appliance-classification";
import { getRefrigerant } from "../../refrigerants/catalogue";
import { normaliseDesignation } from "../../refrigerants/normalise-designation";
import { section608Covered } from "../../refrigerants/section-608-scope";
import { JOB_KIND_LABELS, type PressureClass } from "../../vocabulary";
import type { Appliance, Job } from "../records";

export const PRESSURE_WORDS: Record<PressureClass, string> = {
  low: "low-pressure",
  medium: "medium-pressure",
  high: "high-pressure",
  very_high: "very-high-pressure",
};

/** Kinds of job that open the refrigerant circuit and so need a certified technician. */
export const CIRCUIT_OPENING_KINDS: readonly Job["kind"][] = ["recovery", "charge", "leak_repair", "disposal"];

export function jobWords(job: Job): string {
  return `${JOB_KIND_LABELS[job.kind]} job #${job.id} on ${job.performedOn}`;
}

export function applianceWords(a: Appliance): string {
  return `${a.label} (${normaliseDesignation(a.refrigerant)})`;
}

/** Pressure class of the appliance's refrigerant, or null when the catalogue has no data for it. */
export function safePressureClass(a: Appliance): PressureClass | null {
  if (!getRefrigerant(a.refrigerant)) return null;
  try {
    return classifyPressure(a.refrigerant);
  } catch {
    return null;
  }
}

export function small(a: Appliance): boolean {
  return isSmallAppliance(a);
}

export function recoveredG(job: Job): number {
  return job.movements.filter((m) => m.direction === "recovered").reduce((s, m) => s + m.amountG, 0);
}

/**
 * Section 608 practices apply to the appliance's refrigerant in its end use: not to substitutes
 * exempt under 40 CFR 82.154(a)(1), such as carbon dioxide anywhere or ammonia in commercial and
 * industrial process refrigeration.
 */
export function under608(a: Appliance): boolean {
  return section608Covered(a);
}
