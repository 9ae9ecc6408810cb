import { describe, expect, it } from "vitest";
import {
  celsiusToFahrenheit,
  convertPressure,
  evacuationReadingToPsia,
  fahrenheitToCelsius,
  formatMass,
  GRAMS_PER_LB,
  gramsToKg,
  gramsToLb,
  gramsToLbOz,
  psigToPsia,
  toAbsoluteInHg,
  toGrams,
} from "@coldtrail/core";

describe("mass units", () => {
  it("uses the exact international pound", () => {
    expect(GRAMS_PER_LB).toBe(453.59237); // Source: international avoirdupois pound, 0.45359237 kg exactly (1959 definition)
    expect(toGrams(1, "oz")).toBe(28); // Source: 1 oz = 1/16 lb = 28.349523125 g, stored as whole grams
    expect(toGrams(1, "kg")).toBe(1000);
  });

  it("stores 50 lb as 22,680 g, i.e. 22.68 kg", () => {
    expect(toGrams(50, "lb")).toBe(22680); // Source: REFERENCE.md §7.1 EU9 (50 lb = 22.68 kg), COMPUTED
    expect(gramsToKg(toGrams(50, "lb"))).toBeCloseTo(22.68, 2); // Source: REFERENCE.md §7.1 EU9
  });

  it("formats in the branch's unit", () => {
    expect(formatMass(toGrams(12.4, "lb"), "lb_oz")).toBe("12.40 lb"); // product format
    expect(formatMass(toGrams(12.4, "lb"), "lb_oz", { style: "lb_oz" })).toBe("12 lb 6.4 oz"); // 0.4 lb = 6.4 oz, COMPUTED
    expect(formatMass(5625, "kg")).toBe("5.625 kg");
    expect(gramsToLbOz(toGrams(15.99, "oz"))).toEqual({ lb: 1, oz: 0 }); // 15.99 oz shows as 1 lb 0.0 oz after rounding to 0.1 oz
    expect(gramsToLb(toGrams(-3.2, "lb"))).toBeCloseTo(-3.2, 2);
  });
});

describe("pressure units on the CFR 29.9 in Hg basis (REFERENCE.md §2.3)", () => {
  // Source: REFERENCE.md §2.3 (COMPUTED with 1 in Hg = 0.49115 psi = 3.38639 kPa on the 29.9 in Hg basis of 40 CFR 82.156 Table 1)
  const rows: [number, number, number, number][] = [
    // in Hg vacuum, in Hg abs, psia, kPa
    [0, 29.9, 14.69, 101.25],
    [4, 25.9, 12.72, 87.7],
    [10, 19.9, 9.77, 67.4],
    [15, 14.9, 7.32, 50.5],
  ];
  for (const [vac, inHg, psia, kpa] of rows) {
    it(`${vac} in Hg vacuum = ${inHg} in Hg abs = ${psia} psia = ${kpa} kPa`, () => {
      expect(toAbsoluteInHg(vac, "in_hg_vacuum")).toBeCloseTo(inHg, 3); // Source: REFERENCE.md §2.3
      expect(convertPressure(vac, "in_hg_vacuum", "psia")).toBeCloseTo(psia, 2); // Source: REFERENCE.md §2.3
      expect(Math.abs(convertPressure(vac, "in_hg_vacuum", "kpa_abs") - kpa)).toBeLessThan(0.06); // Source: REFERENCE.md §2.3 (given to 0.1 kPa)
    });
  }

  it("25 mm Hg absolute = 0.984 in Hg = 0.483 psia = 3.33 kPa ≈ 28.9 in Hg vacuum", () => {
    expect(toAbsoluteInHg(25, "mm_hg_abs")).toBeCloseTo(0.984, 3); // Source: REFERENCE.md §2.3
    expect(convertPressure(25, "mm_hg_abs", "psia")).toBeCloseTo(0.483, 3); // Source: REFERENCE.md §2.3
    expect(convertPressure(25, "mm_hg_abs", "kpa_abs")).toBeCloseTo(3.33, 2); // Source: REFERENCE.md §2.3
    expect(convertPressure(25, "mm_hg_abs", "in_hg_vacuum")).toBeCloseTo(28.9, 1); // Source: REFERENCE.md §2.3
  });

  it("microns are µm Hg absolute: 25,000 microns = 25 mm Hg", () => {
    expect(convertPressure(25_000, "microns", "mm_hg_abs")).toBeCloseTo(25, 9); // definition of the micron of mercury
  });

  it("evacuation readings in psig use the same 29.9 in Hg atmosphere, so 0 psig equals 0 in Hg vacuum", () => {
    expect(evacuationReadingToPsia(0, "psig")).toBeCloseTo(evacuationReadingToPsia(0, "in_hg_vacuum"), 9); // Source: 40 CFR 82.156 Table 1 basis (29.9 in Hg)
  });

  it("P-T tables use 14.696 psia for psig", () => {
    expect(psigToPsia(0)).toBe(14.696); // Source: REFERENCE.md §6.3 ("Gauge pressure uses 14.696 psia")
    expect(convertPressure(-1.8, "psig", "in_hg_vacuum", "standard")).toBeCloseTo(3.7, 1); // Source: REFERENCE.md §6.3 (R-134a −20 °F: −1.8 psig ≈ 3.7 in Hg vac)
  });
});

describe("temperature", () => {
  it("104 °F is 40 °C and 130 °F is about 54.4 °C", () => {
    expect(fahrenheitToCelsius(104)).toBeCloseTo(40, 9); // Source: REFERENCE.md §1.3 (104 °F (40 °C))
    expect(fahrenheitToCelsius(130)).toBeCloseTo(54.44, 2); // Source: REFERENCE.md §5.3 note (about 130 °F, 54–55 °C)
    expect(celsiusToFahrenheit(31.0)).toBeCloseTo(87.8, 1); // Source: REFERENCE.md §6.2 (R-744 critical 31.0 °C = 87.8 °F)
  });
});
