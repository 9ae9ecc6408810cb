import { describe, expect, it } from "vitest";
import {
  checkJobDraft,
  draftAsJob,
  runAudit,
  toGrams,
  type Appliance,
  type BranchRecords,
  type JobDraft,
  type JobDraftContext,
  type Job,
} from "@coldtrail/core";

const branch = { id: 1, name: "North", timeZone: "America/Chicago", massUnit: "lb_oz" as const };
const appliance = (over: Partial<Appliance> = {}): Appliance => ({
  id: 10,
  label: "CH-1",
  category: "chiller",
  refrigerant: "R-134a",
  fullChargeG: toGrams(650, "lb"),
  fullChargeMethod: "nameplate",
  factorySealed: false,
  status: "in_service",
  statusChangedOn: null,
  location: "Plant room",
  installedOn: "2015-01-01",
  ...over,
});
const cylinder = (over: Partial<NonNullable<JobDraftContext["cylinder"]>> = {}): NonNullable<JobDraftContext["cylinder"]> => ({
  id: 30,
  serial: "C-30",
  waterCapacityG: toGrams(47.6, "lb"),
  tareG: toGrams(27.5, "lb"),
  lastRequalifiedOn: "2024-01-01",
  requalificationYears: null,
  status: "in_service",
  openingContents: null,
  weighings: [],
  contents: { refrigerant: null, netG: 0 },
  ...over,
});
const ctx = (over: Partial<JobDraftContext> = {}): JobDraftContext => ({
  branch,
  appliance: appliance(),
  technician: { id: 5, name: "Tess Fielding", certifications: [{ id: 1, type: "universal", state: "verified" }] },
  equipment: { id: 20, serial: "RE-20", kind: "self_contained", manufacturedOn: "2021-05-01", certification: "certified" },
  cylinder: cylinder(),
  applianceJobs: [],
  ...over,
});
const draft = (over: Partial<JobDraft> = {}): JobDraft => ({
  kind: "recovery",
  performedOn: "2026-08-26",
  refrigerant: "R-134a",
  recoveredG: toGrams(10, "lb"),
  chargedG: null,
  chargeFromCylinder: false,
  evacuation: { value: 15, unit: "in_hg_vacuum" },
  accessMethod: "service_valve",
  temporaryAccessRemoved: null,
  compressorOperating: null,
  additionExclusion: null,
  ...over,
});
const ruleIds = (d: JobDraft, c: JobDraftContext) =>
  checkJobDraft(d, c)
    .warnings.map((w) => w.ruleId)
    .sort();

