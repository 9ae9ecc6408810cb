import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  cylinderInput,
  cylinderListQuery,
  cylinderUpdateInput,
  cylinderWeighingAmendInput,
  cylinderWeighingInput,
  defineAbilityFor,
} from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  amendCylinderWeighing,
  createCylinder,
  getCylinder,
  listCylinderAmendments,
  listCylinderMovements,
  listCylinderWeighings,
  listCylinders,
  loadActor,
  recordCylinderWeighing,
  scopeByAbility,
  updateCylinder,
  voidCylinderWeighing,
  type Knex,
  type QueryScope,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

let t: TestDb;
let actor: { userId: number; organisationId: number };
let scope: QueryScope;
let jobScope: QueryScope;
let columbus: number;
const NOW = new Date("2026-11-30T15:00:00Z");
const count = async (db: Knex, table: string) => Number((await db(table).count({ n: "*" }).first())!.n);

const newCylinder = (over: Record<string, unknown> = {}) =>
  cylinderInput.parse({
    branchId: columbus,
    serial: "REG-C-0142",
    specification: "dot 4ba400",
    waterCapacityAmount: "50",
    waterCapacityUnit: "lb",
    tareAmount: "17.5",
    tareUnit: "lb",
    lastRequalifiedOn: "2022-03-01",
    ...over,
  });

beforeAll(async () => {
  t = await createSeededTestDb();
  const manager = await loadActor(t.db, Number((await t.db("users").where({ email: DEMO_SIGN_INS.branch_manager }).first("id")).id));
  actor = { userId: manager!.userId, organisationId: manager!.organisationId };
  const ability = defineAbilityFor(manager!, NOW);
  scope = scopeByAbility(ability, "read", "Cylinder", "cylinders");
  jobScope = scopeByAbility(ability, "read", "Job", "jobs");
  columbus = Number((await t.db("branches").where({ code: "COL" }).first("id")).id);
}, 120_000);
afterAll(async () => {
  await t?.destroy();
});

describe("a new cylinder", () => {
  it("is stored in grams, empty, with its activity, and shows its requalification due date", async () => {
    const id = await createCylinder(t.db, { actor, input: newCylinder(), now: NOW });
    const row = await t.db("cylinders").where({ id }).first();
    // 50 lb = 22,679.6 g → 22,680 g; 17.5 lb = 7,937.87 g → 7,938 g.
    expect(row).toMatchObject({ water_capacity_g: 22680, tare_g: 7938, contents_g: 0, refrigerant: null, specification: "DOT-4BA400" });
    expect(await t.db("activity").where({ subject_type: "Cylinder", subject_id: id, action: "cylinder.created" }).first()).toBeTruthy();
    const c = await getCylinder(t.db, { scope, id, now: NOW });
    // Five years after the last test by default (49 CFR 180.209; organisation setting).
    expect(c!.requalification).toMatchObject({ dueOn: "2027-03-01", state: "current", years: 5 });
    expect(c!.fill).toBeNull();
    expect(c!.netG).toBe(0);
  });

  it("refuses a duplicate serial and an impossible size, writing nothing", async () => {
    const before = await count(t.db, "cylinders");
    await expect(createCylinder(t.db, { actor, input: newCylinder({ serial: "reg-c-0142" }) })).rejects.toMatchObject({
      code: "conflict",
      field: "serial",
    });
    const tooBig = cylinderInput.safeParse({
      ...newCylinder(),
      serial: "REG-C-9",
      waterCapacityAmount: 5,
      waterCapacityUnit: "g" as const,
      tareAmount: 5000,
      tareUnit: "kg" as const,
    });
    expect(tooBig.success).toBe(false);
    expect(tooBig.error!.issues.map((i) => i.path.join("."))).toContain("tareAmount");
    const missing = cylinderInput.safeParse({ ...newCylinder(), tareAmount: "" });
    expect(missing.error!.issues[0]).toMatchObject({ path: ["tareAmount"], message: "Enter the tare weight stamped on the cylinder (TW)" });
    expect(await count(t.db, "cylinders")).toBe(before);
  });
});

