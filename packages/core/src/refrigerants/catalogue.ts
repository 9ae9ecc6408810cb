import type { ApplianceCategory } from "../vocabulary";
import { normaliseDesignation } from "./normalise-designation";

export type RefrigerantClass = "CFC" | "HCFC" | "HFC" | "HFO" | "HCFO" | "HC" | "natural";
export type OdsClass = "class_i" | "class_ii";
export type SafetyGroup = "A1" | "A2L" | "A2" | "A3" | "B1" | "B2L" | "B2" | "B3";
/** GWP bases kept side by side; a GWP is never one number. */
export type GwpBasis = "ar4" | "ar5" | "usExchange" | "eu";
export type GwpValues = Readonly<Record<GwpBasis, number | null>>;
/** EU 2024/573 annex the gas falls under: Annex I (CO2e bands) or Annex II section 1 (kg bands). */
export type EuAnnex = "annex_i" | "annex_ii_1";
export type DataConfidence = "H" | "M" | "L";

/**
 * A substitute exempt from the venting prohibition of 40 CFR 82.154(a)(1). Such a substitute is not a
 * "refrigerant" for subpart F (82.152 definition), so the section 608 practices, technician
 * certification, recovery-equipment and disposal rules do not apply to it in those end uses.
 */
export interface Section608Exemption {
  /** "any" for every application, otherwise the appliance categories (end uses) it is exempt in. */
  readonly endUses: "any" | readonly ApplianceCategory[];
  readonly citation: string;
  /** The rule text in our words, and how sure we are of it. */
  readonly note: string;
}

export interface BlendComponent {
  readonly designation: string;
  readonly massPercent: number;
}

export interface Refrigerant {
  readonly designation: string;
  /** Every class present, main class first (a blend of an HFC and an HFO has both). */
  readonly classes: readonly RefrigerantClass[];
  readonly description: string;
  readonly odsClass: OdsClass | null;
  readonly safetyGroup: SafetyGroup;
  /** Mass-% composition of a blend; null for a single compound. */
  readonly composition: readonly BlendComponent[] | null;
  readonly blendType: "zeotropic" | "azeotropic" | null;
  readonly containsHfc: boolean;
  readonly gwp: GwpValues;
  readonly gwpNote: string | null;
  readonly euAnnex: EuAnnex | null;
  readonly criticalTempC: number | null;
  /** Normal boiling point at 1 atm (bubble point for blends). */
  readonly normalBoilingPointC: number | null;
  /** Liquid (bubble) and vapour (dew) saturation pressure at 104 °F; equal for single compounds. */
  readonly pSat104Psia: { readonly bubble: number; readonly dew: number } | null;
  /** "H" for computed values; "M" for estimates that fix the class but are not test values. */
  readonly pressureDataConfidence: DataConfidence;
  readonly liquidDensity77KgM3: number | null;
  /** Specific gravity of the liquid at 77 °F against water at 77 °F (Guideline K fill formula). */
  readonly sg77F: number | null;
  /** Specific gravity of the liquid at 130 °F against water at 60 °F (stricter fill option). */
  readonly sg130F: number | null;
  /** Exempt substitute under 82.154(a)(1), by end use; null = covered by subpart F wherever it is used. */
  readonly section608Exemption: Section608Exemption | null;
}

type Identity = Pick<Refrigerant, "classes" | "description" | "odsClass" | "safetyGroup" | "composition" | "blendType" | "euAnnex">;

const c = (...parts: [string, number][]): BlendComponent[] => parts.map(([designation, massPercent]) => ({ designation, massPercent }));

/**
 * Identity, ODS class, ASHRAE 34 safety group and blend composition.
 * Source: REFERENCE.md §6.1 — compositions from the ASHRAE designation list as carried in CoolProp
 * ASHRAE_predefined_2026.tsv [S17] (R-502, R-514A from memory); safety groups ASHRAE 34 (from
 * memory, confirmed by [S31]/[S32] where marked there); EU annex from Regulation (EU) 2024/573.
 * R-23 and R-227ea are included for the EU threshold examples (REFERENCE.md §7.1 EU1).
 */
