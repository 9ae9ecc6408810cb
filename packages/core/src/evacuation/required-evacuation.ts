import { CoreInputError } from "../errors";
import { toAbsoluteInHg } from "../units/pressure";
import { toGrams } from "../units/mass";
import { compareRoundedRatio } from "../units/rounded-ratio";
import type { EvacuationUnit, PressureClass } from "../vocabulary";

/** Recovery equipment made or imported on/after this date meets the post-1993 column. */
export const EVACUATION_EQUIPMENT_CUTOFF = "1993-11-15";
/** Table 1 splits charges at 200 lb: "≥ 200 lb" means ≥ 90,718 g (200 lb rounded to grams). */
export const LARGE_CHARGE_MIN_G = toGrams(200, "lb");

export type EquipmentEra = "before_1993_11_15" | "on_or_after_1993_11_15";

/** A level to reach: inches of Hg vacuum on the 29.9 in Hg basis, or mm Hg absolute. */
export interface EvacuationLevel {
  value: number;
  unit: Extract<EvacuationUnit, "in_hg_vacuum" | "mm_hg_abs">;
}

/**
 * 40 CFR 82.156 Table 1 — "Required Levels of Evacuation for Appliances (except small appliances,
 * MVACs and MVAC-like appliances)". Source: CFR text [S1] (REFERENCE.md §2.1). The medium-pressure
 * ≥ 200 lb cell for post-1993 equipment is 15 in Hg; EPA's 2017 web table shows 10, which is wrong
 * (REFERENCE.md §2.2).
 */
export const EVACUATION_TABLE_1: Readonly<
  Record<PressureClass, Readonly<Record<"under_200_lb" | "at_least_200_lb", Readonly<Record<EquipmentEra, EvacuationLevel>>>>>
> = {
  very_high: {
    under_200_lb: { before_1993_11_15: { value: 0, unit: "in_hg_vacuum" }, on_or_after_1993_11_15: { value: 0, unit: "in_hg_vacuum" } },
    at_least_200_lb: { before_1993_11_15: { value: 0, unit: "in_hg_vacuum" }, on_or_after_1993_11_15: { value: 0, unit: "in_hg_vacuum" } },
  },
  high: {
    under_200_lb: { before_1993_11_15: { value: 0, unit: "in_hg_vacuum" }, on_or_after_1993_11_15: { value: 0, unit: "in_hg_vacuum" } },
    at_least_200_lb: { before_1993_11_15: { value: 4, unit: "in_hg_vacuum" }, on_or_after_1993_11_15: { value: 10, unit: "in_hg_vacuum" } },
  },
  medium: {
    under_200_lb: { before_1993_11_15: { value: 4, unit: "in_hg_vacuum" }, on_or_after_1993_11_15: { value: 10, unit: "in_hg_vacuum" } },
    at_least_200_lb: { before_1993_11_15: { value: 4, unit: "in_hg_vacuum" }, on_or_after_1993_11_15: { value: 15, unit: "in_hg_vacuum" } },
  },
  low: {
    under_200_lb: { before_1993_11_15: { value: 25, unit: "mm_hg_abs" }, on_or_after_1993_11_15: { value: 25, unit: "mm_hg_abs" } },
    at_least_200_lb: { before_1993_11_15: { value: 25, unit: "mm_hg_abs" }, on_or_after_1993_11_15: { value: 25, unit: "mm_hg_abs" } },
  },
};

/**
 * 40 CFR 82.156(b) small appliances: a share of the charge, or 4 in Hg vacuum.
 * Source: REFERENCE.md §2.5 [S29] [S37].
 */
export const SMALL_APPLIANCE_RECOVERY = {
  before_1993_11_15: { operatingPercent: 80, notOperatingPercent: 80 },
  on_or_after_1993_11_15: { operatingPercent: 90, notOperatingPercent: 80 },
  alternativeVacuum: { value: 4, unit: "in_hg_vacuum" } as EvacuationLevel,
} as const;

/**
 * Era of the recovery equipment. An unknown manufacture date is treated as post-1993, which gives
 * the stricter requirement in every cell.
 */
export function equipmentEra(manufacturedOn: string | null | undefined): EquipmentEra {
  return manufacturedOn && manufacturedOn < EVACUATION_EQUIPMENT_CUTOFF ? "before_1993_11_15" : "on_or_after_1993_11_15";
}

export type EvacuationRequirement =
  | { kind: "table_1"; level: EvacuationLevel; absoluteInHg: number; citation: string; description: string }
  | {
      kind: "small_appliance";
      percentOfCharge: number;
      alternative: EvacuationLevel;
      absoluteInHg: number;
      citation: string;
      description: string;
    };

export interface RequiredEvacuationInput {
  pressureClass: PressureClass;
  fullChargeG: number | null;
  /** Manufacture/import date of the recovery equipment (ISO date); null = unknown. */
  equipmentManufacturedOn: string | null;
  smallAppliance: boolean;
  /** Small appliances only: was the appliance's compressor operating? Unknown → 90 % (stricter). */
  compressorOperating?: boolean | null;
}

