import { describe, expect, it } from "vitest";
import {
  aimCoversRefrigerant,
  analyseLeaks,
  leakRateHistory,
  leakRepairRegime,
  resolveSettings,
  runAudit,
  toGrams,
  type Appliance,
  type Job,
} from "@coldtrail/core";
import { appliance, job } from "../../packages/core/test/fixtures/sample-branch";
import { emptyBranch, universalTech } from "../fixtures/rule-records";

const lb = (v: number) => toGrams(v, "lb");
const kg = (v: number) => toGrams(v, "kg");

const charge = (id: number, on: string, amountG: number, extra: Partial<Job> = {}) =>
  job({
    id,
    kind: "charge",
    performedOn: on,
    refrigerant: "R-404A",
    movements: [{ direction: "charged", amountG, cylinderId: null }],
    ...extra,
  });

function audit(a: Appliance, jobs: Job[], asOf: string) {
  const records = { ...emptyBranch([universalTech]), appliances: [a], jobs };
  return runAudit(records, { packs: ["us_federal"], period: { from: "2019-01-01", to: "2026-12-31" }, asOf });
}

describe("the first interval starts at installation (40 CFR 82.152 leak rate; 84.106)", () => {
  it("a 100 lb rack installed 2026-03-01 that takes 10 lb on 2026-04-01 is over 20 % and must be repaired", () => {
    const rack = appliance({
      id: 1,
      category: "commercial_refrigeration",
      refrigerant: "R-404A",
      fullChargeG: lb(100),
      installedOn: "2026-03-01",
    });
    const jobs = [charge(1, "2026-04-01", lb(10))];
    const analysis = analyseLeaks(rack, jobs, resolveSettings(), "America/Chicago")!;
    const e = analysis.events[0]!;
    expect(e.event.daysSinceLastAddition).toBe(31); // the installation charge is the last addition before it
    expect(e.event.intervalStartsFrom).toBe("installation");
    expect(e.event.percent).toBeCloseTo(10 * (365 / 31), 2); // Source: 82.152 annualizing method, days since the last addition (REFERENCE.md §3.1); 117.7 %
    expect(e.exceeds).toBe(true); // Source: 84.106 20 % commercial refrigeration [S9]
    const findings = audit(rack, jobs, "2026-04-02");
    expect(findings.find((f) => f.ruleId === "CT-LEAK-01")?.dueOn).toBe("2026-05-01"); // Source: REFERENCE.md §3.3 (repair within 30 days)
  });
  it("the same in kilograms: 4.5 kg on a 45 kg rack 31 days after installation", () => {
    const rack = appliance({
      id: 1,
      category: "commercial_refrigeration",
      refrigerant: "R-404A",
      fullChargeG: kg(45),
      installedOn: "2026-03-01",
    });
    expect(analyseLeaks(rack, [charge(1, "2026-04-01", kg(4.5))], resolveSettings(), "America/Chicago")!.events[0]!.exceeds).toBe(true); // Source: 84.106 [S9]
  });
  it("without an installation date the first addition uses 365 days", () => {
    const events = leakRateHistory({ fullChargeG: lb(100), method: "annualizing", additions: [{ on: "2026-04-01", amountG: lb(10) }] });
    expect(events[0]!.percent).toBeCloseTo(10, 3); // from memory (REFERENCE.md §3.1 AIM specifics, M/L): 365 days for the first calculation
    expect(events[0]!.intervalStartsFrom).toBeNull();
  });
  it("an appliance installed before the AIM start takes 365 days for its first AIM addition", () => {
    const events = leakRateHistory({
      fullChargeG: lb(100),
      method: "annualizing",
      countFrom: "2026-01-01",
      installedOn: "2018-05-01",
      additions: [{ on: "2026-04-01", amountG: lb(10) }],
    });
    expect(events[0]!.percent).toBeCloseTo(10, 3); // from memory (REFERENCE.md §3.1 AIM specifics: only additions from 2026-01-01 count; 365 days for the first)
  });
  it("an earlier addition outside the audit period still starts the interval", () => {
    const rack = appliance({
      id: 1,
      category: "commercial_refrigeration",
      refrigerant: "R-404A",
      fullChargeG: lb(100),
      installedOn: "2024-01-01",
    });
    const jobs = [charge(1, "2026-01-20", lb(2)), charge(2, "2026-02-19", lb(2))];
    const findings = runAudit(
      { ...emptyBranch([universalTech]), appliances: [rack], jobs },
      { packs: ["us_federal"], period: { from: "2026-02-01", to: "2026-02-28" }, asOf: "2026-02-20" },
    );
    // 2 lb after 30 days: 24.3 % > 20 %.
    expect(findings.find((f) => f.ruleId === "CT-LEAK-01")?.detail).toContain("24.3 %"); // Source: 82.152 annualizing; 84.106 20 % [S9]
  });
});

