import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatMass, gramsToKg, gramsToLb, gramsToLbOz, gramsToOz, roundTo, toGrams } from "../src/rules-core";

describe("mass round trips through integer grams at display precision", () => {
  it("lb with 2 decimals", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000 }), (hundredths) => {
        const lb = hundredths / 100;
        expect(roundTo(gramsToLb(toGrams(lb, "lb")), 2)).toBe(lb);
        expect(formatMass(toGrams(lb, "lb"), "lb_oz")).toBe(`${lb.toFixed(2)} lb`);
      }),
    );
  });
  it("kg with 3 decimals", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000 }), (thousandths) => {
        const kg = thousandths / 1000;
        expect(roundTo(gramsToKg(toGrams(kg, "kg")), 3)).toBe(kg);
        expect(formatMass(toGrams(kg, "kg"), "kg")).toBe(`${kg.toFixed(3)} kg`);
      }),
    );
  });
  it("oz with 1 decimal, and lb + oz", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000 }), fc.integer({ min: 0, max: 159 }), (lb, tenthsOz) => {
        const oz = tenthsOz / 10;
        expect(roundTo(gramsToOz(toGrams(oz, "oz")), 1)).toBe(oz);
        const g = toGrams(lb, "lb") + toGrams(oz, "oz");
        expect(gramsToLbOz(g)).toEqual({ lb, oz });
      }),
    );
  });
});