function describe(level: EvacuationLevel): string {
  return level.unit === "mm_hg_abs" ? `${level.value} mm Hg absolute` : `${level.value} in Hg vacuum`;
}

/** Required evacuation level for an appliance and the recovery equipment used. */
export function requiredEvacuation(input: RequiredEvacuationInput): EvacuationRequirement {
  const era = equipmentEra(input.equipmentManufacturedOn);
  if (input.smallAppliance) {
    const row = SMALL_APPLIANCE_RECOVERY[era];
    const percent = input.compressorOperating === false ? row.notOperatingPercent : row.operatingPercent;
    const alt = SMALL_APPLIANCE_RECOVERY.alternativeVacuum;
    return {
      kind: "small_appliance",
      percentOfCharge: percent,
      alternative: alt,
      absoluteInHg: toAbsoluteInHg(alt.value, alt.unit),
      citation: "40 CFR 82.156(b)",
      description: `${percent} % of the charge recovered, or ${describe(alt)},`,
    };
  }
  if (input.fullChargeG !== null && input.fullChargeG < 0) throw new CoreInputError("Full charge cannot be negative", "fullChargeG");
  // An unknown charge takes the ≥ 200 lb row, which is never less strict than the < 200 lb row.
  const band = input.fullChargeG === null || input.fullChargeG >= LARGE_CHARGE_MIN_G ? "at_least_200_lb" : "under_200_lb";
  const level = EVACUATION_TABLE_1[input.pressureClass][band][era];
  return {
    kind: "table_1",
    level,
    absoluteInHg: toAbsoluteInHg(level.value, level.unit),
    citation: "40 CFR 82.156(a)(3) Table 1",
    description: describe(level),
  };
}

/** Comparison slack for converted readings: 0.001 in Hg (well below any gauge resolution). */
const EPSILON_IN_HG = 1e-3;

export interface EvacuationEvidence {
  /** The deepest level reached, in any evacuation unit (gauge units on the 29.9 in Hg basis). */
  reading?: { value: number; unit: EvacuationUnit } | null;
  /** Small appliances: amount recovered and the full charge, grams. */
  recoveredG?: number | null;
  fullChargeG?: number | null;
  /** How many recorded amounts were summed into `recoveredG` (each is rounded to the gram). */
  recoveredTerms?: number;
}

export interface EvacuationVerdict {
  satisfied: boolean;
  /** Absolute pressure reached (in Hg), if a reading was given. */
  reachedInHgAbs: number | null;
  /** Share of the charge recovered (%), small appliances with both amounts known. */
  recoveredPercent: number | null;
  reason: string;
}

/**
 * Whether the evidence meets the requirement. A reading satisfies it when its absolute pressure is
 * at or below the required absolute pressure (both on the CFR 29.9 in Hg basis).
 */
export function evacuationSatisfied(requirement: EvacuationRequirement, evidence: EvacuationEvidence): EvacuationVerdict {
  const reached = evidence.reading ? toAbsoluteInHg(evidence.reading.value, evidence.reading.unit) : null;
  const vacuumOk = reached !== null && reached <= requirement.absoluteInHg + EPSILON_IN_HG;
  if (requirement.kind === "table_1") {
    return {
      satisfied: vacuumOk,
      reachedInHgAbs: reached,
      recoveredPercent: null,
      reason:
        reached === null
          ? `No evacuation level recorded; ${requirement.description} is required`
          : vacuumOk
            ? `Reached ${requirement.description} or deeper`
            : `Reached ${(29.9 - reached).toFixed(1)} in Hg vacuum; ${requirement.description} is required`,
    };
  }
  const { recoveredG, fullChargeG } = evidence;
  const percent = recoveredG !== null && recoveredG !== undefined && fullChargeG ? (recoveredG / fullChargeG) * 100 : null;
  // "At least 90 %" for the amounts as entered: 0.45 lb of 0.5 lb is 90 % although 204 g of 227 g is 89.9 %.
  const shareOk =
    percent !== null &&
    compareRoundedRatio(recoveredG as number, fullChargeG as number, requirement.percentOfCharge, {
      numeratorTerms: Math.max(1, evidence.recoveredTerms ?? 1),
    }) >= 0;
  const satisfied = shareOk || vacuumOk;
  const got = percent === null ? "an unknown share" : `${percent.toFixed(1)} %`;
  return {
    satisfied,
    reachedInHgAbs: reached,
    recoveredPercent: percent,
    reason: satisfied
      ? shareOk
        ? `Recovered ${got} of the charge (at least ${requirement.percentOfCharge} % required)`
        : `Reached ${describe(requirement.alternative)} or deeper`
      : `Recovered ${got} of the charge; ${requirement.description} is required`,
  };
}