const IDENTITY: Record<string, Identity> = {
  "R-22": {
    classes: ["HCFC"],
    description: "HCFC",
    odsClass: "class_ii",
    safetyGroup: "A1",
    composition: null,
    blendType: null,
    euAnnex: null,
  },
  "R-410A": {
    classes: ["HFC"],
    description: "HFC blend (zeotropic, near-azeotropic)",
    odsClass: null,
    safetyGroup: "A1",
    composition: c(["R-32", 50], ["R-125", 50]),
    blendType: "zeotropic",
    euAnnex: "annex_i",
  },
  "R-32": {
    classes: ["HFC"],
    description: "HFC",
    odsClass: null,
    safetyGroup: "A2L",
    composition: null,
    blendType: null,
    euAnnex: "annex_i",
  },
  "R-134a": {
    classes: ["HFC"],
    description: "HFC",
    odsClass: null,
    safetyGroup: "A1",
    composition: null,
    blendType: null,
    euAnnex: "annex_i",
  },
  "R-404A": {
    classes: ["HFC"],
    description: "HFC blend (zeotropic)",
    odsClass: null,
    safetyGroup: "A1",
    composition: c(["R-125", 44], ["R-143a", 52], ["R-134a", 4]),
    blendType: "zeotropic",
    euAnnex: "annex_i",
  },
  "R-407C": {
    classes: ["HFC"],
    description: "HFC blend (zeotropic)",
    odsClass: null,
    safetyGroup: "A1",
    composition: c(["R-32", 23], ["R-125", 25], ["R-134a", 52]),
    blendType: "zeotropic",
    euAnnex: "annex_i",
  },
  "R-507A": {
    classes: ["HFC"],
    description: "HFC blend (azeotropic)",
    odsClass: null,
    safetyGroup: "A1",
    composition: c(["R-125", 50], ["R-143a", 50]),
    blendType: "azeotropic",
    euAnnex: "annex_i",
  },
  "R-454B": {
    classes: ["HFC", "HFO"],
    description: "HFC/HFO blend (zeotropic)",
    odsClass: null,
    safetyGroup: "A2L",
    composition: c(["R-32", 68.9], ["R-1234yf", 31.1]),
    blendType: "zeotropic",
    euAnnex: "annex_i",
  },
  "R-452A": {
    classes: ["HFC", "HFO"],
    description: "HFC/HFO blend (zeotropic)",
    odsClass: null,
    safetyGroup: "A1",
    composition: c(["R-32", 11], ["R-125", 59], ["R-1234yf", 30]),
    blendType: "zeotropic",
    euAnnex: "annex_i",
  },
  "R-448A": {
    classes: ["HFC", "HFO"],
    description: "HFC/HFO blend (zeotropic)",
    odsClass: null,
    safetyGroup: "A1",
    composition: c(["R-32", 26], ["R-125", 26], ["R-1234yf", 20], ["R-134a", 21], ["R-1234ze(E)", 7]),
    blendType: "zeotropic",
    euAnnex: "annex_i",
  },
  "R-449A": {
    classes: ["HFC", "HFO"],
    description: "HFC/HFO blend (zeotropic)",
    odsClass: null,
    safetyGroup: "A1",
    composition: c(["R-32", 24.3], ["R-125", 24.7], ["R-1234yf", 25.3], ["R-134a", 25.7]),
    blendType: "zeotropic",
    euAnnex: "annex_i",
  },
  "R-123": {
    classes: ["HCFC"],
    description: "HCFC",
    odsClass: "class_ii",
    safetyGroup: "B1",
    composition: null,
    blendType: null,
    euAnnex: null,
  },
  "R-1233zd(E)": {
    classes: ["HCFO"],
    description: "HCFO",
    odsClass: null,
    safetyGroup: "A1",
    composition: null,
    blendType: null,
    euAnnex: "annex_ii_1",
  },
  "R-290": {
    classes: ["HC"],
    description: "Hydrocarbon (propane)",
    odsClass: null,
    safetyGroup: "A3",
    composition: null,
    blendType: null,
    euAnnex: null,
  },
  "R-744": {
    classes: ["natural"],
    description: "Carbon dioxide",
    odsClass: null,
    safetyGroup: "A1",
    composition: null,
    blendType: null,
    euAnnex: null,
  },
  "R-717": {
    classes: ["natural"],
    description: "Ammonia",
    odsClass: null,
    safetyGroup: "B2L",
    composition: null,
    blendType: null,
    euAnnex: null,
  },
  "R-12": {
    classes: ["CFC"],
    description: "CFC",
    odsClass: "class_i",
    safetyGroup: "A1",
    composition: null,
    blendType: null,
    euAnnex: null,
  },
  "R-502": {
    classes: ["CFC", "HCFC"],
    description: "CFC/HCFC azeotrope (contains CFC-115)",
    odsClass: "class_i",
    safetyGroup: "A1",
    composition: c(["R-22", 48.8], ["R-115", 51.2]),
    blendType: "azeotropic",
    euAnnex: null,
  },
  "R-514A": {
    classes: ["HFO"],
    description: "HFO/chloro-olefin azeotrope",
    odsClass: null,
    safetyGroup: "B1",
    composition: c(["R-1336mzz(Z)", 74.7], ["R-1130(E)", 25.3]),
    blendType: "azeotropic",
    euAnnex: "annex_ii_1",
  },
  "R-1234yf": {
    classes: ["HFO"],
    description: "HFO",
    odsClass: null,
    safetyGroup: "A2L",
    composition: null,
    blendType: null,
    euAnnex: "annex_ii_1",
  },
  "R-1234ze(E)": {
    classes: ["HFO"],
    description: "HFO",
    odsClass: null,
    safetyGroup: "A2L",
    composition: null,
    blendType: null,
    euAnnex: "annex_ii_1",
  },
  "R-23": {
    classes: ["HFC"],
    description: "HFC",
    odsClass: null,
    safetyGroup: "A1",
    composition: null,
    blendType: null,
    euAnnex: "annex_i",
  },
  "R-227ea": {
    classes: ["HFC"],
    description: "HFC",
    odsClass: null,
    safetyGroup: "A1",
    composition: null,
    blendType: null,
    euAnnex: "annex_i",
  },
};

