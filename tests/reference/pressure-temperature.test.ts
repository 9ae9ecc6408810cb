import { describe, expect, it } from "vitest";
import { celsiusToFahrenheit, checkCylinderPressure, psiaToKpa, psigToPsia, PT_TABLES_C, saturationPressurePsig } from "@coldtrail/core";

// Source: REFERENCE.md §6.3 (COMPUTED from the equations of state; matches calcspec.com "NIST REFPROP" [S18]); tolerance ±0.5 psi
const rows: [number, number, number, number, number][] = [
  // °F, R-22, R-134a, R-410A bubble, R-410A dew
  [-20, 10.2, -1.8, 26.3, 26.2],
  [0, 24.0, 6.5, 48.4, 48.2],
  [20, 43.1, 18.4, 78.7, 78.4],
  [32, 57.5, 27.8, 101.4, 101.1],
  [40, 68.6, 35.0, 118.8, 118.4],
  [50, 84.1, 45.4, 143.1, 142.6],
  [60, 101.6, 57.4, 170.7, 170.1],
  [70, 121.4, 71.1, 201.7, 201.1],
  [77, 136.7, 81.8, 225.7, 224.9],
  [80, 143.6, 86.7, 236.5, 235.7],
  [90, 168.4, 104.3, 275.3, 274.5],
  [100, 195.9, 124.2, 318.5, 317.6],
  [104, 207.7, 132.7, 337.1, 336.1],
  [110, 226.4, 146.4, 366.5, 365.4],
  [120, 260.0, 171.2, 419.5, 418.3],
  [130, 296.9, 198.7, 478.0, 476.8],
];

describe("P-T rows within ±0.5 psi (REFERENCE.md §6.3)", () => {
  it.each(rows)("%s °F", (f, r22, r134a, bubble, dew) => {
    expect(Math.abs(saturationPressurePsig("R-22", f)! - r22)).toBeLessThanOrEqual(0.5); // Source: REFERENCE.md §6.3
    expect(Math.abs(saturationPressurePsig("R-134a", f)! - r134a)).toBeLessThanOrEqual(0.5); // Source: REFERENCE.md §6.3
    expect(Math.abs(saturationPressurePsig("R-410A", f, "bubble")! - bubble)).toBeLessThanOrEqual(0.5); // Source: REFERENCE.md §6.3
    expect(Math.abs(saturationPressurePsig("R-410A", f, "dew")! - dew)).toBeLessThanOrEqual(0.5); // Source: REFERENCE.md §6.3
  });

  it("interpolation between °F rows reproduces the °C / kPa table within ±0.5 %", () => {
    for (const [designation, table] of Object.entries(PT_TABLES_C)) {
      for (const row of table) {
        const kpa = psiaToKpa(psigToPsia(saturationPressurePsig(designation, celsiusToFahrenheit(row.tempC), "bubble")!));
        expect(Math.abs(kpa - row.bubbleKpaAbs) / row.bubbleKpaAbs).toBeLessThan(0.005); // Source: REFERENCE.md §6.3 SI table ("±0.5 %")
      }
    }
  });

  it("negative tests: known wrong web values are not reproduced", () => {
    expect(Math.abs(saturationPressurePsig("R-410A", 70)! - 225.7)).toBeGreaterThan(20); // REFERENCE.md §0: a web chart shifted R-410A by 7 °F (225.7 is the 77 °F value)
    expect(saturationPressurePsig("R-134a", -20)!).toBeCloseTo(-1.8, 1); // REFERENCE.md §6.3: the chart's "−2.9 vac" below atmosphere is wrong
  });

  it("does not extrapolate outside the shipped table and has no table for R-32", () => {
    expect(() => saturationPressurePsig("R-22", 140)).toThrow();
    expect(saturationPressurePsig("R-32", 70)).toBeNull();
  });
});

describe("non-condensables check (REFERENCE.md §6.3)", () => {
  it("R-410A at 70 °F reading 215 psig is 13.3 psi high → non-condensables suspected", () => {
    const r = checkCylinderPressure({ refrigerant: "R-410A", temperatureF: 70, pressurePsig: 215, tolerancePsi: 5 });
    expect(r.status).toBe("non_condensables_suspected"); // Source: REFERENCE.md §6.3 example (rule of thumb from EPA 608 training, from memory)
    expect(r.differencePsi).toBeCloseTo(13.3, 1); // Source: REFERENCE.md §6.3 (+13.3 psi against 201.7, the bubble column)
  });
  it("R-22 at 80 °F reading 145 psig is within tolerance", () => {
    const r = checkCylinderPressure({ refrigerant: "R-22", temperatureF: 80, pressurePsig: 145, tolerancePsi: 5 });
    expect(r.status).toBe("consistent"); // Source: REFERENCE.md §6.3 example (143.6 psig)
    expect(r.differencePsi).toBeCloseTo(1.4, 1);
  });
  it("the tolerance is a setting", () => {
    expect(checkCylinderPressure({ refrigerant: "R-22", temperatureF: 80, pressurePsig: 145, tolerancePsi: 1 }).status).toBe(
      "non_condensables_suspected",
    ); // product choice (REFERENCE.md §6.3: no regulation sets it)
  });
  it("says when it cannot judge", () => {
    expect(checkCylinderPressure({ refrigerant: "R-32", temperatureF: 70, pressurePsig: 200, tolerancePsi: 5 }).status).toBe("no_data");
    expect(checkCylinderPressure({ refrigerant: "R-22", temperatureF: 150, pressurePsig: 200, tolerancePsi: 5 }).status).toBe("no_data");
  });
});
