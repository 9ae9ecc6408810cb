import { describe, expect, it } from "vitest";
import {
  followUpVerificationDueOn,
  leakDeadlines,
  nextInspectionDueOn,
  periodicInspectionPlan,
  retrofitCompletionDueOn,
  toGrams,
} from "@coldtrail/core";

describe("leak-repair deadlines (REFERENCE.md §3.3)", () => {
  it("repair within 30 days; the plan clock is the same", () => {
    const d = leakDeadlines({ exceededOn: "2026-03-10", timeZone: "America/Chicago", useClass: "commercial_refrigeration" });
    expect(d.repairDueOn).toBe("2026-04-09"); // Source: 82.157(d); facilitiesdive [S38] (30 days)
    expect(d.initialVerificationDueOn).toBe("2026-04-09"); // Source: REFERENCE.md §3.3 (initial test within the repair window), M
    expect(d.retrofitPlanDueOn).toBe("2026-04-09"); // Source: phaseoutfacts.org [S28] (plan within 30 days)
  });
  it("120 days for IPR that needs an industrial-process shutdown", () => {
    expect(
      leakDeadlines({ exceededOn: "2026-03-10", timeZone: "UTC", useClass: "industrial_process", needsIndustrialShutdown: true })
        .repairDueOn,
    ).toBe("2026-07-08"); // Source: REFERENCE.md §3.3 (120 days, M-H)
    expect(
      leakDeadlines({ exceededOn: "2026-03-10", timeZone: "UTC", useClass: "comfort_cooling", needsIndustrialShutdown: true }).repairDueOn,
    ).toBe("2026-04-09"); // shutdown extension is for IPR only
  });
  it("follow-up verification within 10 days; retrofit completed within 1 year", () => {
    expect(followUpVerificationDueOn("2026-04-01", "UTC")).toBe("2026-04-11"); // Source: REFERENCE.md §3.3 (10 days, M)
    expect(retrofitCompletionDueOn("2026-04-01", "UTC")).toBe("2027-04-01"); // Source: facilitiesdive [S38] ("within a year")
  });
  it("computes dates in the branch's time zone", () => {
    const instant = "2026-03-01T03:30:00Z";
    expect(leakDeadlines({ exceededOn: instant, timeZone: "America/Los_Angeles", useClass: "comfort_cooling" }).exceededOn).toBe(
      "2026-02-28",
    ); // 19:30 on 28 Feb in Los Angeles
    expect(leakDeadlines({ exceededOn: instant, timeZone: "America/Los_Angeles", useClass: "comfort_cooling" }).repairDueOn).toBe(
      "2026-03-30",
    );
    expect(leakDeadlines({ exceededOn: instant, timeZone: "Europe/Berlin", useClass: "comfort_cooling" }).repairDueOn).toBe("2026-03-31");
  });
});

describe("periodic leak inspections (REFERENCE.md §3.4)", () => {
  it("a 1,000-lb R-22 IPR system is inspected every 3 months", () => {
    const plan = periodicInspectionPlan({ useClass: "industrial_process", fullChargeG: toGrams(1000, "lb"), regime: "us_608_ods" });
    expect(plan.interval).toBe("quarterly"); // Source: questionai [S37] (1,000-lb IPR on R-22 → every 3 months)
    expect(nextInspectionDueOn("2026-01-31", "quarterly")).toBe("2026-04-30");
  });
  it("smaller commercial systems and comfort cooling once a year; automatic leak detection replaces them", () => {
    expect(
      periodicInspectionPlan({ useClass: "commercial_refrigeration", fullChargeG: toGrams(200, "lb"), regime: "us_aim_hfc" }).interval,
    ).toBe("annual"); // from memory (REFERENCE.md §3.4, M)
    expect(periodicInspectionPlan({ useClass: "comfort_cooling", fullChargeG: toGrams(600, "lb"), regime: "us_aim_hfc" }).interval).toBe(
      "annual",
    ); // from memory (REFERENCE.md §3.4, M)
    expect(
      periodicInspectionPlan({
        useClass: "industrial_process",
        fullChargeG: toGrams(1000, "lb"),
        regime: "us_aim_hfc",
        hasAutomaticLeakDetection: true,
      }).interval,
    ).toBeNull(); // from memory (REFERENCE.md §3.4)
  });
});
