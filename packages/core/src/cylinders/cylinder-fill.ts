import { CoreInputError, UnknownRefrigerantError } from "../errors";
import { addYears, type IsoDate } from "../dates/local-date";
import { getRefrigerant } from "../refrigerants/catalogue";
import { normaliseDesignation } from "../refrigerants/normalise-designation";
import { GRAM_ROUNDING } from "../units/rounded-ratio";

/** AHRI Guideline K: fill to 80 % of the water capacity, corrected by specific gravity [S11]. */
export const GUIDELINE_K_FILL_FACTOR = 0.8;

export type FillBasis = "sg_77f" | "sg_130f" | "given" | "legacy_sg_1";

export interface MaxFillInput {
  waterCapacityG: number;
  tareG: number;
  refrigerant: string;
  /** Use the liquid SG at 130 °F instead of 77 °F (stricter; DOT forbids liquid-full at about 130 °F). */
  strict130F?: boolean;
  /** Overrides the catalogue's SG (e.g. a published figure for the case at hand). */
  specificGravity?: number;
}

export interface MaxFill {
  maxNetG: number;
  /** WC × 0.8 × SG before rounding down to the gram. */
  maxNetExactG: number;
  maxGrossG: number;
  specificGravity: number;
  basis: FillBasis;
}

/**
 * Maximum net and gross fill: net = WC × 0.8 × SG; gross = net + tare (AHRI Guideline K-2004 as
 * reported [S11]; REFERENCE.md §5.2). Grams are rounded down so the limit never exceeds the formula.
 * Without an SG in the catalogue the old label rule SG = 1 is used and said so (basis "legacy_sg_1").
 */
export function maxCylinderFill(input: MaxFillInput): MaxFill {
  if (!(input.waterCapacityG > 0)) throw new CoreInputError("The water capacity must be greater than zero", "waterCapacityG");
  if (input.tareG < 0) throw new CoreInputError("The tare weight cannot be negative", "tareG");
  let sg: number;
  let basis: FillBasis;
  if (input.specificGravity !== undefined) {
    sg = input.specificGravity;
    basis = "given";
  } else {
    const r = getRefrigerant(input.refrigerant);
    if (!r) throw new UnknownRefrigerantError(input.refrigerant);
    const catalogued = input.strict130F ? r.sg130F : r.sg77F;
    sg = catalogued ?? 1;
    basis = catalogued === null ? "legacy_sg_1" : input.strict130F ? "sg_130f" : "sg_77f";
  }
  if (!(sg > 0)) throw new CoreInputError("The specific gravity must be greater than zero", "specificGravity");
  const maxNetExactG = input.waterCapacityG * GUIDELINE_K_FILL_FACTOR * sg;
  const maxNetG = Math.floor(maxNetExactG + 1e-9);
  return { maxNetG, maxNetExactG, maxGrossG: maxNetG + input.tareG, specificGravity: sg, basis };
}

/**
 * Whether a net content is over the maximum fill for the amounts as entered. The contents and the
 * water capacity are both stored rounded to the gram, so a fill of exactly 80 % × WC × SG (38.08 lb in
 * a 47.6 lb WC cylinder) may come out a fraction of a gram above the formula; that is not over.
 */
export function exceedsMaxFill(netG: number, max: Pick<MaxFill, "maxNetExactG" | "specificGravity">): boolean {
  const tolerance = GRAM_ROUNDING * (1 + GUIDELINE_K_FILL_FACTOR * max.specificGravity);
  return netG - max.maxNetExactG > tolerance;
}

/** How full the cylinder is against its maximum net fill, in % (for a fill gauge; may exceed 100). */
export function fillPercent(netG: number, maxNetG: number): number {
  if (!(maxNetG > 0)) throw new CoreInputError("The maximum fill must be greater than zero", "maxNetG");
  return (netG / maxNetG) * 100;
}

/** Room left before the maximum gross weight (negative when overfilled). */
export function remainingCapacityG(grossG: number, maxGrossG: number): number {
  return maxGrossG - grossG;
}

/** Share of the cylinder volume the liquid fills at 130 °F: net / (WC × SG at 130 °F vs 60 °F water). */
export function liquidFillFractionAt130F(netG: number, waterCapacityG: number, sg130F: number): number {
  return netG / (waterCapacityG * sg130F);
}

/** 49 CFR 180.209 allows 5, 10 or 12 years; recovery cylinders are commonly retested every 5 (setting). */
export const DEFAULT_REQUALIFICATION_YEARS = 5;

/** Date the next requalification (hydrostatic retest) is due: last test + `years`. */
export function requalificationDueOn(lastRequalifiedOn: IsoDate, years: number = DEFAULT_REQUALIFICATION_YEARS): IsoDate {
  if (!(years > 0) || !Number.isInteger(years))
    throw new CoreInputError("The requalification period must be a whole number of years", "years");
  return addYears(lastRequalifiedOn, years);
}

/** One refrigerant per cylinder: may `incoming` go into a cylinder that holds `contents`? */
export function cylinderAcceptsRefrigerant(contents: { refrigerant: string | null; netG: number } | null, incoming: string): boolean {
  if (!contents || contents.refrigerant === null || contents.netG <= 0) return true;
  return normaliseDesignation(contents.refrigerant) === normaliseDesignation(incoming);
}

/** What adding refrigerant to a cylinder would make of it. */
export type CylinderFillVerdict =
  | { kind: "ok"; maxNetG: number; liquidFullG: number }
  | { kind: "over_safe_fill"; maxNetG: number; liquidFullG: number }
  | { kind: "impossible"; maxNetG: number; liquidFullG: number };

/**
 * Checks contents against the cylinder. Above the safe fill (80 % of WC × SG, AHRI Guideline K) is
 * possible but dangerous: it needs an explicit confirmation. Above WC × SG at 77 °F the liquid alone
 * would fill the whole cylinder, which no real cylinder holds, so such a record is refused as a
 * typing or unit error. The bound is the water capacity times the liquid's specific gravity, not the
 * water capacity alone: a dense refrigerant (R-134a, SG about 1.2) weighs more than the same volume
 * of water, a light one (R-290, SG about 0.5) much less. Without a catalogued SG the label rule
 * SG = 1 is used (the bound is then the water capacity).
 */
export function checkCylinderFill(input: {
  contentsG: number;
  waterCapacityG: number;
  tareG: number;
  refrigerant: string;
  strict130F?: boolean;
}): CylinderFillVerdict {
  let max: MaxFill;
  try {
    max = maxCylinderFill({
      waterCapacityG: input.waterCapacityG,
      tareG: input.tareG,
      refrigerant: input.refrigerant,
      strict130F: input.strict130F,
    });
  } catch (err) {
    if (!(err instanceof UnknownRefrigerantError)) throw err;
    max = maxCylinderFill({ waterCapacityG: input.waterCapacityG, tareG: input.tareG, refrigerant: input.refrigerant, specificGravity: 1 });
  }
  const sg77 = getRefrigerant(input.refrigerant)?.sg77F ?? 1;
  const liquidFullG = Math.floor(input.waterCapacityG * sg77);
  const out = { maxNetG: max.maxNetG, liquidFullG };
  if (input.contentsG > liquidFullG) return { kind: "impossible", ...out };
  if (input.contentsG > max.maxNetG) return { kind: "over_safe_fill", ...out };
  return { kind: "ok", ...out };
}
