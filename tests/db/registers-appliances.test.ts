import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applianceInput, applianceListQuery, applianceUpdateInput, defineAbilityFor, type ApplianceInput } from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  changeApplianceStatus,
  createAppliance,
  getAppliance,
  listAmendments,
  listApplianceJobs,
  listAppliances,
  loadActor,
  reviewApplianceLeaks,
  scopeByAbility,
  updateAppliance,
  type Knex,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

let t: TestDb;
let actor: { userId: number; organisationId: number };
let columbus: number;
let denver: number;
const NOW = new Date("2026-11-30T15:00:00Z");

const count = async (db: Knex, table: string, where: Record<string, unknown> = {}) =>
  Number((await db(table).where(where).count({ n: "*" }).first())!.n);

const baseInput = (over: Record<string, unknown> = {}): ApplianceInput =>
  applianceInput.parse({
    branchId: columbus,
    siteChoice: "new",
    newSiteName: "Harrow Lane bakery",
    newSiteAddress: "14 Harrow Lane",
    customerChoice: "new",
    newCustomerName: "Harrow Lane Bakers",
    tag: "REG-RTU-01",
    description: "Rooftop unit over the ovens",
    category: "packaged_rooftop",
    refrigerant: "r410a",
    fullChargeAmount: "18.5",
    fullChargeUnit: "lb",
    fullChargeMethod: "nameplate",
    factorySealed: false,
    ...over,
  });

beforeAll(async () => {
  t = await createSeededTestDb();
  const manager = await t.db("users").where({ email: DEMO_SIGN_INS.branch_manager }).first("id", "organisation_id");
  actor = { userId: Number(manager.id), organisationId: Number(manager.organisation_id) };
  columbus = Number((await t.db("branches").where({ code: "COL" }).first("id")).id);
  denver = Number((await t.db("branches").where({ code: "DEN" }).first("id")).id);
}, 120_000);
afterAll(async () => {
  await t?.destroy();
});

describe("the appliance input schema", () => {
  it("normalises the refrigerant and refuses what no appliance can be", () => {
    expect(baseInput().refrigerant).toBe("R-410A");
    const unknown = applianceInput.safeParse({ ...baseInput(), refrigerant: "R-999X" });
    expect(unknown.success).toBe(false);
    expect(unknown.error!.issues[0]!.path).toEqual(["refrigerant"]);
    // Source: 40 CFR 82.152 "small appliance": factory-sealed, 5 lb or less.
    const big = applianceInput.safeParse({
      ...baseInput(),
      category: "small_appliance",
      factorySealed: true,
      fullChargeAmount: 6,
      fullChargeUnit: "lb",
    });
    expect(big.success).toBe(false);
    expect(big.error!.issues.map((i) => i.path.join("."))).toContain("fullChargeAmount");
    const fieldCharged = applianceInput.safeParse({
      ...baseInput(),
      category: "small_appliance",
      factorySealed: false,
      fullChargeAmount: 4,
      fullChargeUnit: "lb",
    });
    expect(fieldCharged.error!.issues.map((i) => i.path.join("."))).toContain("factorySealed");
    const empty = applianceInput.safeParse({ ...baseInput(), fullChargeAmount: "" });
    expect(empty.error!.issues.find((i) => i.path[0] === "fullChargeAmount")!.message).toBe("Enter the full charge");
    const noSite = applianceInput.safeParse({ ...baseInput(), siteChoice: "existing", siteId: "" });
    expect(noSite.error!.issues.map((i) => i.path.join("."))).toContain("siteId");
  });
});

