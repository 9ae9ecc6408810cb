import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { DEFAULT_SETTINGS, runAudit, type Finding, type JobInput } from "@coldtrail/core";
import { createCertification, createJob, loadBranchRecords } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";
import { jobsFixture, type JobsFixture } from "./jobs-fixture";

let t: TestDb;
let f: JobsFixture;

beforeEach(async () => {
  t = await createTestDb();
  f = await jobsFixture(t.db);
});
afterEach(async () => {
  await t.destroy();
});

const actor = () => ({ userId: f.tech, organisationId: f.org });

/** Reads the branch as the audit does and runs the US rules for the year up to `now`. */
async function findingsAt(now: Date, period = { from: "2026-01-01", to: "2026-12-31" }): Promise<Finding[]> {
  const loaded = await loadBranchRecords(t.db, { organisationId: f.org, branchId: f.north, period, asOf: now });
  return runAudit(loaded.records, { packs: ["us_federal"], period, asOf: now, settings: DEFAULT_SETTINGS });
}

const disposal = (performedOn: string): JobInput => ({
  kind: "disposal",
  applianceId: f.rooftop,
  performedOn,
  refrigerant: "R-410A",
  recoveredAmount: 8,
  recoveredUnit: "lb",
  cylinderId: f.northCylinder,
  equipmentId: f.northEquipment,
  evacuationValue: 0,
  evacuationUnit: "psig",
  accessMethod: "service_valve",
  disposalPath: "on_site",
});

describe("grace periods before paperwork is reported missing", () => {
  it("a disposal saved today raises no disposal-record finding; after the grace period it does", async () => {
    const today = new Date("2026-06-10T18:00:00Z");
    await createJob(t.db, { actor: actor(), branchId: f.north, input: disposal("2026-06-10"), now: today });
    const rooftopRecord = (fs: Finding[]) => fs.filter((x) => x.ruleId === "CT-DISP-01" && x.recordId === f.rooftop);
    expect(rooftopRecord(await findingsAt(today))).toEqual([]);
    // Still inside the grace period on its last day (organisation setting, 14 days by default).
    expect(rooftopRecord(await findingsAt(new Date("2026-06-24T18:00:00Z")))).toEqual([]);
    const late = rooftopRecord(await findingsAt(new Date("2026-06-25T18:00:00Z")));
    expect(late).toHaveLength(1); // Source: 40 CFR 82.155(c) disposal record for appliances of more than 5 and less than 50 lb
    expect(late[0]!.detail).toContain("grace period");
  });

  it("a card uploaded today raises no awaiting-verification finding; after the grace period it does", async () => {
    const today = new Date("2026-06-10T18:00:00Z");
    const id = await createCertification(t.db, {
      actor: actor(),
      input: { certifyingOrganisation: "Invented Exam Board", certificateNumber: "F-2", types: ["type_i"] } as never,
      card: { fileKey: "cards/f-2.png", mime: "image/png", thumbnailKey: null },
      now: today,
    });
    const pending = (fs: Finding[]) => fs.filter((x) => x.ruleId === "CT-CERT-02" && x.recordId === id);
    expect(pending(await findingsAt(today))).toEqual([]);
    const later = pending(await findingsAt(new Date("2026-06-21T18:00:00Z")));
    expect(later).toHaveLength(1);
    expect(later[0]!.detail).toContain("within 10 days (organisation setting)");
  });
});

describe("leak history before the audit period", () => {
  it("an addition before the period starts the interval of the first addition in it", async () => {
    const charge = (performedOn: string): JobInput => ({
      kind: "charge",
      applianceId: f.walkIn,
      performedOn,
      refrigerant: "R-22",
      chargedAmount: 2,
      chargedUnit: "lb",
      chargeSource: "stock",
    });
    await createJob(t.db, { actor: actor(), branchId: f.north, input: charge("2026-01-20"), now: new Date("2026-01-21T12:00:00Z") });
    await createJob(t.db, { actor: actor(), branchId: f.north, input: charge("2026-02-19"), now: new Date("2026-02-20T12:00:00Z") });
    const period = { from: "2026-02-01", to: "2026-02-28" };
    const loaded = await loadBranchRecords(t.db, {
      organisationId: f.org,
      branchId: f.north,
      period,
      asOf: new Date("2026-02-20T12:00:00Z"),
    });
    expect(loaded.records.jobs.filter((j) => j.applianceId === f.walkIn).map((j) => j.performedOn)).toEqual(["2026-01-20", "2026-02-19"]);
    const found = runAudit(loaded.records, { packs: ["us_federal"], period, asOf: new Date("2026-02-20T12:00:00Z") });
    // 2 lb of 100 lb R-22 after 30 days: 2 % × 365/30 = 24.3 % > 20 %. Source: 82.152 annualizing; 82.157(c)(2) [S3]
    const leak = found.find((x) => x.ruleId === "CT-LEAK-01" && x.recordId === f.walkIn);
    expect(leak?.detail).toContain("24.3 %");
  });
});
