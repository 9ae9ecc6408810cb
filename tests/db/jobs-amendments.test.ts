import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { jobAmendmentInput, type JobInput } from "@coldtrail/core";
import { amendJob, createJob, createShipment, getJob, listJobs, voidJob, type ScopeFn } from "@coldtrail/db";
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
const recovery = (over: Partial<Extract<JobInput, { kind: "recovery" }>> = {}): JobInput => ({
  kind: "recovery",
  applianceId: f.rooftop,
  performedOn: "2026-03-14",
  refrigerant: "R-410A",
  recoveredAmount: 5,
  recoveredUnit: "kg",
  cylinderId: f.northCylinder,
  equipmentId: f.northEquipment,
  evacuationValue: 0,
  evacuationUnit: "psig",
  accessMethod: "service_valve",
  ...over,
});
const create = (input: JobInput) => createJob(t.db, { actor: actor(), branchId: f.north, input });
/** Amendments go through the same schema as the route. */
const amend = (id: number, body: { reason: string; changes: Record<string, unknown> }) =>
  amendJob(t.db, { actor: actor(), id, input: jobAmendmentInput.parse(body) });

describe("amending a job", () => {
  it("a corrected amount replaces the movement and moves the cylinder contents, with the previous value in the history", async () => {
    const id = await create(recovery());
    expect((await contentsOf(t.db, f.northCylinder)).contents_g).toBe(5000);
    await amend(id, { reason: "Scale ticket says 4.2 kg", changes: { amount: 4.2, amountUnit: "kg" } });

    expect((await t.db("jobs").where({ id }).first()).recovered_g).toBe(4200);
    expect(await contentsOf(t.db, f.northCylinder)).toEqual({ contents_g: 4200, refrigerant: "R-410A" });
    const movements = await t.db("refrigerant_movements").where({ job_id: id }).orderBy("id");
    expect(movements.map((m) => [m.mass_g, m.voided_at === null])).toEqual([
      [5000, false],
      [4200, true],
    ]);
    const detail = await getJob(t.db, { scope: orgScope(), id });
    expect(detail?.movements.map((m) => m.massG)).toEqual([4200]);
    expect(detail?.amendments).toHaveLength(1);
    expect(detail?.amendments[0]).toMatchObject({
      reason: "Scale ticket says 4.2 kg",
      previous: { recovered_g: 5000 },
      next: { recovered_g: 4200 },
      actorName: "Fixture Tech",
    });
    const activity = await t.db("activity").where({ subject_type: "Job", subject_id: id, action: "job.amended" }).first();
    expect(activity.summary).toBe(`Corrected the amount recovered of job #${id} on RTU-07`);
  });

  it("a corrected cylinder takes the refrigerant out of one cylinder and puts it in the other", async () => {
    const id = await create(recovery());
    await amend(id, { reason: "Wrong cylinder picked", changes: { cylinderId: f.northCylinder2 } });
    expect(await contentsOf(t.db, f.northCylinder)).toEqual({ contents_g: 0, refrigerant: null });
    expect(await contentsOf(t.db, f.northCylinder2)).toEqual({ contents_g: 5000, refrigerant: "R-410A" });
    expect((await t.db("jobs").where({ id }).first()).cylinder_id).toBe(f.northCylinder2);
  });

  it("a charge from a cylinder corrected upwards draws more from the cylinder", async () => {
    const id = await create({
      kind: "charge",
      applianceId: f.walkIn,
      performedOn: "2026-03-01",
      refrigerant: "R-22",
      chargedAmount: 1,
      chargedUnit: "kg",
      chargeSource: "cylinder",
      cylinderId: f.northR22Cylinder,
    });
    expect((await contentsOf(t.db, f.northR22Cylinder)).contents_g).toBe(4000);
    await amend(id, { reason: "Added a second kilogram", changes: { amount: 2, amountUnit: "kg" } });
    expect((await contentsOf(t.db, f.northR22Cylinder)).contents_g).toBe(3000);
    expect((await t.db("jobs").where({ id }).first()).charged_g).toBe(2000);
  });

  it("refuses to move a charge onto a cylinder that does not hold its refrigerant", async () => {
    const id = await create({
      kind: "charge",
      applianceId: f.walkIn,
      performedOn: "2026-03-01",
      refrigerant: "R-22",
      chargedAmount: 1,
      chargedUnit: "kg",
      chargeSource: "cylinder",
      cylinderId: f.northR22Cylinder,
    });
    const before = await writeCounts(t.db);
    await expect(amend(id, { reason: "Other cylinder", changes: { cylinderId: f.northCylinder } })).rejects.toMatchObject({
      code: "conflict",
      field: "changes.cylinderId",
    });
    expect(await writeCounts(t.db)).toEqual(before);
    expect((await contentsOf(t.db, f.northR22Cylinder)).contents_g).toBe(4000);
  });

  it("refuses a correction the cylinder's later history cannot absorb, and changes nothing", async () => {
    const id = await create(recovery());
    await createShipment(t.db, {
      actor: { userId: f.manager, organisationId: f.org },
      input: { branchId: f.north, shippedOn: "2026-03-31", reclaimerName: "Invented Reclaim Co", cylinderIds: [f.northCylinder] },
    });
    const before = await writeCounts(t.db);
    await expect(amend(id, { reason: "Less than we thought", changes: { amount: 1, amountUnit: "kg" } })).rejects.toMatchObject({
      code: "conflict",
      field: "changes.amount",
    });
    expect(await writeCounts(t.db)).toEqual(before);
    expect((await t.db("jobs").where({ id }).first()).recovered_g).toBe(5000);
    expect((await contentsOf(t.db, f.northCylinder)).contents_g).toBe(0);
  });

  it("refuses a field the kind does not have, a change that changes nothing, and a missing reason", async () => {
    const id = await create(recovery());
    await expect(amend(id, { reason: "Typo", changes: { leakLocation: "Somewhere" } })).rejects.toMatchObject({
      code: "invalid",
      field: "changes.leakLocation",
    });
    await expect(amend(id, { reason: "Same again", changes: { evacuationValue: 0 } })).rejects.toMatchObject({ code: "invalid" });
    expect(() => jobAmendmentInput.parse({ reason: " ", changes: { notes: "x" } })).toThrow();
    expect(await t.db("amendments").count({ n: "*" }).first()).toMatchObject({ n: 0 });
  });

  it("a temporary access device must be said removed or left when the access is corrected to one", async () => {
    const id = await create(recovery());
    await expect(amend(id, { reason: "Used pliers", changes: { accessMethod: "piercing_pliers" } })).rejects.toMatchObject({
      field: "changes.temporaryAccessRemoved",
    });
    await amend(id, { reason: "Used pliers", changes: { accessMethod: "piercing_pliers", temporaryAccessRemoved: true } });
    expect((await t.db("jobs").where({ id }).first()).access_method).toBe("piercing_pliers");
  });

  it("a date correction moves the movement's date too", async () => {
    const id = await create(recovery());
    await amend(id, { reason: "Done the day before", changes: { performedOn: "2026-03-13" } });
    const live = await t.db("refrigerant_movements").where({ job_id: id }).whereNull("voided_at");
    expect(live.map((m) => m.moved_on)).toEqual(["2026-03-13"]);
    expect((await contentsOf(t.db, f.northCylinder)).contents_g).toBe(5000);
  });
});