describe("an unknown full charge takes the stricter side", () => {
  const noCharge = appliance({
    id: 1,
    category: "commercial_refrigeration",
    refrigerant: "R-404A",
    fullChargeG: null,
    installedOn: "2024-01-01",
  });
  it("the appliance is treated as covered and says why", () => {
    const r = leakRepairRegime({ refrigerant: "R-404A", fullChargeG: null, category: "commercial_refrigeration", on: "2026-04-01" });
    expect(r.regime).toBe("us_aim_hfc"); // Source: 84.106 covers ≥ 15 lb [S9]; an unknown charge cannot be shown to be smaller
    expect(r.chargeUnknown).toBe(true);
    expect(r.reason).toContain("not recorded");
  });
  it("an addition raises the missing-charge finding, and the service record lacks the full charge", () => {
    const findings = audit(noCharge, [charge(1, "2026-04-01", lb(10))], "2026-04-02");
    const leak = findings.find((f) => f.ruleId === "CT-LEAK-06");
    expect(leak?.detail).toContain("no full charge is recorded"); // Source: 82.152 (leak rate is a share of the full charge); 82.157(c) [S3]
    expect(leak?.detail).toContain("20 % threshold");
    expect(findings.find((f) => f.ruleId === "CT-REC-01")?.detail).toContain("full charge"); // Source: 82.157(b), (l)(2) service record includes the full charge (REFERENCE.md §4)
  });
  it("an excluded addition or a recorded charge raises no missing-charge finding", () => {
    expect(
      audit(noCharge, [charge(1, "2026-04-01", lb(10), { additionExclusion: "installation" })], "2026-04-02").map((f) => f.ruleId),
    ).not.toContain("CT-LEAK-06");
    const known = { ...noCharge, fullChargeG: lb(100) };
    expect(audit(known, [charge(1, "2026-04-01", lb(1))], "2026-04-02").map((f) => f.ruleId)).not.toContain("CT-LEAK-06");
  });
  it("a disposal with an unknown charge needs a disposal record (82.155(c) band cannot be ruled out)", () => {
    const split = appliance({
      id: 1,
      category: "residential_split",
      refrigerant: "R-410A",
      fullChargeG: null,
      status: "disposed",
      statusChangedOn: "2026-03-01",
    });
    const jobs = [
      job({
        id: 1,
        kind: "disposal",
        performedOn: "2026-03-01",
        refrigerant: "R-410A",
        evacuation: { value: 0, unit: "psig" },
        movements: [{ direction: "recovered", amountG: lb(8), cylinderId: null }],
      }),
    ];
    expect(audit(split, jobs, "2026-04-30").find((f) => f.ruleId === "CT-DISP-01")?.detail).toContain("full charge not recorded"); // Source: 82.155(c) > 5 and < 50 lb [S4]
  });
});

describe("additions for the same leak are summed (40 CFR 82.152 leak rate)", () => {
  it("an addition marked as the same leak as an earlier one is summed with it over the interval before the first", () => {
    const additions = [
      { on: "2025-03-31", amountG: lb(5), sourceId: 1 },
      { on: "2026-03-31", amountG: lb(12), sourceId: 2 },
      { on: "2026-04-02", amountG: lb(10), sourceId: 3, sameLeakAsJobId: 2 },
    ];
    const events = leakRateHistory({ fullChargeG: lb(100), method: "annualizing", additions });
    expect(events).toHaveLength(2);
    const e = events[1]!;
    expect(e.firstOn).toBe("2026-03-31");
    expect(e.on).toBe("2026-04-02");
    expect(e.addedG).toBe(lb(12) + lb(10));
    expect(e.daysSinceLastAddition).toBe(365);
    expect(e.percent).toBeCloseTo(22, 2); // Source: 82.152 step 1 "whether in one addition or multiple additions related to the same leak" (from memory); 22 lb / 100 lb over 365 days
    expect(e.sourceIds).toEqual([2, 3]);
  });
  it("another addition in between keeps its own interval from the last addition before it", () => {
    const events = leakRateHistory({
      fullChargeG: lb(100),
      method: "annualizing",
      additions: [
        { on: "2025-01-01", amountG: lb(5), sourceId: 1 },
        { on: "2026-01-10", amountG: lb(4), sourceId: 2 },
        { on: "2026-02-01", amountG: lb(1), sourceId: 3 },
        { on: "2026-02-20", amountG: lb(4), sourceId: 4, sameLeakAsJobId: 2 },
      ],
    });
    const byJob = (id: number) => events.find((e) => e.sourceIds.includes(id))!;
    expect(byJob(3).daysSinceLastAddition).toBe(22); // refrigerant was last added on 2026-01-10
    expect(byJob(4).daysSinceLastAddition).toBe(374); // the leak event began on 2026-01-10; capped at 365 in the rate
    expect(byJob(4).percent).toBeCloseTo(8, 2); // Source: 82.152 annualizing (days capped at 365); 4 lb + 4 lb of 100 lb
  });
  it("the audit dates the exceedance at the addition that completes it", () => {
    const rack = appliance({
      id: 1,
      category: "commercial_refrigeration",
      refrigerant: "R-22",
      fullChargeG: lb(100),
      installedOn: "2010-01-01",
    });
    const jobs = [
      charge(1, "2025-03-31", lb(5), { refrigerant: "R-22" }),
      charge(2, "2026-03-31", lb(12), { refrigerant: "R-22" }),
      charge(3, "2026-04-02", lb(10), { refrigerant: "R-22", sameLeakAsJobId: 2 }),
    ];
    const findings = audit(rack, jobs, "2026-04-03");
    const leak = findings.find((f) => f.ruleId === "CT-LEAK-01");
    expect(leak?.identityKey).toBe("CT-LEAK-01:appliance:1:2026-04-02"); // Source: 82.157(c)(2) 20 % [S3]; 82.157(a) ODS ≥ 50 lb
    expect(leak?.detail).toContain("22.0 %");
  });
});

