import { afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { createRequire } from "node:module";
import { realpathSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { defineAbilityFor, todayIn, toGrams, type Actor, type AppAbility } from "@coldtrail/core";
import { amendJob, amendPurchase, getJob, getPurchase, loadActor, recordCylinderWeighing, type ScopeFn } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";
import { contentsOf, jobsFixture, writeCounts, type JobsFixture } from "./jobs-fixture";

/**
 * Impossible records are refused through the real route wrapper (session and database replaced by
 * the test's): each comes back as 400 with a field error naming the field, and nothing is written.
 * Amounts re-open exactly as entered; text fields are cleaned the same way everywhere.
 */

const web = (p: string) => fileURLToPath(new URL(`../../apps/web/src/${p}`, import.meta.url));
const webRequire = createRequire(new URL("../../apps/web/package.json", import.meta.url));
const { NextRequest } = webRequire("next/server") as { NextRequest: new (url: string, init?: RequestInit) => Request };
type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

let t: TestDb;
let f: JobsFixture;
const session: { signedIn: { actor: Actor; ability: AppAbility } | null } = { signedIn: null };
const routes: Record<string, Record<string, Handler>> = {};

beforeAll(async () => {
  vi.doMock(realpathSync(webRequire.resolve("server-only")), () => ({}));
  vi.doMock(web("lib/auth/current-actor.ts"), () => ({ currentActor: async () => session.signedIn }));
  vi.doMock(web("lib/db.ts"), () => ({ db: () => t.db }));
  vi.doMock("@/lib/api/route", () => import(web("lib/api/route.ts")));
  for (const p of ["jobs", "purchases", "cylinders/[id]/weighings"])
    routes[p] = (await import(web(`app/api/${p}/route.ts`))) as Record<string, Handler>;
});

beforeEach(async () => {
  t = await createTestDb();
  f = await jobsFixture(t.db);
  const actor = (await loadActor(t.db, f.manager))!;
  session.signedIn = { actor, ability: defineAbilityFor(actor) };
});
afterEach(async () => {
  // Let the background re-check of the route settle before the database goes away.
  await new Promise((r) => setTimeout(r, 50));
  await t.destroy();
});

async function post(route: string, body: unknown, params: Record<string, string> = {}) {
  const res = await routes[route]!.POST!(
    new NextRequest("http://127.0.0.1:3000/api/x", {
      method: "POST",
      body: JSON.stringify(body),
      // The app's own origin (the env module's default NEXTAUTH_URL in tests), as its pages send it.
      headers: { "content-type": "application/json", origin: "http://127.0.0.1:3000" },
    }),
    { params: Promise.resolve(params) },
  );
  const json = (await res.json()) as { id?: number; error?: { message: string; fieldErrors?: Record<string, string[]> } };
  return { status: res.status, json: { id: json.id, message: json.error?.message, fieldErrors: json.error?.fieldErrors } };
}

/** Posts, expects a 400 naming `field`, and checks that no table changed. */
async function refused(route: string, body: unknown, field: string, params: Record<string, string> = {}) {
  const before = { ...(await writeCounts(t.db)), weighings: await t.db("cylinder_weighings").count({ n: "*" }).first() };
  const res = await post(route, body, params);
  expect(res.status, JSON.stringify(res.json)).toBe(400);
  expect(Object.keys(res.json.fieldErrors ?? {}), JSON.stringify(res.json)).toContain(field);
  const after = { ...(await writeCounts(t.db)), weighings: await t.db("cylinder_weighings").count({ n: "*" }).first() };
  expect(after).toEqual(before);
  return res.json.fieldErrors![field]![0]!;
}

const tz = "America/Chicago"; // the fixture's branches
const today = () => todayIn(tz).today;

const recovery = (over: Record<string, unknown> = {}) => ({
  kind: "recovery",
  applianceId: f.rooftop,
  performedOn: today(),
  refrigerant: "R-410A",
  recoveredAmount: 5,
  recoveredUnit: "lb",
  cylinderId: f.northCylinder,
  equipmentId: f.northEquipment,
  evacuationValue: 0,
  evacuationUnit: "in_hg_vacuum",
  accessMethod: "service_valve",
  ...over,
});
const charge = (over: Record<string, unknown> = {}) => ({
  kind: "charge",
  applianceId: f.walkIn,
  performedOn: today(),
  refrigerant: "R-22",
  chargedAmount: 10,
  chargedUnit: "lb",
  chargeSource: "stock",
  ...over,
});
const purchase = (over: Record<string, unknown> = {}) => ({
  branchId: f.north,
  purchasedOn: today(),
  supplierName: "Coldline Supply",
  refrigerant: "R-410A",
  amount: 25,
  unit: "lb",
  ...over,
});

describe("impossible amounts", () => {
  it("a recovery that would put more in a cylinder than liquid fills it is refused on the amount (95 lb into a 50 lb-WC cylinder)", async () => {
    // 22,680 g WC × SG 1.062 (R-410A at 77 °F) = 24,086 g liquid-full; 95 lb = 43,091 g.
    const message = await refused("jobs", recovery({ recoveredAmount: 95 }), "recoveredAmount");
    expect(message).toMatch(/cannot hold that/);
    expect((await contentsOf(t.db, f.northCylinder)).contents_g).toBe(0);
  });

  it("a cylinder of R-22 already holding 5 kg cannot take what would overflow it either", async () => {
    // Liquid-full for R-22 (SG 1.197 at 77 °F): 22,680 × 1.197 = 27,147 g; 5,000 g + 23,000 g = 28,000 g.
    await refused(
      "jobs",
      recovery({ applianceId: f.walkIn, refrigerant: "R-22", cylinderId: f.northR22Cylinder, recoveredAmount: 23, recoveredUnit: "kg" }),
      "recoveredAmount",
    );
    expect((await contentsOf(t.db, f.northR22Cylinder)).contents_g).toBe(5000);
  });

  it("above the safe fill but possible: refused until the confirmation is ticked, then saved as entered", async () => {
    // Safe fill 22,680 × 0.8 × 1.062 = 19,268 g (42.48 lb); 45 lb = 20,412 g.
    const ask = await refused("jobs", recovery({ recoveredAmount: 45 }), "confirmOverFill");
    expect(ask).toMatch(/above its safe fill/);
    const saved = await post("jobs", recovery({ recoveredAmount: 45, confirmOverFill: true }));
    expect(saved.status).toBe(201);
    expect((await contentsOf(t.db, f.northCylinder)).contents_g).toBe(toGrams(45, "lb"));
  });

  it("an amount that rounds to zero grams is refused, in every unit and on purchases", async () => {
    await refused("jobs", charge({ chargedAmount: 1e-9 }), "chargedAmount");
    await refused("jobs", recovery({ recoveredAmount: 0.0004, recoveredUnit: "kg" }), "recoveredAmount");
    await refused("jobs", charge({ chargedAmount: 0.01, chargedUnit: "oz" }), "chargedAmount"); // 0.28 g
    await refused("purchases", purchase({ amount: 1e-9 }), "amount");
    // Zero recovered stays allowed: nothing was left in the appliance.
    expect((await post("jobs", recovery({ recoveredAmount: 0 }))).status).toBe(201);
  });

  it("a scale reading no cylinder could hold is refused on the reading", async () => {
    // Gross 80 kg on a cylinder with 7.938 kg tare: 72 kg net of R-22 in 22.68 kg WC.
    await refused(
      "cylinders/[id]/weighings",
      { weighedOn: today(), grossAmount: 80, grossUnit: "kg", refrigerant: "R-22" },
      "grossAmount",
      {
        id: String(f.northR22Cylinder),
      },
    );
  });
});

describe("impossible and implausible dates", () => {
  const dates = ["2025-13-45", "2026-02-30", "0001-01-01"];
  it("jobs of every kind refuse dates that do not exist or are implausibly old", async () => {
    for (const d of dates) {
      await refused("jobs", recovery({ performedOn: d }), "performedOn");
      await refused("jobs", charge({ performedOn: d }), "performedOn");
      await refused(
        "jobs",
        { kind: "leak_repair", applianceId: f.walkIn, performedOn: d, leakLocation: "Valve", repairDescription: "Tightened" },
        "performedOn",
      );
    }
  });

  it("purchases and weighings refuse them too", async () => {
    for (const d of dates) {
      await refused("purchases", purchase({ purchasedOn: d }), "purchasedOn");
      await refused("cylinders/[id]/weighings", { weighedOn: d, grossAmount: 10, grossUnit: "kg", refrigerant: "R-22" }, "weighedOn", {
        id: String(f.northR22Cylinder),
      });
    }
  });

  it("tomorrow in the branch's time zone is refused, today is accepted", async () => {
    const { tomorrow } = todayIn(tz);
    await refused("jobs", charge({ performedOn: tomorrow }), "performedOn");
    await refused("purchases", purchase({ purchasedOn: tomorrow }), "purchasedOn");
    expect((await post("jobs", charge())).status).toBe(201);
  });

  it("a date before the company's records begin is refused: by default 1 January three years before it joined", async () => {
    // The fixture's organisation joined on 2026-01-01, so its records begin on 2023-01-01.
    const message = await refused("jobs", charge({ performedOn: "2022-12-31" }), "performedOn");
    expect(message).toMatch(/2023-01-01/);
    expect((await post("jobs", charge({ performedOn: "2023-01-01" }))).status).toBe(201);
    // An owner who imports older records moves the start.
    await t.db("organisations").where({ id: f.org }).update({ records_begin_on: "2015-01-01" });
    expect((await post("purchases", purchase({ purchasedOn: "2016-06-01" }))).status).toBe(201);
  });

  it("a correction cannot move a job into the future either", async () => {
    const { json } = await post("jobs", charge());
    const actor = { userId: f.manager, organisationId: f.org };
    await expect(
      amendJob(t.db, { actor, id: json.id!, input: { reason: "Wrong day", changes: { performedOn: todayIn(tz).tomorrow } } }),
    ).rejects.toMatchObject({ field: "changes.performedOn" });
  });
});

describe("amounts re-open exactly as entered", () => {
  const scope: ScopeFn = (qb) => qb.where("jobs.organisation_id", f.org);
  const actor = () => ({ userId: f.manager, organisationId: f.org });

  it("95 lb comes back as 95 lb, not 94.999 (and the grams are what 95 lb converts to)", async () => {
    const { json } = await post("jobs", charge({ chargedAmount: 95 }));
    const job = (await getJob(t.db, { scope, id: json.id! }))!;
    expect(job.chargedG).toBe(43091); // 95 × 453.59237 = 43,091.28 g
    expect(job.enteredAmount).toEqual({ amount: 95, unit: "lb" });
  });

  it("corrections in ounces and kilograms re-open in that figure and unit", async () => {
    const { json } = await post("jobs", charge({ chargedAmount: 95 }));
    const id = json.id!;
    await amendJob(t.db, {
      actor: actor(),
      id,
      input: { reason: "Read the scale in ounces", changes: { amount: 12.3, amountUnit: "oz" } },
    });
    let job = (await getJob(t.db, { scope, id }))!;
    expect(job.enteredAmount).toEqual({ amount: 12.3, unit: "oz" });
    expect(job.chargedG).toBe(349); // 12.3 × 28.349523 = 348.70 g
    await amendJob(t.db, { actor: actor(), id, input: { reason: "Metric scale", changes: { amount: 43.091, amountUnit: "kg" } } });
    job = (await getJob(t.db, { scope, id }))!;
    expect(job.enteredAmount).toEqual({ amount: 43.091, unit: "kg" });
    expect(job.chargedG).toBe(43091);
  });

  it("a purchase re-opens as entered, and so does a corrected one", async () => {
    const { json } = await post("purchases", purchase({ amount: 30, unit: "lb" }));
    const scopeP: ScopeFn = (qb) => qb.where("p.organisation_id", f.org);
    expect((await getPurchase(t.db, { scope: scopeP, id: json.id! }))!.enteredAmount).toEqual({ amount: 30, unit: "lb" });
    await amendPurchase(t.db, {
      actor: actor(),
      id: json.id!,
      input: { reason: "Invoice said ounces", changes: { amount: 480.5, unit: "oz" } },
    });
    expect((await getPurchase(t.db, { scope: scopeP, id: json.id! }))!.enteredAmount).toEqual({ amount: 480.5, unit: "oz" });
  });

  it("when the grams were changed without a typed figure, the stale figure is not shown", async () => {
    const { json } = await post("jobs", charge({ chargedAmount: 95 }));
    await t.db("jobs").where({ id: json.id }).update({ charged_g: 40000 });
    expect((await getJob(t.db, { scope, id: json.id! }))!.enteredAmount).toBeNull();
  });
});

describe("text fields", () => {
  it("bidi controls are stripped before saving; NUL and invisible-only values are refused and nothing is written", async () => {
    const { json } = await post("purchases", purchase({ supplierName: "Coldline\u202E Supply\u2066", invoiceReference: "INV\u200F-7" }));
    const row = await t.db("purchases").where({ id: json.id }).first("supplier_name", "invoice_reference");
    expect(row).toEqual({ supplier_name: "Coldline Supply", invoice_reference: "INV-7" });
    await refused("purchases", purchase({ supplierName: "Cold\u0000line" }), "supplierName");
    await refused("purchases", purchase({ supplierName: "\u200B\u200C" }), "supplierName");
    await refused(
      "jobs",
      { kind: "leak_repair", applianceId: f.walkIn, performedOn: today(), leakLocation: "\u2060", repairDescription: "Brazed" },
      "leakLocation",
    );
    await refused("jobs", charge({ notes: "ok\u0000" }), "notes");
  });

  it("weighings keep the typed reading for correction", async () => {
    const r = await recordCylinderWeighing(t.db, {
      actor: { userId: f.manager, organisationId: f.org },
      cylinderId: f.northR22Cylinder,
      input: { weighedOn: today(), grossAmount: 28.4, grossUnit: "lb", temperatureUnit: "F", refrigerant: "R-22" },
    });
    const w = await t.db("cylinder_weighings").where({ id: r.id }).first("gross_g", "gross_entered", "gross_unit");
    expect(w).toMatchObject({ gross_g: toGrams(28.4, "lb"), gross_entered: 28.4, gross_unit: "lb" });
  });
});
