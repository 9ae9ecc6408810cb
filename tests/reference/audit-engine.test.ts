import { describe, expect, it } from "vitest";
import { getRule, runAudit, RULES, type Finding } from "@coldtrail/core";
import { appliance, job, lb, sampleBranch } from "../../packages/core/test/fixtures/sample-branch";

const options = { packs: ["us_federal", "eu"] as const, period: { from: "2026-01-01", to: "2026-03-31" }, asOf: "2026-03-15T15:00:00Z" };
const audit = (records = sampleBranch(), extra: Partial<Parameters<typeof runAudit>[1]> = {}) =>
  runAudit(records, { ...options, packs: [...options.packs], ...extra });
const byKey = (findings: Finding[]) => new Map(findings.map((f) => [f.identityKey, f]));

describe("audit engine over an invented branch", () => {
  const findings = audit();
  const keys = byKey(findings);

  it("finds each rule family once where the records break it", () => {
    // Every expectation names the rule's source in the registry citation; the case is built to break it.
    expect(keys.get("CT-CERT-01:job:101")?.detail).toContain("Type II or Universal is needed for a high-pressure appliance (R-410A)"); // Source: 40 CFR 82.161; REFERENCE.md §1.1 test idea
    expect(keys.has("CT-CERT-02:certification:3")).toBe(true); // pending card
    expect(keys.get("CT-EVAC-01:job:102")?.detail).toContain("25 mm Hg absolute is required"); // Source: 40 CFR 82.156 Table 1 (low pressure)
    expect(keys.has("CT-EVAC-01:job:103")).toBe(false); // 0 psig meets 0 in Hg for a 40-lb high-pressure unit, Source: Table 1
    expect(keys.has("CT-EVAC-02:job:104")).toBe(true);
    expect(keys.get("CT-EVAC-03:job:106")?.detail).toContain("(60 %)"); // Source: 40 CFR 82.156(b) (90 % with compressor operating)
    expect(keys.has("CT-ACCESS-01:job:104")).toBe(true); // common practice
    expect(keys.has("CT-EQUIP-01:job:104")).toBe(true); // Source: 40 CFR 82.158
    expect(keys.has("CT-EQUIP-02:job:105")).toBe(true); // from memory: system-dependent ≤ 15 lb (REFERENCE.md §1.5)
    expect(keys.get("CT-CYL-01:job:103:cylinder-10")?.detail).toBe(
      "Recovered 8.6 lb R-410A into cylinder C-0142, which now holds 3.2 lb over its maximum of 40.4 lb",
    ); // Source: AHRI Guideline K (C3: 40.44 lb for R-410A in WC 47.6 lb)
    expect(keys.get("CT-CYL-02:cylinder:11")?.dueOn).toBe("2024-05-01"); // Source: 49 CFR 180.209 (5-year default setting)
    expect(keys.get("CT-CYL-03:job:105:cylinder-12")?.detail).toContain("which already held 11.0 lb R-410A"); // common practice: one refrigerant per cylinder
    expect(keys.get("CT-CYL-04:cylinder:13:weighing-1")?.detail).toContain("13.3 psi above"); // Source: REFERENCE.md §6.3 example
    expect(keys.has("CT-DISP-01:appliance:5")).toBe(true); // Source: 40 CFR 82.155(c) (12 lb is within 5–50 lb)
    expect(keys.has("CT-DISP-02:appliance:4")).toBe(true); // Source: 40 CFR 82.155(b)
    expect(keys.has("CT-DISP-03:appliance:6")).toBe(true); // Source: 40 CFR 82.155(a)
    expect(keys.has("CT-REF-01:job:107:appliance-99")).toBe(true);
    expect(keys.has("CT-REF-01:job:107:cylinder-77")).toBe(true);
    expect([...keys.keys()].some((k) => k.startsWith("CT-BAL-01:branch:7:R-410A"))).toBe(true);
  });

  it("follows leaks through repair, verification and reporting deadlines", () => {
    expect(keys.get("CT-LEAK-02:appliance:3:2026-01-05")?.dueOn).toBe("2026-02-04"); // Source: 40 CFR 84.106 (30 days); AIM first calculation uses 365 days (from memory)
    expect(keys.get("CT-LEAK-04:appliance:3:2026")?.dueOn).toBe("2027-03-01"); // Source: EPA fact sheet [S4] (125 %), 1 March (M-H)
    expect(keys.get("CT-LEAK-03:appliance:9:2026-01-20:initial")?.dueOn).toBe("2026-02-19"); // Source: REFERENCE.md §3.3 (initial test within the 30 days)
    expect(keys.get("CT-LEAK-01:appliance:9:2026-03-10")?.dueOn).toBe("2026-04-09"); // Source: REFERENCE.md §3.3 (30 days)
    expect(keys.has("CT-LEAK-02:appliance:9:2026-01-20")).toBe(false); // repaired on 2026-01-25, in time
    expect(keys.has("CT-REC-01:job:112")).toBe(true); // Source: 82.157(b); no location recorded
  });

  it("fills every finding from the registry", () => {
    for (const f of findings) {
      const rule = getRule(f.ruleId)!;
      expect(f.severity).toBe(rule.severity);
      expect(f.title).toBe(rule.title);
      expect(f.citation.length).toBeGreaterThan(0);
      expect(f.fix.length).toBeGreaterThan(0);
      expect(f.identityKey.startsWith(`${f.ruleId}:${f.recordType}:${f.recordId}`)).toBe(true);
    }
    expect(new Set(findings.map((f) => f.identityKey)).size).toBe(findings.length);
  });

  it("sorts findings by rule id then record", () => {
    const sorted = [...findings].sort(
      (a, b) =>
        (a.ruleId + a.recordType).localeCompare(b.ruleId + b.recordType) ||
        a.recordId - b.recordId ||
        a.identityKey.localeCompare(b.identityKey),
    );
    expect(findings.map((f) => f.identityKey)).toEqual(sorted.map((f) => f.identityKey));
  });

  it("is deterministic and keeps identity keys across re-runs", () => {
    expect(audit()).toEqual(findings);
  });

  it("keeps only the chosen packs", () => {
    const us = audit(sampleBranch(), { packs: ["us_federal"] });
    expect(us.some((f) => f.pack === "eu")).toBe(false);
    expect(findings.some((f) => f.ruleId === "CT-EU-02")).toBe(true); // Source: 2024/573 (≥ 500 t CO2e needs a leak-detection system)
  });

  it("leaves out event findings outside the period but keeps standing obligations", () => {
    const march = audit(sampleBranch(), { period: { from: "2026-03-01", to: "2026-03-31" } });
    const k = byKey(march);
    expect(k.has("CT-CERT-01:job:101")).toBe(false); // job of 2 Feb
    expect(k.has("CT-CYL-02:cylinder:11")).toBe(true); // standing obligation
    expect(k.has("CT-LEAK-01:appliance:9:2026-03-10")).toBe(true);
  });

  it("does not fire on a clean record", () => {
    const clean = sampleBranch();
    clean.jobs = [
      job({
        id: 1,
        kind: "recovery",
        performedOn: "2026-02-01",
        evacuation: { value: 0, unit: "psig" },
        movements: [{ direction: "recovered", amountG: lb(3), cylinderId: 10 }],
      }),
    ];
    clean.appliances = [appliance({ id: 1 })];
    clean.cylinders = clean.cylinders.filter((c) => c.id === 10).map((c) => ({ ...c, openingContents: null }));
    clean.reclaimShipments = [
      {
        id: 1,
        shippedOn: "2026-02-10",
        reclaimer: "Valley Reclaim Co.",
        lines: [{ cylinderId: 10, refrigerant: "R-410A", amountG: lb(3) }],
      },
    ];
    clean.purchases = [];
    clean.technicians = clean.technicians.slice(0, 1);
    expect(runAudit(clean, { ...options, packs: ["us_federal"] })).toEqual([]);
  });

  it("periodic inspection overdue after an exceedance (CT-LEAK-05)", () => {
    const r = sampleBranch();
    r.appliances = [appliance({ id: 30, label: "IPR loop", category: "industrial_process", refrigerant: "R-22", fullChargeG: lb(1000) })];
    r.jobs = [
      job({
        id: 1,
        kind: "charge",
        performedOn: "2025-06-01",
        applianceId: 30,
        refrigerant: "R-22",
        movements: [{ direction: "charged", amountG: lb(10), cylinderId: null }],
      }),
      job({
        id: 2,
        kind: "charge",
        performedOn: "2025-06-11",
        applianceId: 30,
        refrigerant: "R-22",
        movements: [{ direction: "charged", amountG: lb(10), cylinderId: null }],
      }),
      job({ id: 3, kind: "leak_repair", performedOn: "2025-06-20", applianceId: 30, refrigerant: "R-22" }),
    ];
    r.leakInspections = [{ id: 1, applianceId: 30, on: "2025-09-05" }];
    const k = byKey(runAudit(r, { packs: ["us_federal"], period: { from: "2025-01-01", to: "2026-03-31" }, asOf: "2026-03-15" }));
    expect(k.get("CT-LEAK-05:appliance:30:2025-06-11:2025-12-05")?.dueOn).toBe("2025-12-05"); // Source: REFERENCE.md §3.4 (quarterly for IPR ≥ 500 lb [S37])
  });

  it("has a registry with stable, unique, readable ids", () => {
    expect(new Set(RULES.map((r) => r.id)).size).toBe(RULES.length);
    for (const r of RULES) expect(r.id).toMatch(/^CT-[A-Z]+-\d{2}$/);
  });
});
