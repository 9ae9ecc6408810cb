import { afterEach, beforeEach, describe, expect, it } from "vitest";
import type { JobInput } from "@coldtrail/core";
import { createJob, getJob, listJobs, type ScopeFn } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";
import { contentsOf, jobsFixture, writeCounts, type JobsFixture } from "./jobs-fixture";

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
const orgScope = (): ScopeFn => (qb) => qb.where("jobs.organisation_id", f.org);
const create = (input: JobInput, branchId = f.north) => createJob(t.db, { actor: actor(), branchId, input });

const charge = (over: Partial<Extract<JobInput, { kind: "charge" }>> = {}): JobInput => ({
  kind: "charge",
  applianceId: f.walkIn,
  performedOn: "2026-01-10",
  refrigerant: "R-22",
  chargedAmount: 10,
  chargedUnit: "lb",
  chargeSource: "stock",
  ...over,
});

describe("charge jobs", () => {
  it("a charge from stock writes the job, a movement without a cylinder and an activity row", async () => {
    const id = await create(charge());
    const job = await t.db("jobs").where({ id }).first();
    expect(job).toMatchObject({ kind: "charge", charged_g: 4536, recovered_g: 0, cylinder_id: null, technician_id: f.tech }); // 10 lb = 4,535.92 g
    const movements = await t.db("refrigerant_movements").where({ job_id: id });
    expect(movements).toHaveLength(1);
    expect(movements[0]).toMatchObject({ direction: "charged_from_stock", cylinder_id: null, mass_g: 4536, refrigerant: "R-22" });
    const activity = await t.db("activity").where({ subject_type: "job", subject_id: id }).first();
    expect(activity).toMatchObject({ action: "job.charge.created", summary: "Charged 10.00 lb R-22 into WALK-01" });
  });

  it("the saved charge carries the leak rate the rules core calculates, and a second addition after 180 days exceeds 20 %", async () => {
    const first = await create(charge());
    const detail1 = await getJob(t.db, { scope: orgScope(), id: first });
    // First addition: no earlier one, so 365 days: 10 lb / 100 lb = 10 %.
    // Source: REFERENCE.md §3.1 (annualizing method; first calculation uses 365 days, AIM text, applied to Part 82 by assumption)
    expect(detail1?.leakRate).toMatchObject({ covered: true, threshold: 20, exceeds: false });
    expect(detail1!.leakRate!.percent).toBeCloseTo(10.0, 1);

    const second = await create(charge({ performedOn: "2026-07-09" }));
    const detail2 = await getJob(t.db, { scope: orgScope(), id: second });
    // Source: REFERENCE.md §3.6 E1 — commercial refrigeration, 100 lb, 10 lb added 180 days after the last: 20.2778 % > 20 %
    expect(detail2!.leakRate!.percent).toBeCloseTo(20.278, 1);
    expect(detail2?.leakRate).toMatchObject({ exceeds: true, threshold: 20, repairDueOn: "2026-08-08" }); // Source: 40 CFR 82.157(d) — repair within 30 days
  });

  it("an addition at installation is left out of the leak rate", async () => {
    const id = await create(charge({ additionExclusion: "installation" }));
    const detail = await getJob(t.db, { scope: orgScope(), id });
    expect(detail?.leakRate).toMatchObject({ percent: null, excluded: "installation", exceeds: false });
    expect(detail?.leakRate?.reason).toContain("installation");
  });

  it("a charge from a cylinder draws the cylinder down; more than it holds is refused by field and writes nothing", async () => {
    const id = await create(charge({ chargeSource: "cylinder", cylinderId: f.northR22Cylinder, chargedAmount: 2, chargedUnit: "kg" }));
    expect(await contentsOf(t.db, f.northR22Cylinder)).toEqual({ contents_g: 3000, refrigerant: "R-22" });
    expect(await t.db("refrigerant_movements").where({ job_id: id }).first()).toMatchObject({
      direction: "charged_from_cylinder",
      cylinder_id: f.northR22Cylinder,
      mass_g: 2000,
    });
    const detail = await getJob(t.db, { scope: orgScope(), id });
    expect(detail?.chargeSource).toBe("cylinder");

    const before = await writeCounts(t.db);
    await expect(
      create(charge({ chargeSource: "cylinder", cylinderId: f.northR22Cylinder, chargedAmount: 4, chargedUnit: "kg" })),
    ).rejects.toMatchObject({
      code: "conflict",
      field: "chargedAmount",
    });
    expect(await writeCounts(t.db)).toEqual(before);
    expect(await contentsOf(t.db, f.northR22Cylinder)).toEqual({ contents_g: 3000, refrigerant: "R-22" });
  });

  it("refuses to charge from a cylinder that holds another refrigerant", async () => {
    await expect(
      create(charge({ applianceId: f.rooftop, refrigerant: "R-410A", chargeSource: "cylinder", cylinderId: f.northR22Cylinder })),
    ).rejects.toMatchObject({
      code: "conflict",
      field: "cylinderId",
    });
  });

  it("refuses a charge on a retired appliance", async () => {
    await expect(create(charge({ applianceId: f.retiredSplit, refrigerant: "R-410A" }))).rejects.toMatchObject({
      code: "conflict",
      field: "applianceId",
    });
  });
});

