import { describe, expect, it } from "vitest";
import {
  cylinderAcceptsRefrigerant,
  fillPercent,
  getRefrigerant,
  gramsToLb,
  liquidFillFractionAt130F,
  maxCylinderFill,
  remainingCapacityG,
  requalificationDueOn,
  toGrams,
} from "@coldtrail/core";

const lb = toGrams;
const wc47 = lb(47.6, "lb");
const tare27 = lb(27.5, "lb");

describe("maximum fill, AHRI Guideline K (REFERENCE.md §5.2–5.3)", () => {
  it("C1: WC 1,000 lb, R-22 SG 1.197, tare 380 lb → net 957.6 lb, gross 1,337.6 lb", () => {
    const f = maxCylinderFill({ waterCapacityG: lb(1000, "lb"), tareG: lb(380, "lb"), refrigerant: "R-22", specificGravity: 1.197 });
    expect(gramsToLb(f.maxNetG)).toBeCloseTo(957.6, 1); // Source: AHRI Guideline K example, ACHR News [S11]
    expect(gramsToLb(f.maxGrossG)).toBeCloseTo(1337.6, 1); // Source: AHRI Guideline K example [S11]
    const fromCatalogue = maxCylinderFill({ waterCapacityG: lb(1000, "lb"), tareG: lb(380, "lb"), refrigerant: "R-22" });
    expect(fromCatalogue.maxNetG).toBe(f.maxNetG); // catalogue carries the Guideline K SG for R-22
  });
  it("C2: WC 47.6 lb, tare 27.5 lb, SG 1 → 38.08 lb net, 65.58 lb gross, 17.98 lb left at 47.6 lb on the scale", () => {
    const f = maxCylinderFill({ waterCapacityG: wc47, tareG: tare27, refrigerant: "R-22", specificGravity: 1 });
    expect(gramsToLb(f.maxNetG)).toBeCloseTo(38.08, 2); // Source: acservicetech.com "Recovery Bottle Weight" [S12] (rounds to 38.1)
    expect(gramsToLb(f.maxGrossG)).toBeCloseTo(65.58, 2); // Source: [S12] (65.6)
    expect(gramsToLb(remainingCapacityG(wc47, f.maxGrossG))).toBeCloseTo(17.98, 2); // Source: [S12] (18)
  });
  it("C3: same cylinder, R-410A SG 1.062 → 40.44 / 67.94 lb, about 97.5 % liquid-full at 130 °F", () => {
    const f = maxCylinderFill({ waterCapacityG: wc47, tareG: tare27, refrigerant: "R-410A" });
    expect(gramsToLb(f.maxNetG)).toBeCloseTo(40.44, 2); // Source: REFERENCE.md §5.3 C3, COMPUTED
    expect(gramsToLb(f.maxGrossG)).toBeCloseTo(67.94, 2); // Source: REFERENCE.md §5.3 C3
    expect(liquidFillFractionAt130F(f.maxNetG, wc47, getRefrigerant("R-410A")!.sg130F!)).toBeCloseTo(0.975, 3); // Source: REFERENCE.md §5.3 C3 (97.5 %)
  });
  it("C4: same cylinder, R-22 SG 1.194 → 45.47 / 72.97 lb, about 90 % at 130 °F", () => {
    const f = maxCylinderFill({ waterCapacityG: wc47, tareG: tare27, refrigerant: "R-22", specificGravity: 1.194 });
    expect(gramsToLb(f.maxNetG)).toBeCloseTo(45.47, 2); // Source: REFERENCE.md §5.3 C4, COMPUTED
    expect(gramsToLb(f.maxGrossG)).toBeCloseTo(72.97, 2); // Source: REFERENCE.md §5.3 C4
    expect(liquidFillFractionAt130F(f.maxNetG, wc47, 1.061)).toBeCloseTo(0.9, 2); // Source: REFERENCE.md §5.3 C4 ("about 90 %")
  });
  it("C5: same cylinder, R-32 SG 0.964 → 36.71 / 64.21 lb, about 95 % at 130 °F", () => {
    const f = maxCylinderFill({ waterCapacityG: wc47, tareG: tare27, refrigerant: "R-32" });
    expect(gramsToLb(f.maxNetG)).toBeCloseTo(36.71, 2); // Source: REFERENCE.md §5.3 C5, COMPUTED
    expect(gramsToLb(f.maxGrossG)).toBeCloseTo(64.21, 2); // Source: REFERENCE.md §5.3 C5
    expect(Math.abs(liquidFillFractionAt130F(f.maxNetG, wc47, getRefrigerant("R-32")!.sg130F!) - 0.95)).toBeLessThan(0.01); // Source: REFERENCE.md §5.3 C5 ("about 95 %")
  });
  it("C6: the stricter 130 °F option stays above the published 50-lb-tank guidance, the 77 °F rule does not for R-410A", () => {
    const strict410 = maxCylinderFill({ waterCapacityG: wc47, tareG: tare27, refrigerant: "R-410A", strict130F: true });
    const strict22 = maxCylinderFill({ waterCapacityG: wc47, tareG: tare27, refrigerant: "R-22", strict130F: true });
    expect(strict410.basis).toBe("sg_130f");
    // Source: hvacrschool.com [S13]: 50-lb tank ≤ 32 lb R-410A / 39 lb R-22 (WC 47.6 lb taken from C2 [S12])
    expect(gramsToLb(strict410.maxNetG)).toBeGreaterThanOrEqual(32);
    expect(gramsToLb(strict410.maxNetG)).toBeLessThan(34);
    expect(gramsToLb(strict22.maxNetG)).toBeGreaterThanOrEqual(39);
    expect(gramsToLb(strict22.maxNetG)).toBeLessThan(41);
    expect(gramsToLb(maxCylinderFill({ waterCapacityG: wc47, tareG: tare27, refrigerant: "R-410A" }).maxNetG)).toBeGreaterThan(40); // the 77 °F rule allows 40.44 lb
  });
  it("the 130 °F densities match the published values", () => {
    const water60 = 62.366; // lb/ft³, 999.01 kg/m³ (Kell), Source: REFERENCE.md §6.4
    expect(Math.abs(getRefrigerant("R-22")!.sg130F! * water60 - 66.17) / 66.17).toBeLessThan(0.005); // Source: hvacrschool [S13] 66.17 lb/ft³
    expect(Math.abs(getRefrigerant("R-410A")!.sg130F! * water60 - 54.7) / 54.7).toBeLessThan(0.01); // Source: hvacrschool [S13] 54.70 (computed 54.34)
  });
  it("falls back to SG 1 (the old label rule) when no density is catalogued, and says so", () => {
    expect(maxCylinderFill({ waterCapacityG: wc47, tareG: tare27, refrigerant: "R-454B" }).basis).toBe("legacy_sg_1"); // Source: REFERENCE.md §5.2 (0.8 × WC + TW)
  });
  it("gives the fill percentage for a gauge", () => {
    expect(fillPercent(15_000, 20_000)).toBe(75);
  });
});

describe("requalification and contents", () => {
  it("is due 5 years after the last test by default, configurable", () => {
    expect(requalificationDueOn("2021-06-15")).toBe("2026-06-15"); // from memory: 5 years common marking (REFERENCE.md §5.1, M-H)
    expect(requalificationDueOn("2021-06-15", 12)).toBe("2033-06-15"); // Source: 49 CFR 180.209 ("5, 10 or 12 years") [S14]
    expect(requalificationDueOn("2020-02-29", 5)).toBe("2025-02-28");
  });
  it("holds one refrigerant per cylinder", () => {
    expect(cylinderAcceptsRefrigerant({ refrigerant: "R-410A", netG: 5000 }, "r410a")).toBe(true); // common practice
    expect(cylinderAcceptsRefrigerant({ refrigerant: "R-410A", netG: 5000 }, "R-22")).toBe(false); // common practice
    expect(cylinderAcceptsRefrigerant({ refrigerant: "R-410A", netG: 0 }, "R-22")).toBe(true);
  });
});