describe("weighings", () => {
  it("a scale reading gives the net contents, the fill against the maximum and a history", async () => {
    const id = await createCylinder(t.db, { actor, input: newCylinder({ serial: "REG-C-0200" }), now: NOW });
    const w = await recordCylinderWeighing(t.db, {
      actor,
      cylinderId: id,
      input: cylinderWeighingInput.parse({
        weighedOn: "2026-11-20",
        grossAmount: "30",
        grossUnit: "lb",
        refrigerant: "r410a",
        temperatureValue: "77",
        temperatureUnit: "F",
      }),
      now: NOW,
    });
    // 30 lb = 13,608 g on the scale; minus the 7,938 g tare = 5,670 g net.
    expect(w.netG).toBe(5670);
    const stored = await t.db("cylinder_weighings").where({ id: w.id }).first();
    expect(stored).toMatchObject({ gross_g: 13608, net_g: 5670, refrigerant: "R-410A", temperature_c: 25 });
    const c = (await getCylinder(t.db, { scope, id, now: NOW }))!;
    expect(c).toMatchObject({ netG: 5670, netSource: "weighing", refrigerant: "R-410A", recordedContentsG: 0 });
    // AHRI Guideline K: 80 % of 22,680 g WC × SG(R-410A, 77 °F) — the rules core computes it.
    expect(c.fill!.basis).toBe("sg_77f");
    expect(c.fill!.maxNetG).toBeGreaterThan(5670);
    expect(c.fill!.percent).toBeCloseTo((5670 / c.fill!.maxNetG) * 100, 6);
    expect(c.fill!.remainingG).toBe(c.fill!.maxGrossG - 13608);
  });

  it("a reading lighter than the empty cylinder is refused on its field and writes nothing", async () => {
    const id = Number((await t.db("cylinders").where({ serial: "REG-C-0200" }).first("id")).id);
    const before = { weighings: await count(t.db, "cylinder_weighings"), activity: await count(t.db, "activity") };
    await expect(
      recordCylinderWeighing(t.db, {
        actor,
        cylinderId: id,
        input: cylinderWeighingInput.parse({ weighedOn: "2026-11-21", grossAmount: "10", grossUnit: "lb" }),
      }),
    ).rejects.toMatchObject({ code: "invalid", field: "grossAmount" });
    await expect(
      recordCylinderWeighing(t.db, {
        actor,
        cylinderId: (await t.db("cylinders").where({ serial: "REG-C-0142" }).first("id")).id,
        input: cylinderWeighingInput.parse({ weighedOn: "2026-11-21", grossAmount: "25", grossUnit: "lb" }),
      }),
    ).rejects.toMatchObject({ code: "invalid", field: "refrigerant" });
    expect(await count(t.db, "cylinder_weighings")).toBe(before.weighings);
    expect(await count(t.db, "activity")).toBe(before.activity);
  });

  it("is corrected by amendment and voided with a reason, never overwritten silently", async () => {
    const id = Number((await t.db("cylinders").where({ serial: "REG-C-0200" }).first("id")).id);
    const [weighing] = (await listCylinderWeighings(t.db, { cylinderId: id, query: { page: 1, pageSize: 10, dir: "desc" } })).rows;
    await expect(
      amendCylinderWeighing(t.db, {
        actor,
        cylinderId: id,
        weighingId: weighing!.id,
        input: {
          ...cylinderWeighingAmendInput.parse({ weighedOn: "2026-11-20", grossAmount: "31", grossUnit: "lb", reason: "placeholder" }),
          reason: " ",
        },
      }),
    ).rejects.toMatchObject({ field: "reason" });
    await amendCylinderWeighing(t.db, {
      actor,
      cylinderId: id,
      weighingId: weighing!.id,
      input: cylinderWeighingAmendInput.parse({
        weighedOn: "2026-11-20",
        grossAmount: "31",
        grossUnit: "lb",
        refrigerant: "R-410A",
        temperatureValue: "25",
        temperatureUnit: "C",
        reason: "Scale was not zeroed",
      }),
    });
    const history = await listCylinderAmendments(t.db, { organisationId: actor.organisationId, cylinderId: id });
    // 31 lb = 14,061 g → 6,123 g net.
    expect(history[0]).toMatchObject({
      subjectType: "CylinderWeighing",
      subjectId: weighing!.id,
      reason: "Scale was not zeroed",
      previous: { gross_g: 13608, net_g: 5670 },
      next: { gross_g: 14061, net_g: 6123 },
    });
    expect((await getCylinder(t.db, { scope, id, now: NOW }))!.netG).toBe(6123);

    await voidCylinderWeighing(t.db, { actor, cylinderId: id, weighingId: weighing!.id, reason: "Weighed the wrong cylinder" });
    const listed = await listCylinderWeighings(t.db, { cylinderId: id, query: { page: 1, pageSize: 10, dir: "desc" } });
    expect(listed.rows[0]).toMatchObject({ id: weighing!.id, voidReason: "Weighed the wrong cylinder", amendmentCount: 1 });
    expect(listed.rows[0]!.voidedAt).not.toBeNull();
    const after = (await getCylinder(t.db, { scope, id, now: NOW }))!;
    expect(after).toMatchObject({ netG: 0, netSource: "records", lastWeighing: null });
    await expect(
      amendCylinderWeighing(t.db, {
        actor,
        cylinderId: id,
        weighingId: weighing!.id,
        input: cylinderWeighingAmendInput.parse({
          weighedOn: "2026-11-20",
          grossAmount: "32",
          grossUnit: "lb",
          refrigerant: "R-410A",
          reason: "Again",
        }),
      }),
    ).rejects.toMatchObject({ code: "conflict" });
  });

  it("on the day of a movement, the weighing counts only if it was recorded after the movement", async () => {
    const owner = await loadActor(t.db, Number((await t.db("users").where({ email: DEMO_SIGN_INS.owner }).first("id")).id));
    const ownerScope = scopeByAbility(defineAbilityFor(owner!, NOW), "read", "Cylinder", "cylinders");
    // Demo: COL-C-001 was weighed before its shipment for reclaim on the same day; it is empty now.
    const shippedId = Number((await t.db("cylinders").where({ serial: "COL-C-001" }).first("id")).id);
    const shipped = (await getCylinder(t.db, { scope: ownerScope, id: shippedId, now: NOW }))!;
    expect(shipped.lastWeighing!.on).toBe(shipped.lastMovementOn);
    expect(shipped).toMatchObject({ netSource: "records", netG: shipped.recordedContentsG });
    // Weighed later the same day: the reading is the latest word.
    const w = await recordCylinderWeighing(t.db, {
      actor: { userId: owner!.userId, organisationId: 1 },
      cylinderId: shippedId,
      input: cylinderWeighingInput.parse({
        weighedOn: shipped.lastMovementOn!,
        grossAmount: shipped.tareG + 250,
        grossUnit: "g",
        refrigerant: "R-410A",
      }),
      now: NOW,
    });
    expect((await getCylinder(t.db, { scope: ownerScope, id: shippedId, now: NOW }))!).toMatchObject({ netSource: "weighing", netG: 250 });
    await voidCylinderWeighing(t.db, {
      actor: { userId: owner!.userId, organisationId: 1 },
      cylinderId: shippedId,
      weighingId: w.id,
      reason: "Test reading",
    });
  });

  it("a weighing older than the last movement does not hide the recorded contents", async () => {
    const overfilled = (await getCylinder(t.db, {
      scope: scopeByAbility(defineAbilityFor((await loadActor(t.db, 1))!), "read", "Cylinder", "cylinders"),
      id: Number((await t.db("cylinders").where({ serial: "TUC-C-905" }).first("id")).id),
      now: NOW,
    }))!;
    // Demo gap G05: 21.9 kg R-410A in a 50 lb WC cylinder, over the maximum fill.
    expect(overfilled.netSource).toBe("records");
    expect(overfilled.netG).toBe(21900);
    expect(overfilled.fill!.percent).toBeGreaterThan(100);
    expect(overfilled.fill!.remainingG).toBeLessThan(0);
  });
});