const g = (ar4: number | null, ar5: number | null, usExchange: number | null, eu: number | null): GwpValues => ({
  ar4,
  ar5,
  usExchange,
  eu,
});

/**
 * 100-year GWP per basis.
 * Source: REFERENCE.md §6.1 — AR4/AR5 for pure CFC/HCFC/HFC from openclimatedata
 * globalwarmingpotentials v0.13.1 [S16]; blends are the mass-weighted sums (EU Annex method [S26]),
 * rounded to whole numbers, with the EU 517/2014 Annex II figure standing in for HFO components that
 * AR4 did not assess. US exchange values equal AR4 for HFCs and HFC blends (AIM Act; from memory);
 * null where the substance is not an HFC. EU values: 2024/573 Annex I (AR4-based) and Annex II/IV
 * figures (HFO 4/7/4.5; R-290 3; R-717 0). ODS are not F-gases, so their EU value is null.
 */
const GWP: Record<string, { gwp: GwpValues; note?: string }> = {
  "R-22": { gwp: g(1810, 1760, null, null) },
  "R-410A": { gwp: g(2088, 1924, 2088, 2088), note: "AR4 2,087.5 and AR5 1,923.5 unrounded" },
  "R-32": { gwp: g(675, 677, 675, 675) },
  "R-134a": { gwp: g(1430, 1300, 1430, 1430) },
  "R-404A": { gwp: g(3922, 3943, 3922, 3922) },
  "R-407C": { gwp: g(1774, 1624, 1774, 1774) },
  "R-507A": { gwp: g(3985, 3985, 3985, 3985) },
  "R-454B": { gwp: g(466, 466, 466, 466), note: "AR5 466.45–466.76 depending on the value taken for R-1234yf (< 1)" },
  "R-452A": { gwp: g(2140, 1945, 2140, 2140) },
  "R-448A": { gwp: g(1387, 1273, 1387, 1387) },
  "R-449A": { gwp: g(1397, 1282, 1397, 1397) },
  "R-123": { gwp: g(77, 79, null, null) },
  "R-1233zd(E)": { gwp: g(null, 1, null, 4.5), note: "AR4 did not assess HCFOs; 4.5 is the EU 517/2014 figure" },
  "R-290": { gwp: g(null, null, null, 3), note: "EU Annex IV value 3; no AR5 value in the source table" },
  "R-744": { gwp: g(1, 1, null, 1), note: "1 by definition" },
  "R-717": { gwp: g(null, null, null, 0), note: "EU Annex IV value 0; not assigned by IPCC" },
  "R-12": { gwp: g(10900, 10200, null, null) },
  "R-502": { gwp: g(4657, 4786, null, null) },
  "R-514A": { gwp: g(null, 2, null, null), note: "about 2 (computed 1.5); from memory, low confidence" },
  "R-1234yf": { gwp: g(null, null, null, 4), note: "AR5 < 1; AR4 did not assess HFOs; 4 is the EU 517/2014 Annex II figure" },
  "R-1234ze(E)": { gwp: g(null, null, null, 7), note: "AR5 < 1; AR4 did not assess HFOs; 7 is the EU 517/2014 Annex II figure" },
  "R-23": { gwp: g(14800, 12400, 14800, 14800), note: "AR5 from memory" },
  "R-227ea": { gwp: g(3220, 3350, 3220, 3220), note: "from memory" },
};

