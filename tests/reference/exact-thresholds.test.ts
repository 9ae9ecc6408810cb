import { describe, expect, it } from "vitest";
import {
  analyseLeaks,
  chronicLeakTest,
  compareRoundedRatio,
  evacuationSatisfied,
  exceedsMaxFill,
  leakRateHistory,
  maxCylinderFill,
  requiredEvacuation,
  resolveSettings,
  runAudit,
  toGrams,
  type Appliance,
  type Job,
} from "@coldtrail/core";
import { appliance, job } from "../../packages/core/test/fixtures/sample-branch";
import { emptyBranch, universalTech } from "../fixtures/rule-records";

// Masses are stored as whole grams; a share is judged for the amounts as entered, so an amount
// that meets a threshold exactly in pounds or kilograms is "at" it, not over or short of it.
const lb = (v: number) => toGrams(v, "lb");
const kg = (v: number) => toGrams(v, "kg");

/** One addition a year after installation, on an appliance under leak repair. */
function oneAddition(category: Appliance["category"], refrigerant: string, chargeG: number, addedG: number, addedOn = "2026-06-01") {
  const a = appliance({ id: 1, category, refrigerant, fullChargeG: chargeG, installedOn: "2025-06-01" });
  const jobs: Job[] = [
    job({
      id: 1,
      kind: "charge",
      performedOn: addedOn,
      refrigerant,
      movements: [{ direction: "charged", amountG: addedG, cylinderId: null }],
    }),
  ];
  const analysis = analyseLeaks(a, jobs, resolveSettings(), "America/Chicago")!;
  const records = { ...emptyBranch([universalTech]), appliances: [a], jobs };
  const findings = runAudit(records, { packs: ["us_federal"], period: { from: "2026-01-01", to: "2026-12-31" }, asOf: "2026-06-02" });
  return { event: analysis.events[0]!, findings };
}

describe("leak rate exactly at the threshold is not over it (40 CFR 82.157(c)(2), 84.106)", () => {
  it("20 lb added to a 100 lb commercial refrigeration appliance a year after installation is 20 %, not over", () => {
    // 20 lb = 9,072 g and 100 lb = 45,359 g, which by grams alone is 20.0004 %.
    const { event, findings } = oneAddition("commercial_refrigeration", "R-404A", lb(100), lb(20));
    expect(event.exceeds).toBe(false); // Source: 82.157(c)(2) 20 % commercial refrigeration [S3]; "over the applicable leak rate" (REFERENCE.md §3.2)
    expect(findings.filter((f) => f.ruleId.startsWith("CT-LEAK"))).toEqual([]);
    expect(oneAddition("commercial_refrigeration", "R-404A", lb(100), lb(20.1)).event.exceeds).toBe(true); // Source: 82.157(c)(2) [S3]
  });
  it("10 kg added to a 50 kg commercial refrigeration appliance is 20 %, not over; 10.01 kg is over", () => {
    expect(oneAddition("commercial_refrigeration", "R-404A", kg(50), kg(10)).event.exceeds).toBe(false); // Source: 82.157(c)(2) 20 % [S3]
    expect(oneAddition("commercial_refrigeration", "R-404A", kg(50), kg(10.01)).event.exceeds).toBe(true); // Source: 82.157(c)(2) [S3]
  });
  it("15 lb on a 150 lb comfort-cooling chiller is 10 %, not over; 15 kg on 150 kg likewise", () => {
    // 15 lb = 6,804 g of 68,039 g is 10.00015 % by grams.
    const lbCase = oneAddition("chiller", "R-134a", lb(150), lb(15));
    expect(lbCase.event.exceeds).toBe(false); // Source: 82.157(c)(2) 10 % comfort cooling [S3]; 84.106 [S9]
    expect(lbCase.findings.some((f) => f.ruleId === "CT-LEAK-01")).toBe(false);
    expect(oneAddition("chiller", "R-134a", kg(150), kg(15)).event.exceeds).toBe(false); // Source: 82.157(c)(2) 10 % [S3]
    expect(oneAddition("chiller", "R-134a", lb(150), lb(15.1)).findings.some((f) => f.ruleId === "CT-LEAK-01")).toBe(true); // Source: 82.157(d) repair duty [S3]
  });
  it("30 % for industrial process refrigeration: 300 lb on 1,000 lb is not over", () => {
    expect(oneAddition("industrial_process", "R-404A", lb(1000), lb(300)).event.exceeds).toBe(false); // Source: 82.157(c)(2) 30 % IPR [S3]
  });
  it("rolling average: 12 lb and 8 lb in the window on 100 lb is 20 %, not over", () => {
    // 5,443 g + 3,629 g = 9,072 g, two amounts each rounded to the gram.
    const events = leakRateHistory({
      fullChargeG: lb(100),
      method: "rolling_average",
      additions: [
        { on: "2026-02-01", amountG: lb(12) },
        { on: "2026-05-01", amountG: lb(8) },
      ],
    });
    expect(events[1]!.percent).toBeGreaterThan(20); // stored grams alone would say over
    expect(events[1]!.percentLow!).toBeLessThanOrEqual(20); // Source: 82.152 rolling average; 82.157(c)(2) 20 % [S3]
  });
});