describe("editing a cylinder", () => {
  const edit = async (id: number, over: Record<string, unknown>) => {
    const c = await t.db("cylinders").where({ id }).first();
    return cylinderUpdateInput.parse({
      serial: c.serial,
      specification: c.specification ?? "",
      purpose: c.purpose,
      waterCapacityAmount: c.water_capacity_g,
      waterCapacityUnit: "g",
      tareAmount: c.tare_g,
      tareUnit: "g",
      lastRequalifiedOn: c.last_requalified_on ?? "",
      status: c.status,
      ...over,
    });
  };

  it("a new tare or requalification date needs a reason and is kept as an amendment", async () => {
    const id = Number((await t.db("cylinders").where({ serial: "REG-C-0142" }).first("id")).id);
    await expect(updateCylinder(t.db, { actor, id, input: await edit(id, { lastRequalifiedOn: "2026-10-01" }) })).rejects.toMatchObject({
      field: "reason",
    });
    const res = await updateCylinder(t.db, {
      actor,
      id,
      input: await edit(id, { lastRequalifiedOn: "2026-10-01", reason: "Retested at the test station" }),
    });
    expect(res.changed).toEqual(["last_requalified_on"]);
    const c = (await getCylinder(t.db, { scope, id, now: NOW }))!;
    expect(c.requalification.dueOn).toBe("2031-10-01");
    const history = await listCylinderAmendments(t.db, { organisationId: actor.organisationId, cylinderId: id });
    expect(history[0]).toMatchObject({
      subjectType: "Cylinder",
      previous: { last_requalified_on: "2022-03-01" },
      next: { last_requalified_on: "2026-10-01" },
    });
  });

  it("retiring a cylinder changes its status with an activity row; it stays in the register", async () => {
    const id = Number((await t.db("cylinders").where({ serial: "REG-C-0142" }).first("id")).id);
    const res = await updateCylinder(t.db, { actor, id, input: await edit(id, { status: "retired" }) });
    expect(res).toEqual({ amendmentId: null, changed: ["status"] });
    const activity = await t
      .db("activity")
      .where({ subject_type: "Cylinder", subject_id: id, action: "cylinder.updated" })
      .orderBy("id", "desc")
      .first();
    expect(activity.summary).toContain("In service → Retired");
    const retired = await listCylinders(t.db, {
      scope,
      organisationId: actor.organisationId,
      query: cylinderListQuery.parse({ status: "retired", q: "REG-C-0142" }),
    });
    expect(retired.rows.map((r) => r.id)).toEqual([id]);
  });
});