describe("adding an appliance", () => {
  it("writes the appliance, its new site and customer, and their activity in one go", async () => {
    const before = {
      sites: await count(t.db, "sites"),
      customers: await count(t.db, "customers"),
      activity: await count(t.db, "activity"),
    };
    const id = await createAppliance(t.db, { actor, input: baseInput(), now: NOW });
    const row = await t.db("appliances").where({ id }).first();
    expect(row).toMatchObject({ tag: "REG-RTU-01", refrigerant: "R-410A", branch_id: columbus, status: "in_service" });
    // 18.5 lb × 453.59237 g/lb = 8391.459 g → 8391 g. Source: exact definition of the pound.
    expect(row.full_charge_g).toBe(8391);
    expect(await count(t.db, "sites")).toBe(before.sites + 1);
    expect(await count(t.db, "customers")).toBe(before.customers + 1);
    const actions = (await t.db("activity").orderBy("id", "desc").limit(3).select("action")).map((a) => a.action).sort();
    expect(actions).toEqual(["appliance.created", "customer.created", "site.created"]);
    expect(await count(t.db, "activity")).toBe(before.activity + 3);

    const manager = await loadActor(t.db, actor.userId);
    const a = await getAppliance(t.db, { scope: scopeByAbility(defineAbilityFor(manager!), "read", "Appliance", "appliances"), id });
    // R-410A is high pressure by the 2004 classes; Type II or Universal covers it (40 CFR 82.161).
    expect(a).toMatchObject({
      pressureClass: "high",
      smallAppliance: false,
      certificationTypes: ["type_ii", "universal"],
      customerName: "Harrow Lane Bakers",
    });
  });

  it("refuses a duplicate tag and a site of another branch, writing nothing", async () => {
    const before = {
      appliances: await count(t.db, "appliances"),
      sites: await count(t.db, "sites"),
      customers: await count(t.db, "customers"),
      activity: await count(t.db, "activity"),
    };
    await expect(createAppliance(t.db, { actor, input: baseInput({ tag: "reg-rtu-01" }) })).rejects.toMatchObject({
      code: "conflict",
      field: "tag",
    });
    const denverSite = await t.db("sites").where({ branch_id: denver }).first("id");
    await expect(
      createAppliance(t.db, { actor, input: baseInput({ tag: "REG-RTU-02", siteChoice: "existing", siteId: denverSite.id }) }),
    ).rejects.toMatchObject({
      code: "conflict",
      field: "siteId",
    });
    expect(await count(t.db, "appliances")).toBe(before.appliances);
    expect(await count(t.db, "sites")).toBe(before.sites);
    expect(await count(t.db, "customers")).toBe(before.customers);
    expect(await count(t.db, "activity")).toBe(before.activity);
  });
});