/**
 * GWPs of blend components that are not catalogued on their own, for recomputing blend GWPs.
 * Source: REFERENCE.md §7 (HFC-125 3,500, HFC-143a 4,470 in EU Annex I = AR4); AR5 values and
 * CFC-115 from memory (they reproduce the REFERENCE.md §6.1 blend figures).
 */
export const BLEND_COMPONENT_GWPS: Readonly<Record<string, GwpValues>> = {
  "R-125": g(3500, 3170, 3500, 3500),
  "R-143a": g(4470, 4800, 4470, 4470),
  "R-115": g(7370, 7670, null, null),
  "R-1336mzz(Z)": g(null, 2, null, 2),
  "R-1130(E)": g(null, null, null, null),
};

type Pressure = Pick<Refrigerant, "criticalTempC" | "normalBoilingPointC" | "pSat104Psia" | "pressureDataConfidence">;
const p = (
  criticalTempC: number | null,
  normalBoilingPointC: number | null,
  bubble: number | null,
  dew: number | null = bubble,
  pressureDataConfidence: DataConfidence = "H",
): Pressure => ({
  criticalTempC,
  normalBoilingPointC,
  pSat104Psia: bubble === null ? null : { bubble, dew: dew ?? bubble },
  pressureDataConfidence,
});

/**
 * Critical temperature, normal boiling point and saturation pressure at 104 °F.
 * Source: REFERENCE.md §6.2 (COMPUTED from the CoolProp fluid-file equations of state [S17]).
 * Rows marked "M" are estimates (mixture VLE not computed, or from memory): they fix the class but
 * are not test values.
 */
const PRESSURE: Record<string, Pressure> = {
  "R-22": p(96.2, -40.8, 222.4),
  "R-410A": p(71.3, -51.4, 351.8, 350.8),
  "R-32": p(78.1, -51.7, 359.4),
  "R-134a": p(101.1, -26.1, 147.4),
  "R-404A": p(72.1, -46.2, 265.4, 263.2),
  "R-407C": p(86.2, -43.6, 253.7, 223.5),
  "R-507A": p(70.6, -46.7, 271.1),
  "R-12": p(112.0, -29.8, 139.1),
  "R-123": p(183.7, 27.8, 22.4),
  "R-1233zd(E)": p(165.7, 18.1, 31.3),
  "R-1234yf": p(94.7, -29.5, 147.7),
  "R-1234ze(E)": p(109.4, -19.0, 111.2),
  "R-290": p(96.7, -42.1, 198.6),
  "R-717": p(132.4, -33.3, 225.5),
  "R-744": p(31.0, null, null),
  "R-454B": p(null, -51, 335, 335, "M"),
  "R-452A": p(null, -47, 270, 270, "M"),
  "R-448A": p(null, -46, 270, 270, "M"),
  "R-449A": p(null, -46, 270, 270, "M"),
  "R-502": p(null, -45, 250, 250, "M"),
  "R-514A": p(null, 29, 22.5, 22.5, "M"),
  "R-23": p(25.9, -82.1, null, null, "M"),
  "R-227ea": p(101.7, -16.4, 101, 101, "M"),
};

type Density = Pick<Refrigerant, "liquidDensity77KgM3" | "sg77F" | "sg130F">;
const d = (liquidDensity77KgM3: number, sg77F: number, sg130F: number): Density => ({ liquidDensity77KgM3, sg77F, sg130F });