describe("listing cylinders", () => {
  it("the requalification filter splits the register the way each row's state says (branch time zone)", async () => {
    const owner = await loadActor(t.db, Number((await t.db("users").where({ email: DEMO_SIGN_INS.owner }).first("id")).id));
    const ownerScope = scopeByAbility(defineAbilityFor(owner!, NOW), "read", "Cylinder", "cylinders");
    const all = await listCylinders(t.db, {
      scope: ownerScope,
      organisationId: 1,
      query: cylinderListQuery.parse({ pageSize: 200 }),
      now: NOW,
    });
    let sum = 0;
    for (const state of ["overdue", "due_soon", "current", "unknown"] as const) {
      const part = await listCylinders(t.db, {
        scope: ownerScope,
        organisationId: 1,
        query: cylinderListQuery.parse({ requalification: state, pageSize: 200 }),
        now: NOW,
      });
      expect(
        part.rows.every((r) => r.requalification.state === state),
        state,
      ).toBe(true);
      sum += part.total;
    }
    expect(sum).toBe(all.total);
    const overdue = await listCylinders(t.db, {
      scope: ownerScope,
      organisationId: 1,
      query: cylinderListQuery.parse({ requalification: "overdue" }),
      now: NOW,
    });
    // Demo gap G06: PIA-C-906 last requalified 2020-02-18, due 2025-02-18.
    expect(overdue.rows.map((r) => r.serial)).toContain("PIA-C-906");
  });

  it("the strict 130 °F setting lowers every maximum fill", async () => {
    const id = Number((await t.db("cylinders").where({ serial: "TUC-C-905" }).first("id")).id);
    const owner = await loadActor(t.db, Number((await t.db("users").where({ email: DEMO_SIGN_INS.owner }).first("id")).id));
    const ownerScope = scopeByAbility(defineAbilityFor(owner!, NOW), "read", "Cylinder", "cylinders");
    const before = (await getCylinder(t.db, { scope: ownerScope, id, now: NOW }))!.fill!;
    const settings = await t.db("organisations").where({ id: 1 }).first("settings");
    await t
      .db("organisations")
      .where({ id: 1 })
      .update({ settings: JSON.stringify({ ...JSON.parse(settings.settings), strictFill130F: true }) });
    const strict = (await getCylinder(t.db, { scope: ownerScope, id, now: NOW }))!.fill!;
    await t.db("organisations").where({ id: 1 }).update({ settings: settings.settings });
    expect(strict.basis).toBe("sg_130f");
    expect(strict.maxNetG).toBeLessThan(before.maxNetG);
  });

  it("movements name only the jobs the reader may read", async () => {
    const id = Number((await t.db("cylinders").where({ serial: "COL-C-907" }).first("id")).id);
    const page = await listCylinderMovements(t.db, { cylinderId: id, jobScope, query: { page: 1, pageSize: 50, dir: "asc" } });
    expect(page.total).toBeGreaterThan(0);
    expect(page.rows.some((r) => r.jobId !== null && r.applianceTag !== null)).toBe(true);
    const nobody = scopeByAbility(
      defineAbilityFor({ userId: 1, organisationId: 1, name: "x", email: "x@x.example", memberships: [], inspectorGrants: [] }),
      "read",
      "Job",
      "jobs",
    );
    const hidden = await listCylinderMovements(t.db, { cylinderId: id, jobScope: nobody, query: { page: 1, pageSize: 50, dir: "asc" } });
    expect(hidden.rows.every((r) => r.jobId === null && r.applianceTag === null)).toBe(true);
  });
});