describe("editing an appliance", () => {
  const edit = async (id: number, over: Record<string, unknown>) => {
    const a = await t.db("appliances").where({ id }).first();
    return applianceUpdateInput.parse({
      siteChoice: "existing",
      siteId: a.site_id,
      customerChoice: "none",
      tag: a.tag,
      description: a.description,
      category: a.category,
      refrigerant: a.refrigerant,
      fullChargeAmount: a.full_charge_g,
      fullChargeUnit: "g",
      fullChargeMethod: a.full_charge_method,
      factorySealed: Boolean(a.factory_sealed),
      ...over,
    });
  };

  it("writes plain changes with an activity row and no amendment", async () => {
    const id = await createAppliance(t.db, { actor, input: baseInput({ tag: "REG-RTU-10" }) });
    const amendments = await count(t.db, "amendments");
    const result = await updateAppliance(t.db, {
      actor,
      id,
      input: await edit(id, { description: "Rooftop unit over the bakery ovens", makeModel: "Invented Air 3000" }),
    });
    expect(result).toEqual({ amendmentId: null, changed: ["description", "make_model"] });
    expect(await count(t.db, "amendments")).toBe(amendments);
    const activity = await t.db("activity").where({ subject_type: "Appliance", subject_id: id, action: "appliance.updated" }).first();
    expect(JSON.parse(activity.data)).toEqual({
      previous: { description: "Rooftop unit over the ovens", make_model: null },
      next: { description: "Rooftop unit over the bakery ovens", make_model: "Invented Air 3000" },
    });
  });

  it("a new full charge is a correction: refused without a reason, kept as an amendment with one", async () => {
    const id = await createAppliance(t.db, { actor, input: baseInput({ tag: "REG-RTU-11" }) });
    await expect(
      updateAppliance(t.db, { actor, id, input: await edit(id, { fullChargeAmount: 21, fullChargeUnit: "lb" }) }),
    ).rejects.toMatchObject({ code: "invalid", field: "reason" });
    expect((await t.db("appliances").where({ id }).first("full_charge_g")).full_charge_g).toBe(8391);

    const result = await updateAppliance(t.db, {
      actor,
      id,
      input: await edit(id, { fullChargeAmount: 21, fullChargeUnit: "lb", reason: "Nameplate read again: 21 lb" }),
    });
    expect(result.amendmentId).toEqual(expect.any(Number));
    const history = await listAmendments(t.db, { organisationId: actor.organisationId, subjectType: "Appliance", subjectId: id });
    expect(history).toHaveLength(1);
    // 21 lb = 9525.44 g → 9525 g.
    expect(history[0]).toMatchObject({
      reason: "Nameplate read again: 21 lb",
      previous: { full_charge_g: 8391 },
      next: { full_charge_g: 9525 },
    });
  });

  it("an unchanged charge sent back in grams changes nothing", async () => {
    const id = await createAppliance(t.db, { actor, input: baseInput({ tag: "REG-RTU-12" }) });
    await expect(updateAppliance(t.db, { actor, id, input: await edit(id, {}) })).rejects.toMatchObject({ code: "invalid" });
  });

  it("status changes keep the date and the reason; the register entry stays", async () => {
    const id = await createAppliance(t.db, { actor, input: baseInput({ tag: "REG-RTU-13", installedOn: "2020-04-01" }) });
    await expect(
      changeApplianceStatus(t.db, { actor, id, input: { status: "in_service", on: "2026-11-01", reason: "Still running" } }),
    ).rejects.toMatchObject({ field: "status" });
    await expect(
      changeApplianceStatus(t.db, { actor, id, input: { status: "retired", on: "2019-01-01", reason: "Wrong date" } }),
    ).rejects.toMatchObject({ field: "on" });
    await changeApplianceStatus(t.db, { actor, id, input: { status: "retired", on: "2026-11-02", reason: "Replaced by a new unit" } });
    await changeApplianceStatus(t.db, { actor, id, input: { status: "disposed", on: "2026-11-20", reason: "Scrapped after recovery" } });
    const row = await t.db("appliances").where({ id }).first("status", "retired_on", "disposed_on");
    expect(row).toEqual({ status: "disposed", retired_on: "2026-11-02", disposed_on: "2026-11-20" });
    const history = await listAmendments(t.db, { organisationId: actor.organisationId, subjectType: "Appliance", subjectId: id });
    expect(history.map((h) => [h.next.status, h.reason])).toEqual([
      ["retired", "Replaced by a new unit"],
      ["disposed", "Scrapped after recovery"],
    ]);
  });
});

describe("listing appliances", () => {
  it("filters, sorts and pages on the server within the scope", async () => {
    const manager = await loadActor(t.db, actor.userId);
    const scope = scopeByAbility(defineAbilityFor(manager!), "read", "Appliance", "appliances");
    const all = await listAppliances(t.db, { scope, query: applianceListQuery.parse({ pageSize: 200 }) });
    expect(all.rows.every((r) => r.branchId === columbus)).toBe(true);
    const chillers = await listAppliances(t.db, {
      scope,
      query: applianceListQuery.parse({ category: "chiller", sort: "fullCharge", dir: "desc", pageSize: 200 }),
    });
    expect(chillers.total).toBeGreaterThan(0);
    expect(chillers.rows.every((r) => r.category === "chiller")).toBe(true);
    const charges = chillers.rows.map((r) => r.fullChargeG);
    expect(charges).toEqual([...charges].sort((a, b) => b - a));
    const r22 = await listAppliances(t.db, { scope, query: applianceListQuery.parse({ refrigerant: "r22", pageSize: 200 }) });
    expect(r22.rows.every((r) => r.refrigerant === "R-22")).toBe(true);
    const found = await listAppliances(t.db, { scope, query: applianceListQuery.parse({ q: "harrow lane" }) });
    expect(found.rows.map((r) => r.tag)).toContain("REG-RTU-01");
    const page2 = await listAppliances(t.db, { scope, query: applianceListQuery.parse({ page: 2, pageSize: 10 }) });
    expect(page2.total).toBe(all.total);
    expect(page2.rows.map((r) => r.id)).toEqual(all.rows.slice(10, 20).map((r) => r.id));
    const disposed = await listAppliances(t.db, { scope, query: applianceListQuery.parse({ status: "disposed", pageSize: 200 }) });
    expect(disposed.rows.map((r) => r.tag)).toContain("REG-RTU-13");
  });
});