describe("leak repairs and verification tests", () => {
  it("a leak repair keeps where the leak was and what was repaired", async () => {
    const id = await create({
      kind: "leak_repair",
      applianceId: f.walkIn,
      performedOn: "2026-02-01",
      leakLocation: "Evaporator return bend",
      repairDescription: "Brazed the return bend",
      shutdownNeeded: false,
    });
    expect(await t.db("jobs").where({ id }).first()).toMatchObject({
      kind: "leak_repair",
      leak_location: "Evaporator return bend",
      repair_description: "Brazed the return bend",
      charged_g: 0,
      recovered_g: 0,
    });
    expect(await t.db("refrigerant_movements").where({ job_id: id })).toHaveLength(0);
    expect((await t.db("activity").where({ subject_type: "job", subject_id: id }).first()).summary).toBe(
      "Repaired a leak on WALK-01: Evaporator return bend",
    );
  });

  it("a verification test links to the latest repair on or before its date, or to the repair named", async () => {
    const early = await create({
      kind: "leak_repair",
      applianceId: f.walkIn,
      performedOn: "2026-02-01",
      leakLocation: "A",
      repairDescription: "A",
    });
    const late = await create({
      kind: "leak_repair",
      applianceId: f.walkIn,
      performedOn: "2026-03-01",
      leakLocation: "B",
      repairDescription: "B",
    });
    const auto = await create({
      kind: "verification_test",
      applianceId: f.walkIn,
      performedOn: "2026-03-01",
      verificationStage: "initial",
      verificationPassed: true,
      verificationMethod: "Bubble test",
    });
    expect(await t.db("jobs").where({ id: auto }).first()).toMatchObject({
      related_job_id: late,
      verification_stage: "initial",
      verification_method: "Bubble test",
    });
    const named = await create({
      kind: "verification_test",
      applianceId: f.walkIn,
      performedOn: "2026-03-05",
      verificationStage: "follow_up",
      verificationPassed: false,
      verificationMethod: "Electronic detector",
      relatedJobId: early,
    });
    expect(await t.db("jobs").where({ id: named }).first()).toMatchObject({ related_job_id: early });
    expect((await t.db("activity").where({ subject_type: "job", subject_id: named }).first()).summary).toBe(
      "Follow-up verification test failed on WALK-01",
    );
  });

  it("refuses a repair of another appliance as the one tested", async () => {
    const other = await create({
      kind: "leak_repair",
      applianceId: f.rooftop,
      performedOn: "2026-02-01",
      leakLocation: "A",
      repairDescription: "A",
    });
    await expect(
      create({
        kind: "verification_test",
        applianceId: f.walkIn,
        performedOn: "2026-03-01",
        verificationStage: "initial",
        verificationPassed: true,
        verificationMethod: "x",
        relatedJobId: other,
      }),
    ).rejects.toMatchObject({ code: "not_found", field: "relatedJobId" });
  });
});

describe("disposal jobs", () => {
  const disposal = (over: Partial<Extract<JobInput, { kind: "disposal" }>> = {}): JobInput => ({
    kind: "disposal",
    applianceId: f.rooftop,
    performedOn: "2026-04-02",
    refrigerant: "R-410A",
    recoveredAmount: 8.5,
    recoveredUnit: "kg",
    cylinderId: f.northCylinder,
    equipmentId: f.northEquipment,
    evacuationValue: 0,
    evacuationUnit: "psig",
    accessMethod: "service_valve",
    disposalPath: "on_site",
    ...over,
  });

  it("recovers into the cylinder and marks the appliance disposed", async () => {
    const id = await create(disposal());
    expect(await contentsOf(t.db, f.northCylinder)).toEqual({ contents_g: 8500, refrigerant: "R-410A" });
    expect(await t.db("appliances").where({ id: f.rooftop }).first("status", "disposed_on", "retired_on")).toEqual({
      status: "disposed",
      disposed_on: "2026-04-02",
      retired_on: "2026-04-02",
    });
    const activity = await t.db("activity").where({ subject_type: "job", subject_id: id }).first();
    expect(activity.action).toBe("job.disposal.created");
    expect(JSON.parse(activity.data)).toMatchObject({ previousApplianceStatus: "in_service" });
  });

  it("refuses a second disposal of the same appliance and writes nothing", async () => {
    await create(disposal());
    const before = await writeCounts(t.db);
    await expect(create(disposal({ cylinderId: f.northCylinder2 }))).rejects.toMatchObject({ code: "conflict", field: "applianceId" });
    expect(await writeCounts(t.db)).toEqual(before);
    expect((await contentsOf(t.db, f.northCylinder2)).contents_g).toBe(0);
  });

  it("every kind lists, and the kind filter finds each", async () => {
    await create(charge());
    await create({ kind: "leak_repair", applianceId: f.walkIn, performedOn: "2026-02-01", leakLocation: "A", repairDescription: "A" });
    await create({
      kind: "verification_test",
      applianceId: f.walkIn,
      performedOn: "2026-02-01",
      verificationStage: "initial",
      verificationPassed: true,
      verificationMethod: "x",
    });
    await create(disposal());
    for (const kind of ["charge", "leak_repair", "verification_test", "disposal"] as const) {
      const page = await listJobs(t.db, { scope: orgScope(), query: { page: 1, pageSize: 25, sort: "performedOn", dir: "desc", kind } });
      expect(page.total, kind).toBe(1);
      expect(page.rows[0]!.kind).toBe(kind);
    }
  });
});
