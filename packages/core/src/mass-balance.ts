export interface MassBalanceInput {
  purchasedG: number;
  recoveredG: number;
  chargedG: number;
  shippedG: number;
  /** Stock at the start and end of the period; null = no count (change taken as zero). */
  openingStockG: number | null;
  closingStockG: number | null;
}

export interface MassBalanceTolerance {
  percent: number;
  minimumG: number;
}

export interface MassBalanceResult {
  stockChangeG: number;
  /** purchased + recovered − charged − shipped − change in stock; positive = refrigerant missing. */
  unaccountedG: number;
  toleranceG: number;
  withinTolerance: boolean;
  stockCounted: boolean;
}

/**
 * Refrigerant mass balance for one branch and refrigerant over a period (a product check, not a regulation).
 * Tolerance: the larger of `minimumG` and `percent` of the amount taken in (purchased + recovered).
 */
export function massBalance(input: MassBalanceInput, tolerance: MassBalanceTolerance): MassBalanceResult {
  const stockCounted = input.openingStockG !== null && input.closingStockG !== null;
  const stockChangeG = stockCounted ? (input.closingStockG as number) - (input.openingStockG as number) : 0;
  const unaccountedG = input.purchasedG + input.recoveredG - input.chargedG - input.shippedG - stockChangeG;
  const toleranceG = Math.max(tolerance.minimumG, ((input.purchasedG + input.recoveredG) * tolerance.percent) / 100);
  return { stockChangeG, unaccountedG, toleranceG, withinTolerance: Math.abs(unaccountedG) <= toleranceG, stockCounted };
}
