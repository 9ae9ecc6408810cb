import { describe, expect, it } from "vitest";
import {
  annualizingLeakRate,
  chronicLeakTest,
  exceedsLeakThreshold,
  leakRateHistory,
  leakRateThreshold,
  leakRepairRegime,
  toGrams,
} from "@coldtrail/core";

describe("worked leak-rate examples (REFERENCE.md §3.6)", () => {
  it("E1: commercial, 100 lb, 10 lb after 180 days → 20.2778 %, over 20 %", () => {
    const lr = annualizingLeakRate(10, 100, 180);
    expect(lr).toBeCloseTo(20.2778, 4); // Source: costcalculator.calculator.city/?p=50530 [S34] (page truncates to 20.27 %); COMPUTED exact
    expect(exceedsLeakThreshold(lr, leakRateThreshold("commercial_refrigeration", "2026-02-01"))).toBe(true); // Source: 82.157(c)(2) 20 % [S3]
  });
  it("E2: comfort cooling, 50 lb, 2 lb after 30 days → 48.667 %", () => {
    expect(annualizingLeakRate(2, 50, 30)).toBeCloseTo(48.667, 3); // Source: REFERENCE.md §3.6 E2, COMPUTED
    expect(exceedsLeakThreshold(48.667, leakRateThreshold("comfort_cooling", "2026-02-01"))).toBe(true); // Source: 82.157(c)(2) 10 % [S3]
  });
  it("E3: IPR, 1,000 lb, 40 lb after 400 days → 4.000 % (days capped at 365; uncapped would be 3.65 %)", () => {
    expect(annualizingLeakRate(40, 1000, 400)).toBeCloseTo(4.0, 6); // Source: REFERENCE.md §3.6 E3, COMPUTED; cap from 82.152 (from memory)
    expect(annualizingLeakRate(40, 1000, 400)).not.toBeCloseTo(3.65, 2); // negative test: the cap is applied
    expect(exceedsLeakThreshold(4, leakRateThreshold("industrial_process", "2026-02-01"))).toBe(false); // Source: 82.157(c)(2) 30 % [S3]
  });
  it("E4: commercial, 500 lb, 25 lb after 45 days → 40.556 %", () => {
    expect(annualizingLeakRate(25, 500, 45)).toBeCloseTo(40.556, 3); // Source: REFERENCE.md §3.6 E4, COMPUTED
  });
  it("E5: AIM comfort cooling, 20 lb, 1 lb after 200 days → 9.125 %, below 10 %", () => {
    expect(annualizingLeakRate(1, 20, 200)).toBeCloseTo(9.125, 6); // Source: REFERENCE.md §3.6 E5, COMPUTED
    expect(exceedsLeakThreshold(9.125, leakRateThreshold("comfort_cooling", "2026-06-01"))).toBe(false); // Source: 84.106 10 % [S9]
  });
  it("E6: AIM comfort cooling at exactly 15 lb is covered; 0.5 lb after 365 days → 3.333 %", () => {
    expect(annualizingLeakRate(0.5, 15, 365)).toBeCloseTo(3.333, 3); // Source: REFERENCE.md §3.6 E6, COMPUTED
    expect(leakRepairRegime({ refrigerant: "R-410A", fullChargeG: toGrams(15, "lb"), category: "chiller", on: "2026-06-01" }).regime).toBe(
      "us_aim_hfc",
    ); // Source: 84.106 "≥ 15 lb" [S9]
    expect(
      leakRepairRegime({ refrigerant: "R-410A", fullChargeG: toGrams(14.9, "lb"), category: "chiller", on: "2026-06-01" }).regime,
    ).toBeNull(); // Source: 84.106 [S9]
  });

  const e7 = [
    { on: "2026-01-05", amountG: toGrams(30, "lb") },
    { on: "2026-05-05", amountG: toGrams(25, "lb") }, // day 120
    { on: "2026-09-12", amountG: toGrams(20, "lb") }, // day 250
    { on: "2026-12-01", amountG: toGrams(40, "lb") }, // day 330
  ];
  it("E7: rolling average over four additions → 6 %, 11 %, 15 %, 23 %", () => {
    const events = leakRateHistory({ fullChargeG: toGrams(500, "lb"), additions: e7, method: "rolling_average" });
    expect(events.map((e) => e.daysSinceLastAddition)).toEqual([null, 120, 130, 80]);
    const rates = events.map((e) => e.percent as number);
    [6, 11, 15, 23].forEach((v, i) => expect(rates[i]).toBeCloseTo(v, 2)); // Source: REFERENCE.md §3.6 E7, COMPUTED
    expect(rates.map((r) => exceedsLeakThreshold(r, 20))).toEqual([false, false, false, true]); // Source: REFERENCE.md §3.6 E7 verdict
  });
  it("E7b: the same additions by the annualizing method → 15.208 %, 11.231 %, 36.5 %", () => {
    const events = leakRateHistory({ fullChargeG: toGrams(500, "lb"), additions: e7, method: "annualizing" });
    const rates = events.map((e) => e.percent as number);
    expect(rates[1]).toBeCloseTo(15.208, 2); // Source: REFERENCE.md §3.6 E7b, COMPUTED
    expect(rates[2]).toBeCloseTo(11.231, 2); // Source: REFERENCE.md §3.6 E7b
    expect(rates[3]).toBeCloseTo(36.5, 2); // Source: REFERENCE.md §3.6 E7b
    expect(rates.slice(1).map((r) => exceedsLeakThreshold(r, 20))).toEqual([false, false, true]); // exceeds at the 4th addition
  });
  it("E8: a 600-lb appliance is a chronic leaker from 750 lb added in a calendar year", () => {
    const add = (lb: number) => [
      { on: "2026-03-01", amountG: toGrams(lb / 2, "lb") },
      { on: "2026-09-01", amountG: toGrams(lb / 2, "lb") },
    ];
    expect(chronicLeakTest(toGrams(600, "lb"), add(750), 2026).chronic).toBe(true); // Source: EPA fact sheet [S4] (125 %); REFERENCE.md §3.6 E8
    expect(chronicLeakTest(toGrams(600, "lb"), add(748), 2026).chronic).toBe(false); // Source: REFERENCE.md §3.6 E8
    expect(chronicLeakTest(toGrams(600, "lb"), add(750), 2026).reportDueOn).toBe("2027-03-01"); // Source: REFERENCE.md §3.3 (1 March of the next year; M-H)
  });
});