describe("instant feedback on a job draft", () => {
  it("a conforming recovery raises nothing and says what level is required", () => {
    const r = checkJobDraft(draft(), ctx());
    expect(r.warnings).toEqual([]);
    // Source: 40 CFR 82.156 Table 1 — medium-pressure, ≥ 200 lb, equipment after 15 Nov 1993: 15 in Hg
    expect(r.evacuationRequired).toBe("15 in Hg vacuum");
  });

  it("an evacuation short of Table 1 names the level needed with this equipment and the level entered", () => {
    const r = checkJobDraft(draft({ evacuation: { value: 4, unit: "in_hg_vacuum" } }), ctx());
    // Source: 40 CFR 82.156 Table 1 (medium-pressure ≥ 200 lb, post-1993 equipment: 15 in Hg)
    expect(r.warnings).toEqual([
      expect.objectContaining({
        ruleId: "CT-EVAC-01",
        severity: "critical",
        field: "evacuationValue",
        message: "This appliance needs 15 in Hg vacuum with this equipment; 4 in Hg entered.",
      }),
    ]);
  });

  it("a high-pressure appliance under 200 lb needs 0 in Hg, so 0 psig is enough", () => {
    // Source: 40 CFR 82.156 Table 1 — high-pressure, < 200 lb: 0 in Hg
    const c = ctx({ appliance: appliance({ refrigerant: "R-410A", category: "packaged_rooftop", fullChargeG: toGrams(20, "lb") }) });
    expect(ruleIds(draft({ refrigerant: "R-410A", evacuation: { value: 0, unit: "psig" } }), c)).toEqual([]);
    expect(checkJobDraft(draft({ refrigerant: "R-410A", evacuation: { value: 5, unit: "psig" } }), c).warnings[0]?.ruleId).toBe(
      "CT-EVAC-01",
    );
  });

  it("a Type I certification does not cover a rooftop unit; a pending card does not count", () => {
    const rooftop = appliance({ refrigerant: "R-410A", category: "packaged_rooftop", fullChargeG: toGrams(20, "lb") });
    const typeI = ctx({
      appliance: rooftop,
      technician: {
        id: 5,
        name: "T",
        certifications: [
          { id: 1, type: "type_i", state: "verified" },
          { id: 2, type: "type_ii", state: "pending" },
        ],
      },
    });
    const w = checkJobDraft(draft({ refrigerant: "R-410A", evacuation: { value: 0, unit: "psig" } }), typeI).warnings;
    // Source: 40 CFR 82.161 — Type II (or Universal) covers high-pressure appliances; only verified cards count (product rule)
    expect(w).toEqual([
      expect.objectContaining({
        ruleId: "CT-CERT-01",
        field: "applianceId",
        message:
          "Your Type I certification does not cover this high-pressure appliance: Type II or Universal is needed. Your Type II card is still awaiting verification.",
      }),
    ]);
  });

  it("a cylinder that would pass its maximum fill says by how much", () => {
    // Source: REFERENCE.md §5.3 C2/C3 — WC 47.6 lb, R-410A SG 1.062: maximum net 40.44 lb
    const c = ctx({
      appliance: appliance({ refrigerant: "R-410A", category: "packaged_rooftop", fullChargeG: toGrams(50, "lb") }),
      cylinder: cylinder({ contents: { refrigerant: "R-410A", netG: toGrams(35, "lb") } }),
    });
    const r = checkJobDraft(draft({ refrigerant: "R-410A", recoveredG: toGrams(8.64, "lb"), evacuation: { value: 0, unit: "psig" } }), c);
    const over = r.warnings.find((w) => w.ruleId === "CT-CYL-01");
    expect(over?.message).toMatch(/^Cylinder C-30 would be over its maximum fill by 3\.2\d lb/);
    expect(r.cylinderAfter?.maxNetG).toBe(Math.floor(toGrams(47.6, "lb") * 0.8 * 1.062));
  });

  it("a different refrigerant in the cylinder, an overdue requalification and a piercing device left on are each named", () => {
    const c = ctx({ cylinder: cylinder({ lastRequalifiedOn: "2020-02-18", contents: { refrigerant: "R-22", netG: 2000 } }) });
    const r = checkJobDraft(draft({ accessMethod: "bolt_on_line_tap", temporaryAccessRemoved: false }), c);
    // Source: 49 CFR 180.209 (5-year retest, common practice); one refrigerant per cylinder (common practice); temporary access devices (common practice)
    expect(r.warnings.map((w) => w.ruleId).sort()).toEqual(["CT-ACCESS-01", "CT-CYL-02", "CT-CYL-03"]);
    expect(r.warnings.find((w) => w.ruleId === "CT-CYL-03")?.message).toContain("already holds 4.41 lb R-22");
  });

  it("a small-appliance recovery short of the share and of 4 in Hg is named", () => {
    // Source: 40 CFR 82.156(b) — 80 % with the compressor not running (post-1993 equipment), or 4 in Hg vacuum
    const fridge = appliance({ category: "small_appliance", refrigerant: "R-134a", fullChargeG: 280, factorySealed: true });
    const short = draft({ recoveredG: 160, evacuation: { value: 0, unit: "in_hg_vacuum" }, compressorOperating: false });
    expect(checkJobDraft(short, ctx({ appliance: fridge })).warnings.map((w) => w.ruleId)).toEqual(["CT-EVAC-03"]);
    expect(checkJobDraft({ ...short, recoveredG: 230 }, ctx({ appliance: fridge })).warnings).toEqual([]); // 82 % ≥ 80 %
  });

  it("a charge reports the leak rate; over the threshold it warns with the repair date", () => {
    // Source: REFERENCE.md §3.6 E1 — 100 lb commercial refrigeration, 10 lb added 180 days after the last: 20.2778 % > 20 %
    const rack = appliance({ category: "commercial_refrigeration", refrigerant: "R-22", fullChargeG: toGrams(100, "lb") });
    const earlier: Job = {
      ...draftAsJob(
        draft({ kind: "charge", chargedG: toGrams(10, "lb"), recoveredG: null, evacuation: null, refrigerant: "R-22" }),
        ctx({ appliance: rack }),
      ),
      id: 77,
      performedOn: "2026-01-10",
    };
    const r = checkJobDraft(
      draft({
        kind: "charge",
        performedOn: "2026-07-09",
        chargedG: toGrams(10, "lb"),
        recoveredG: null,
        evacuation: null,
        refrigerant: "R-22",
      }),
      ctx({ appliance: rack, applianceJobs: [earlier] }),
    );
    expect(r.leakRate?.percent).toBeCloseTo(20.278, 1);
    expect(r.leakRate).toMatchObject({ threshold: 20, exceeds: true, repairDueOn: "2026-08-08" });
    expect(r.warnings.map((w) => w.ruleId)).toEqual(["CT-LEAK-01"]);
    // A retrofit charge is not counted (82.152): no warning.
    const excluded = checkJobDraft(
      draft({
        kind: "charge",
        performedOn: "2026-07-09",
        chargedG: toGrams(10, "lb"),
        recoveredG: null,
        evacuation: null,
        refrigerant: "R-22",
        additionExclusion: "retrofit",
      }),
      ctx({ appliance: rack, applianceJobs: [earlier] }),
    );
    expect(excluded.warnings).toEqual([]);
    expect(excluded.leakRate).toMatchObject({ percent: null, excluded: "retrofit" });
  });

  it("says the same as the audit: the draft's warnings are the findings the audit raises on the saved job", () => {
    // Common practice: one set of rules for the form and the audit.
    const cases: Array<[JobDraft, JobDraftContext]> = [
      [draft({ evacuation: { value: 4, unit: "in_hg_vacuum" } }), ctx()],
      [
        draft({ accessMethod: "piercing_pliers", temporaryAccessRemoved: false }),
        ctx({ cylinder: cylinder({ lastRequalifiedOn: "2020-02-18", contents: { refrigerant: "R-22", netG: 2000 } }) }),
      ],
      [draft(), ctx({ equipment: { id: 20, serial: "RE-20", kind: "system_dependent", manufacturedOn: null, certification: "unknown" } })],
      [
        draft({ refrigerant: "R-410A", evacuation: { value: 0, unit: "psig" } }),
        ctx({
          appliance: appliance({ refrigerant: "R-410A", category: "packaged_rooftop", fullChargeG: toGrams(20, "lb") }),
          technician: { id: 5, name: "T", certifications: [{ id: 1, type: "type_i", state: "verified" }] },
        }),
      ],
      [
        draft({ recoveredG: 160, evacuation: { value: 0, unit: "in_hg_vacuum" }, compressorOperating: false }),
        ctx({ appliance: appliance({ category: "small_appliance", fullChargeG: 280, factorySealed: true }) }),
      ],
    ];
    for (const [d, c] of cases) {
      const job = { ...draftAsJob(d, c), id: 999 };
      const records: BranchRecords = {
        branch: c.branch,
        appliances: [c.appliance],
        recoveryEquipment: c.equipment ? [c.equipment] : [],
        cylinders: c.cylinder ? [{ ...c.cylinder, openingContents: c.cylinder.contents }] : [],
        jobs: [job],
        technicians: c.technician ? [c.technician] : [],
        disposalRecords: [],
        disposalStatements: [],
        reclaimShipments: [],
        purchases: [],
        stockCounts: [],
        leakInspections: [],
        chronicLeakReports: [],
      };
      const findings = runAudit(records, { packs: ["us_federal"], period: { from: "2026-01-01", to: "2026-12-31" }, asOf: "2026-08-27" });
      const aboutJob = findings.filter((x) => x.recordType === "job" && x.recordId === 999).map((x) => x.ruleId);
      const aboutCylinder = findings.filter((x) => x.ruleId === "CT-CYL-02").map((x) => x.ruleId);
      expect(ruleIds(d, c).length).toBeGreaterThan(0);
      expect(ruleIds(d, c)).toEqual([...aboutJob, ...aboutCylinder].filter((id) => id !== "CT-REC-01").sort());
    }
  });
});

