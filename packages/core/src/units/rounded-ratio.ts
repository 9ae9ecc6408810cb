/**
 * Masses are stored as whole grams, so each stored amount may differ from the amount entered by up
 * to half a gram (20 lb is 9,071.8474 g, stored as 9,072 g). A share computed from stored grams can
 * therefore land a hair above or below a threshold that the entered amounts meet exactly: 20 lb on a
 * 100 lb appliance is 20.0004 % from grams. Comparisons against regulatory thresholds use the range
 * of shares the entered amounts could have had and call the share equal to the threshold when the
 * threshold lies inside that range.
 */
export const GRAM_ROUNDING = 0.5;

export interface RoundedRatioOptions {
  /** Multiplier applied to numerator / denominator (100 for a percentage). */
  scale?: number;
  /** How many rounded amounts were summed into the numerator (each carries ±0.5 g). */
  numeratorTerms?: number;
  /** How many rounded amounts were summed into the denominator. */
  denominatorTerms?: number;
}

/** Smallest and largest value numerator / denominator × scale can take for the amounts entered. */
export function roundedRatioRange(numeratorG: number, denominatorG: number, opts: RoundedRatioOptions = {}): { low: number; high: number } {
  const scale = opts.scale ?? 100;
  const n = (opts.numeratorTerms ?? 1) * GRAM_ROUNDING;
  const d = (opts.denominatorTerms ?? 1) * GRAM_ROUNDING;
  const low = (Math.max(0, numeratorG - n) / (denominatorG + d)) * scale;
  const high = denominatorG - d > 0 ? ((numeratorG + n) / (denominatorG - d)) * scale : Number.POSITIVE_INFINITY;
  return { low, high };
}

/**
 * -1 when numerator / denominator × scale is below `threshold` for any amounts that round to the
 * stored grams, 1 when it is above for all of them, 0 when the entered amounts may meet it exactly.
 */
export function compareRoundedRatio(
  numeratorG: number,
  denominatorG: number,
  threshold: number,
  opts: RoundedRatioOptions = {},
): -1 | 0 | 1 {
  const { low, high } = roundedRatioRange(numeratorG, denominatorG, opts);
  if (low > threshold) return 1;
  if (high < threshold) return -1;
  return 0;
}
