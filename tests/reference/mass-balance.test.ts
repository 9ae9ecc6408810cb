import { describe, expect, it } from "vitest";
import { massBalance } from "@coldtrail/core";

// Source: product check (not a regulation): purchased + recovered − charged − shipped for reclaim − change in stock = unaccounted
describe("mass balance", () => {
  const tol = { percent: 2, minimumG: 454 };
  it("balances when every gram is accounted for", () => {
    const r = massBalance(
      { purchasedG: 50_000, recoveredG: 20_000, chargedG: 40_000, shippedG: 18_000, openingStockG: 10_000, closingStockG: 22_000 },
      tol,
    );
    expect(r.stockChangeG).toBe(12_000);
    expect(r.unaccountedG).toBe(0);
    expect(r.withinTolerance).toBe(true);
  });
  it("flags a shortfall beyond the tolerance", () => {
    const r = massBalance(
      { purchasedG: 50_000, recoveredG: 20_000, chargedG: 40_000, shippedG: 10_000, openingStockG: 10_000, closingStockG: 22_000 },
      tol,
    );
    expect(r.unaccountedG).toBe(8_000);
    expect(r.toleranceG).toBe(1_400); // 2 % of 70,000 g taken in
    expect(r.withinTolerance).toBe(false);
  });
  it("uses the minimum tolerance on small volumes and treats a missing stock count as no change", () => {
    const r = massBalance({ purchasedG: 1_000, recoveredG: 0, chargedG: 700, shippedG: 0, openingStockG: null, closingStockG: null }, tol);
    expect(r.stockCounted).toBe(false);
    expect(r.unaccountedG).toBe(300);
    expect(r.toleranceG).toBe(454);
    expect(r.withinTolerance).toBe(true);
  });
});