/**
 * Liquid density and specific gravity for the cylinder fill formula.
 * Source: REFERENCE.md §6.4 (COMPUTED; water by the Kell formula). R-22 at 77 °F uses the AHRI
 * Guideline K published figure 1.197 [S11] (computed 1.194), as REFERENCE.md asks.
 */
const DENSITY: Record<string, Density> = {
  "R-22": d(1190.7, 1.197, 1.061),
  "R-134a": d(1206.7, 1.21, 1.082),
  "R-410A": d(1058.9, 1.062, 0.871),
  "R-32": d(961.0, 0.964, 0.813),
  "R-404A": d(1044.0, 1.047, 0.865),
  "R-407C": d(1137.5, 1.141, 0.988),
  "R-507A": d(1047.9, 1.051, 0.862),
  "R-12": d(1311.0, 1.315, 1.195),
  "R-123": d(1463.9, 1.468, 1.387),
  "R-1234yf": d(1091.7, 1.095, 0.97),
  "R-1234ze(E)": d(1163.1, 1.167, 1.057),
  "R-1233zd(E)": d(1262.9, 1.267, 1.189),
  "R-290": d(492.4, 0.494, 0.44),
  "R-717": d(603.0, 0.605, 0.556),
};

/**
 * Exempt substitutes, 40 CFR 82.154(a)(1). Source: REFERENCE.md §6.1 venting-prohibition exemptions
 * (82.154, 2005-era text [S30]): carbon dioxide, nitrogen and water in any application; ammonia in
 * commercial or industrial process refrigeration or absorption units; hydrocarbons in industrial
 * process refrigeration that processes hydrocarbons. Propane in household refrigerators and
 * freezers, stand-alone retail food units, vending machines and room air conditioners was added by
 * the 2016 rule (from memory, REFERENCE.md §6.1 "by end use", M); those end uses are small appliances
 * here. Hydrocarbons in IPR processing hydrocarbons cannot be told from the category, so R-290 in IPR
 * stays covered (the stricter side).
 */
const SECTION_608_EXEMPTIONS: Record<string, Section608Exemption> = {
  "R-744": {
    endUses: "any",
    citation: "40 CFR 82.154(a)(1)",
    note: "Carbon dioxide is exempt in any application.",
  },
  "R-717": {
    endUses: ["commercial_refrigeration", "industrial_process"],
    citation: "40 CFR 82.154(a)(1)",
    note: "Ammonia is exempt in commercial or industrial process refrigeration and absorption units; in comfort cooling it is covered.",
  },
  "R-290": {
    endUses: ["small_appliance"],
    citation: "40 CFR 82.154(a)(1) (2016 rule; from memory)",
    note: "Propane is exempt in household refrigerators and freezers, stand-alone retail food units, vending machines and room air conditioners (small appliances here); elsewhere it is covered.",
  },
};

const NO_DENSITY: Density = { liquidDensity77KgM3: null, sg77F: null, sg130F: null };

function build(designation: string): Refrigerant {
  const identity = IDENTITY[designation];
  const gwp = GWP[designation];
  const pressure = PRESSURE[designation];
  if (!identity || !gwp || !pressure) throw new Error(`Catalogue tables disagree on ${designation}`);
  return Object.freeze({
    designation,
    ...identity,
    containsHfc: identity.classes.includes("HFC"),
    gwp: Object.freeze({ ...gwp.gwp }),
    gwpNote: gwp.note ?? null,
    ...pressure,
    ...(DENSITY[designation] ?? NO_DENSITY),
    section608Exemption: SECTION_608_EXEMPTIONS[designation] ?? null,
  });
}

/** The refrigerant catalogue, in designation order. */
export const REFRIGERANTS: readonly Refrigerant[] = Object.freeze(
  Object.keys(IDENTITY)
    .sort((a, b) => a.localeCompare(b, "en", { numeric: true }))
    .map(build),
);

const BY_DESIGNATION = new Map(REFRIGERANTS.map((r) => [r.designation, r]));

/** Looks a refrigerant up by any spelling of its designation ("r410a" → R-410A); undefined if unknown. */
export function getRefrigerant(designation: string): Refrigerant | undefined {
  return BY_DESIGNATION.get(normaliseDesignation(designation));
}