describe("who is covered: 2019–2020 substitutes and the AIM test (82.157(a) 2016 text; 84.106)", () => {
  const on2019 = "2019-06-01";
  const regime = (refrigerant: string, category: Appliance["category"], on: string, chargeLb = 60) =>
    leakRepairRegime({ refrigerant, fullChargeG: lb(chargeLb), category, on }).regime;
  it("from 2019-01-01 until 2020-04-10, non-exempt substitutes of 50 lb or more were covered, HFC or not", () => {
    expect(regime("R-410A", "chiller", on2019)).toBe("us_608_substitute"); // Source: REFERENCE.md §1.5 (82.157(a): "since 10 Apr 2020, not for appliances that contain only substitutes")
    expect(regime("R-1234yf", "chiller", on2019)).toBe("us_608_substitute"); // non-exempt substitute without an HFC (82.152 "refrigerant")
    expect(regime("R-717", "chiller", on2019)).toBe("us_608_substitute"); // ammonia in comfort cooling is not exempt [S30]
    expect(regime("R-1234yf", "chiller", on2019, 49)).toBeNull(); // Source: 82.157(a) ≥ 50 lb [S3]
  });
  it("exempt substitutes were never covered", () => {
    expect(regime("R-744", "commercial_refrigeration", on2019)).toBeNull(); // Source: 82.154(a)(1) CO2 any application [S30]
    expect(regime("R-717", "industrial_process", on2019)).toBeNull(); // Source: [S30] ammonia in IPR
  });
  it("from 2020-04-10 only ozone-depleting refrigerants remain under Part 82", () => {
    expect(regime("R-1234yf", "chiller", "2020-04-10")).toBeNull(); // Source: REFERENCE.md §1.5 [S3]
    expect(regime("R-410A", "chiller", "2020-04-10")).toBeNull(); // Source: [S3]
    expect(regime("R-22", "chiller", "2020-04-10")).toBe("us_608_ods"); // Source: 82.157(a) [S3]
  });
  it("AIM covers refrigerants that contain an HFC or are substitutes with GWP above 53", () => {
    for (const r of ["R-410A", "R-32", "R-134a", "R-404A", "R-407C", "R-454B", "R-452A", "R-448A", "R-449A"])
      expect(aimCoversRefrigerant(r), r).toBe(true); // Source: REFERENCE.md §6.1 AIM coverage test (covered list); 84.106 [S9]
    for (const r of ["R-290", "R-744", "R-717", "R-1234yf", "R-1234ze(E)", "R-1233zd(E)", "R-514A", "R-22", "R-123"])
      expect(aimCoversRefrigerant(r), r).toBe(false); // Source: REFERENCE.md §6.1 (not covered; ODS fall under Part 82)
    expect(regime("R-454B", "commercial_refrigeration", "2026-06-01", 15)).toBe("us_aim_hfc"); // Source: 84.106 ≥ 15 lb [S9]
    expect(regime("R-1234yf", "commercial_refrigeration", "2026-06-01", 500)).toBeNull(); // GWP 4 (EU 517/2014 figure) ≤ 53
  });
});