describe("chronic leaker at exactly 125 % (40 CFR 82.157(j); 84.106)", () => {
  it("500 lb added to a 400 lb appliance in one calendar year is 125 %: chronic", () => {
    // 226,796 g of 181,437 g is 124.99999 % by grams.
    const additions = [{ on: "2026-05-01", amountG: lb(500) }];
    expect(chronicLeakTest(lb(400), additions, 2026).chronic).toBe(true); // Source: EPA fact sheet [S4] "125 % or more of their charge in a calendar year"
    expect(chronicLeakTest(lb(400), [{ on: "2026-05-01", amountG: lb(499) }], 2026).chronic).toBe(false); // Source: [S4]
  });
  it("the same in kilograms, and spread over five additions", () => {
    expect(chronicLeakTest(kg(400), [{ on: "2026-05-01", amountG: kg(500) }], 2026).chronic).toBe(true); // Source: [S4] 125 %
    const five = Array.from({ length: 5 }, (_, i) => ({ on: `2026-0${i + 1}-15`, amountG: lb(100) }));
    expect(chronicLeakTest(lb(400), five, 2026).chronic).toBe(true); // Source: [S4] 125 %; five amounts each rounded to the gram
  });
});

describe("small-appliance recovery share exactly at 90 % / 80 % (40 CFR 82.156(b); 82.155)", () => {
  const req = (compressorOperating: boolean) =>
    requiredEvacuation({
      pressureClass: "high",
      fullChargeG: lb(0.5),
      equipmentManufacturedOn: "2020-01-01",
      smallAppliance: true,
      compressorOperating,
    });
  it("0.45 lb of a 0.5 lb charge with the compressor running is 90 %: enough", () => {
    // 204 g of 227 g is 89.87 % by grams.
    expect(evacuationSatisfied(req(true), { recoveredG: lb(0.45), fullChargeG: lb(0.5) }).satisfied).toBe(true); // Source: 82.156(b) 90 % with post-1993 equipment, compressor operating (REFERENCE.md §2.5 [S37])
    expect(evacuationSatisfied(req(true), { recoveredG: lb(0.44), fullChargeG: lb(0.5) }).satisfied).toBe(false); // Source: [S37]
  });
  it("0.4 lb of 0.5 lb with the compressor not running is 80 %: enough", () => {
    expect(evacuationSatisfied(req(false), { recoveredG: lb(0.4), fullChargeG: lb(0.5) }).satisfied).toBe(true); // Source: 82.156(b) 80 % compressor not operating [S37]
  });
  it("0.45 kg of 0.5 kg is 90 %; 0.449 kg is short", () => {
    const r = requiredEvacuation({
      pressureClass: "high",
      fullChargeG: kg(0.5),
      equipmentManufacturedOn: null,
      smallAppliance: true,
      compressorOperating: true,
    });
    expect(evacuationSatisfied(r, { recoveredG: kg(0.45), fullChargeG: kg(0.5) }).satisfied).toBe(true); // Source: 82.156(b) 90 % [S37]
    expect(evacuationSatisfied(r, { recoveredG: kg(0.449), fullChargeG: kg(0.5) }).satisfied).toBe(false); // Source: 82.156(b) 90 % [S37]
  });
  it("the audit raises no CT-EVAC-03 for 0.45 of 0.5 lb recovered", () => {
    const fridge = appliance({ id: 1, category: "small_appliance", refrigerant: "R-134a", fullChargeG: lb(0.5), factorySealed: true });
    const records = {
      ...emptyBranch([universalTech]),
      appliances: [fridge],
      jobs: [
        job({
          id: 1,
          kind: "recovery",
          performedOn: "2026-03-02",
          refrigerant: "R-134a",
          compressorOperating: true,
          movements: [{ direction: "recovered" as const, amountG: lb(0.45), cylinderId: null }],
        }),
      ],
    };
    const findings = runAudit(records, { packs: ["us_federal"], period: { from: "2026-01-01", to: "2026-12-31" }, asOf: "2026-03-03" });
    expect(findings.some((f) => f.ruleId === "CT-EVAC-03")).toBe(false); // Source: 82.156(b) [S37]
  });
});

describe("cylinder filled exactly to the maximum (AHRI Guideline K)", () => {
  it("38.08 lb in a 47.6 lb water-capacity cylinder (SG 1) is at the maximum, not over", () => {
    const max = maxCylinderFill({ waterCapacityG: lb(47.6), tareG: lb(27.5), refrigerant: "R-22", specificGravity: 1 });
    expect(exceedsMaxFill(lb(38.08), max)).toBe(false); // Source: [S12] acservicetech.com 0.8 × 47.6 = 38.08 lb (REFERENCE.md §5.3 C2)
    expect(exceedsMaxFill(lb(38.1), max)).toBe(true); // Source: [S12]
  });
  it("8 kg in a 10 kg water-capacity cylinder (SG 1) is at the maximum; 8.01 kg is over", () => {
    const max = maxCylinderFill({ waterCapacityG: kg(10), tareG: kg(7), refrigerant: "R-22", specificGravity: 1 });
    expect(exceedsMaxFill(kg(8), max)).toBe(false); // Source: AHRI Guideline K 80 % × WC × SG [S11]
    expect(exceedsMaxFill(kg(8.01), max)).toBe(true); // Source: [S11]
  });
});

describe("the comparison itself", () => {
  it("calls a share equal when the entered amounts may meet the threshold exactly", () => {
    expect(compareRoundedRatio(lb(20), lb(100), 20)).toBe(0);
    expect(compareRoundedRatio(lb(21), lb(100), 20)).toBe(1);
    expect(compareRoundedRatio(lb(19), lb(100), 20)).toBe(-1);
  });
});