describe("thresholds (REFERENCE.md §3.2)", () => {
  it("since 2019: 20 % commercial, 30 % IPR, 10 % comfort cooling and other", () => {
    expect(leakRateThreshold("commercial_refrigeration", "2019-01-01")).toBe(20); // Source: 82.157(c)(2) [S3]
    expect(leakRateThreshold("industrial_process", "2024-05-01")).toBe(30); // Source: 82.157(c)(2) [S3]
    expect(leakRateThreshold("comfort_cooling", "2024-05-01")).toBe(10); // Source: 82.157(c)(2) [S3]
    expect(leakRateThreshold("other", "2024-05-01")).toBe(10); // Source: 82.157(c)(2) [S3]
  });
  it("before 2019: 35 %, 35 %, 15 %", () => {
    expect(leakRateThreshold("commercial_refrigeration", "2018-12-31")).toBe(35); // Source: old 82.156(i), EPA legacy page [S5]
    expect(leakRateThreshold("industrial_process", "2018-12-31")).toBe(35); // Source: [S5]
    expect(leakRateThreshold("comfort_cooling", "2018-12-31")).toBe(15); // Source: [S5]
  });
  it("negative test: commercial refrigeration after 2019 is not 35 %", () => {
    expect(leakRateThreshold("commercial_refrigeration", "2026-01-01")).not.toBe(35); // REFERENCE.md §0 warning (wrong web value)
  });
  it("exactly at the threshold does not exceed it", () => {
    expect(exceedsLeakThreshold(20, 20)).toBe(false); // Source: 82.157 "over the applicable leak rate" [S3]; boundary is an inference
    expect(exceedsLeakThreshold(20.0001, 20)).toBe(true);
  });
});

describe("edge cases (REFERENCE.md §3.6)", () => {
  it("sums several additions on one visit instead of dividing by 0 days", () => {
    const ev = leakRateHistory({
      fullChargeG: 100_000,
      method: "annualizing",
      additions: [
        { on: "2026-01-10", amountG: 1000 },
        { on: "2026-03-11", amountG: 2000 },
        { on: "2026-03-11", amountG: 3000 },
      ],
    });
    expect(ev).toHaveLength(2);
    expect(ev[1]!.addedG).toBe(5000);
    expect(ev[1]!.percent).toBeCloseTo(annualizingLeakRate(5000, 100_000, 60), 9); // Source: REFERENCE.md §3.1 (AIM: additions in one visit are summed)
  });
  it("rejects a missing or zero full charge", () => {
    expect(() => annualizingLeakRate(1, 0, 30)).toThrow(); // Source: REFERENCE.md §3.6 edge cases
    expect(() => leakRateHistory({ fullChargeG: 0, method: "annualizing", additions: [] })).toThrow();
  });
  it("excludes additions after a retrofit, at installation and for seasonal variance", () => {
    const ev = leakRateHistory({
      fullChargeG: 100_000,
      method: "rolling_average",
      additions: [
        { on: "2026-01-10", amountG: 90_000, excluded: "installation" },
        { on: "2026-02-10", amountG: 5000, excluded: "seasonal_variance" },
        { on: "2026-03-10", amountG: 4000, excluded: "retrofit" },
        { on: "2026-04-10", amountG: 2000 },
      ],
    });
    expect(ev.map((e) => e.percent)).toEqual([null, null, null, 2]); // Source: REFERENCE.md §3.1 (three exceptions) [S3] [S4]
  });
  it("AIM counts only additions from 2026-01-01 and uses 365 days for the first one", () => {
    const ev = leakRateHistory({
      fullChargeG: 10_000,
      method: "annualizing",
      countFrom: "2026-01-01",
      additions: [
        { on: "2025-12-20", amountG: 500 },
        { on: "2026-02-01", amountG: 500 },
      ],
    });
    expect(ev).toHaveLength(1);
    expect(ev[0]!.percent).toBeCloseTo(5, 9); // from memory (REFERENCE.md §3.1 AIM specifics, M/L): 365 days for the first calculation
  });
  it("the rolling window restarts after a passed follow-up verification test", () => {
    const ev = leakRateHistory({
      fullChargeG: 100_000,
      method: "rolling_average",
      followUpVerificationsPassedOn: ["2026-03-01"],
      additions: [
        { on: "2026-01-10", amountG: 8000 },
        { on: "2026-04-10", amountG: 3000 },
      ],
    });
    expect(ev[1]!.percent).toBe(3); // Source: REFERENCE.md §3.1 rolling average ("since the last successful follow-up verification test"), from memory
  });
});