describe("voiding a job", () => {
  it("keeps the row with its reason, voids its movements and takes the refrigerant back out of the cylinder", async () => {
    const id = await create(recovery());
    await voidJob(t.db, { actor: actor(), id, reason: "Logged on the wrong unit" });
    const row = await t.db("jobs").where({ id }).first();
    expect(row).toMatchObject({ void_reason: "Logged on the wrong unit", voided_by: f.tech });
    expect(row.voided_at).toBeTruthy();
    expect(await contentsOf(t.db, f.northCylinder)).toEqual({ contents_g: 0, refrigerant: null });
    expect((await t.db("refrigerant_movements").where({ job_id: id }).whereNull("voided_at")).length).toBe(0);
    await expect(amend(id, { reason: "Too late", changes: { notes: "x" } })).rejects.toMatchObject({ code: "conflict" });
    await expect(voidJob(t.db, { actor: actor(), id, reason: "again" })).rejects.toMatchObject({ code: "conflict" });
  });

  it("the list leaves voided jobs out unless a filter asks for them", async () => {
    const kept = await create(recovery());
    const voided = await create(recovery({ cylinderId: f.northCylinder2 }));
    await voidJob(t.db, { actor: actor(), id: voided, reason: "Duplicate entry" });
    const q = { page: 1, pageSize: 25, sort: "performedOn" as const, dir: "desc" as const };
    expect((await listJobs(t.db, { scope: orgScope(), query: q })).rows.map((r) => r.id)).toEqual([kept]);
    expect((await listJobs(t.db, { scope: orgScope(), query: { ...q, voided: "only" } })).rows.map((r) => r.id)).toEqual([voided]);
    expect((await listJobs(t.db, { scope: orgScope(), query: { ...q, voided: "include" } })).total).toBe(2);
  });

  it("voiding a disposal gives the appliance back its earlier status", async () => {
    const id = await create({
      ...recovery({ applianceId: f.retiredSplit, recoveredAmount: 3 }),
      kind: "disposal",
      disposalPath: "shop",
    } as JobInput);
    expect((await t.db("appliances").where({ id: f.retiredSplit }).first()).status).toBe("disposed");
    await voidJob(t.db, { actor: actor(), id, reason: "Unit was not scrapped after all" });
    expect(await t.db("appliances").where({ id: f.retiredSplit }).first("status", "disposed_on")).toEqual({
      status: "retired",
      disposed_on: null,
    });
  });
});
