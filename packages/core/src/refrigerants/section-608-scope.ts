import type { ApplianceCategory } from "../vocabulary";
import { getRefrigerant } from "./catalogue";
import { normaliseDesignation } from "./normalise-designation";

export interface Section608Scope {
  /** The section 608 practices (certification, evacuation, recovery equipment, disposal) apply. */
  covered: boolean;
  reason: string;
  citation: string;
}

/**
 * Whether subpart F's practices apply to work on an appliance: they apply to class I and II
 * refrigerants and to substitutes, except substitutes exempt under 40 CFR 82.154(a)(1) in the end use
 * at hand (82.152 "refrigerant" leaves exempt substitutes out). A refrigerant the catalogue does not
 * know is treated as covered.
 */
export function section608Scope(refrigerant: string, category: ApplianceCategory): Section608Scope {
  const r = getRefrigerant(refrigerant);
  const name = normaliseDesignation(refrigerant);
  if (!r) return { covered: true, reason: `${name} is not in the catalogue, so it is treated as covered`, citation: "40 CFR 82.152" };
  const ex = r.section608Exemption;
  if (ex && (ex.endUses === "any" || ex.endUses.includes(category))) {
    return { covered: false, reason: `${r.designation} is an exempt substitute here: ${ex.note}`, citation: ex.citation };
  }
  return {
    covered: true,
    reason: r.odsClass
      ? `${r.designation} is a class ${r.odsClass === "class_i" ? "I" : "II"} refrigerant`
      : `${r.designation} is a non-exempt substitute`,
    citation: "40 CFR 82.152; 40 CFR 82.154(a)(1)",
  };
}

export function section608Covered(appliance: { refrigerant: string; category: ApplianceCategory }): boolean {
  return section608Scope(appliance.refrigerant, appliance.category).covered;
}