describe("leak review of an appliance (rules core on the appliance's records)", () => {
  const idOf = async (tag: string) => Number((await t.db("appliances").where({ tag }).first("id")).id);

  it("an addition over the threshold with no repair leaves the repair deadline open (demo gap G08)", async () => {
    const review = await reviewApplianceLeaks(t.db, { organisationId: 1, applianceId: await idOf("TUC-RACK-908"), now: NOW });
    expect(review.coverage.regime).toBe("us_608_ods");
    const over = review.events.filter((e) => e.exceeds);
    expect(over).toHaveLength(1);
    // 95 kg on a 408.2 kg charge, first addition → 365 days: 23.3 % > 20 % (40 CFR 82.157(c)(2), commercial refrigeration).
    expect(over[0]).toMatchObject({ on: "2026-09-12", threshold: 20 });
    expect(over[0]!.percent!).toBeCloseTo(23.27, 1);
    // Repair within 30 days of finding the leak rate over the threshold. Source: 40 CFR 82.157(d).
    expect(review.deadlines).toEqual([expect.objectContaining({ kind: "repair", dueOn: "2026-10-12", state: "overdue" })]);
  });

  it("a repair without its verification test leaves the initial test open (demo gap G09)", async () => {
    const review = await reviewApplianceLeaks(t.db, { organisationId: 1, applianceId: await idOf("DEN-RACK-909"), now: NOW });
    expect(review.deadlines.map((d) => d.kind)).toEqual(["initial_verification"]);
  });

  it("a chronic leaker is flagged for its report (demo gap G10) and hidden outside a reader's dates", async () => {
    const id = await idOf("PIA-RACK-910");
    const review = await reviewApplianceLeaks(t.db, { organisationId: 1, applianceId: id, now: NOW });
    // ≥ 125 % of the full charge added in 2025; report by 1 March 2026. Source: 40 CFR 82.157(j) (date from memory).
    expect(review.deadlines).toEqual([expect.objectContaining({ kind: "chronic_report", dueOn: "2026-03-01" })]);
    expect(review.events.length).toBe(5);
    const windowed = await reviewApplianceLeaks(t.db, { organisationId: 1, applianceId: id, now: NOW, visibleOn: (d) => d < "2025-05-01" });
    expect(windowed.events.map((e) => e.on)).toEqual(["2025-02-11", "2025-04-15"]);
    expect(windowed.deadlines).toEqual([]);
  });

  it("an appliance no leak-repair rule covers shows why, with no deadlines", async () => {
    const id = await createAppliance(t.db, {
      actor,
      input: baseInput({ tag: "REG-SPLIT-20", category: "residential_split", fullChargeAmount: 9, fullChargeUnit: "lb" }),
    });
    const review = await reviewApplianceLeaks(t.db, { organisationId: 1, applianceId: id, now: NOW });
    expect(review.coverage.regime).toBeNull();
    expect(review.events).toEqual([]);
    expect(review.deadlines).toEqual([]);
  });

  it("lists the jobs on an appliance that the Job scope allows, with their movements", async () => {
    const id = await idOf("TUC-RACK-908");
    const officer = await loadActor(t.db, Number((await t.db("users").where({ email: DEMO_SIGN_INS.compliance_officer }).first("id")).id));
    const page = await listApplianceJobs(t.db, {
      scope: scopeByAbility(defineAbilityFor(officer!), "read", "Job", "jobs"),
      applianceId: id,
      query: { page: 1, pageSize: 50, dir: "desc" },
    });
    const charge = page.rows.find((r) => r.performedOn === "2026-09-12")!;
    expect(charge).toMatchObject({ kind: "charge", chargedG: 95000 });
    expect(charge.movements).toEqual([expect.objectContaining({ direction: "charged_from_stock", massG: 95000 })]);
    const otherBranchManager = await loadActor(t.db, actor.userId);
    const none = await listApplianceJobs(t.db, {
      scope: scopeByAbility(defineAbilityFor(otherBranchManager!), "read", "Job", "jobs"),
      applianceId: id,
      query: { page: 1, pageSize: 50, dir: "desc" },
    });
    expect(none.total).toBe(0);
  });
});