describe("instant feedback on rule-edge cases", () => {
  const charge = (over: Partial<JobDraft> = {}) =>
    draft({ kind: "charge", recoveredG: null, chargedG: toGrams(5, "lb"), evacuation: null, ...over });

  it("a charge on an appliance without a recorded full charge says the leak rate cannot be calculated", () => {
    const result = checkJobDraft(charge(), ctx({ appliance: appliance({ fullChargeG: null }) }));
    expect(result.warnings.map((w) => w.ruleId)).toContain("CT-LEAK-06");
    expect(result.leakRate?.percent).toBeNull();
  });

  it("a charge marked as the same leak as an earlier charge is summed with it", () => {
    const earlier: Job = { ...draftAsJob(charge({ performedOn: "2026-08-01" }), ctx()), id: 7 };
    const previous: Job = { ...draftAsJob(charge({ performedOn: "2025-08-01" }), ctx()), id: 6 };
    const alone = checkJobDraft(charge(), ctx({ applianceJobs: [previous, earlier] }));
    const summed = checkJobDraft(charge({ sameLeakAsJobId: 7 }), ctx({ applianceJobs: [previous, earlier] }));
    // 5 lb after 25 days alone; 10 lb over the 365 days before the first of the two when summed.
    expect(alone.leakRate?.percent).toBeCloseTo((5 / 650) * (365 / 25) * 100, 1);
    expect(summed.leakRate?.percent).toBeCloseTo((10 / 650) * 100, 1);
  });
});
