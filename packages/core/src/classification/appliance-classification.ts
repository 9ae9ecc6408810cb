import { toGrams } from "../units/mass";
import type { CertificationType, PressureClass } from "../vocabulary";
import { classifyPressure } from "./classify-pressure";

/** 82.152: a small appliance holds 5 lb or less. In grams: 5 lb = 2,267.96 g, stored as 2,268 g. */
export const SMALL_APPLIANCE_MAX_CHARGE_G = toGrams(5, "lb");

export interface ApplianceForClassification {
  refrigerant: string;
  fullChargeG: number | null;
  /** Fully manufactured, charged and hermetically sealed in a factory. */
  factorySealed: boolean;
}

/**
 * Small appliance (40 CFR 82.152): factory-sealed AND full charge ≤ 5 lb. A field-charged 4-lb unit
 * is not a small appliance (REFERENCE.md §1.2). An unknown charge is not small.
 */
export function isSmallAppliance(appliance: Pick<ApplianceForClassification, "fullChargeG" | "factorySealed">): boolean {
  return appliance.factorySealed && appliance.fullChargeG !== null && appliance.fullChargeG <= SMALL_APPLIANCE_MAX_CHARGE_G;
}

/**
 * Which certification types cover work on each kind of appliance (40 CFR 82.161; REFERENCE.md §1.1).
 * Kept as data so a reviewer can read it. Type II covers medium, high and very high since 2004.
 */
export const CERTIFICATION_COVERAGE: Readonly<Record<"small_appliance" | PressureClass, readonly CertificationType[]>> = {
  small_appliance: ["type_i", "universal"],
  low: ["type_iii", "universal"],
  medium: ["type_ii", "universal"],
  high: ["type_ii", "universal"],
  very_high: ["type_ii", "universal"],
};

export type ApplianceCertificationClass = keyof typeof CERTIFICATION_COVERAGE;

/** "small_appliance" for a small appliance, otherwise the refrigerant's pressure class. */
export function certificationClass(appliance: ApplianceForClassification): ApplianceCertificationClass {
  return isSmallAppliance(appliance) ? "small_appliance" : classifyPressure(appliance.refrigerant);
}

export function requiredCertificationTypes(appliance: ApplianceForClassification): readonly CertificationType[] {
  return CERTIFICATION_COVERAGE[certificationClass(appliance)];
}
