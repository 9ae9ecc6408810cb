import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { purchaseAmendmentInput, purchaseInput, reclaimShipmentInput } from "@coldtrail/core";
import {
  amendPurchase,
  amendShipment,
  createJob,
  createPurchase,
  createShipment,
  getShipment,
  listPurchases,
  listShipments,
  voidPurchase,
  voidShipment,
  type ScopeFn,
} from "@coldtrail/db";
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

const manager = () => ({ userId: f.manager, organisationId: f.org });
const shipScope = (): ScopeFn => (qb) => qb.where("s.organisation_id", f.org);
const purchaseScope = (): ScopeFn => (qb) => qb.where("p.organisation_id", f.org);
const ship = (over: Record<string, unknown> = {}) =>
  createShipment(t.db, {
    actor: manager(),
    input: reclaimShipmentInput.parse({
      branchId: f.north,
      shippedOn: "2026-03-31",
      reclaimerName: "Invented Reclaim Co",
      reference: "BOL-1",
      cylinderIds: [f.northR22Cylinder],
      ...over,
    }),
  });

describe("reclaim shipments", () => {
  it("ships each cylinder's contents: a line and a movement per cylinder, and the cylinder comes back empty", async () => {
    await createJob(t.db, {
      actor: { userId: f.tech, organisationId: f.org },
      branchId: f.north,
      input: {
        kind: "recovery",
        applianceId: f.rooftop,
        performedOn: "2026-03-02",
        refrigerant: "R-410A",
        recoveredAmount: 4,
        recoveredUnit: "kg",
        cylinderId: f.northCylinder,
        equipmentId: f.northEquipment,
        evacuationValue: 0,
        evacuationUnit: "psig",
        accessMethod: "service_valve",
      },
    });
    const id = await ship({ cylinderIds: [f.northR22Cylinder, f.northCylinder] });
    expect(await contentsOf(t.db, f.northR22Cylinder)).toEqual({ contents_g: 0, refrigerant: null });
    expect(await contentsOf(t.db, f.northCylinder)).toEqual({ contents_g: 0, refrigerant: null });
    const detail = await getShipment(t.db, { scope: shipScope(), id });
    expect(detail?.lines.map((l) => [l.cylinderSerial, l.refrigerant, l.massG])).toEqual([
      ["C-0200", "R-22", 5000],
      ["C-0142", "R-410A", 4000],
    ]);
    const movements = await t.db("refrigerant_movements").where({ reclaim_shipment_id: id }).orderBy("id");
    expect(movements.map((m) => [m.direction, m.cylinder_id, m.mass_g])).toEqual([
      ["shipped_for_reclaim", f.northR22Cylinder, 5000],
      ["shipped_for_reclaim", f.northCylinder, 4000],
    ]);
    const page = await listShipments(t.db, { scope: shipScope(), query: { page: 1, pageSize: 25, sort: "date", dir: "desc" } });
    expect(page.rows[0]).toMatchObject({
      id,
      cylinderCount: 2,
      totalG: 9000,
      byRefrigerant: [
        { refrigerant: "R-22", massG: 5000 },
        { refrigerant: "R-410A", massG: 4000 },
      ],
    });
    expect((await t.db("activity").where({ subject_type: "reclaim_shipment", subject_id: id }).first()).summary).toBe(
      "Shipped 2 cylinders (19.84 lb) to Invented Reclaim Co for reclaim",
    );
  });

  it("refuses an empty cylinder or one of another branch, naming the field, and writes nothing", async () => {
    const before = await writeCounts(t.db);
    await expect(ship({ cylinderIds: [f.northR22Cylinder, f.northCylinder] })).rejects.toMatchObject({
      code: "conflict",
      field: "cylinderIds",
    });
    await expect(ship({ cylinderIds: [f.southCylinder] })).rejects.toMatchObject({ code: "conflict", field: "cylinderIds" });
    expect(await writeCounts(t.db)).toEqual(before);
    expect((await contentsOf(t.db, f.northR22Cylinder)).contents_g).toBe(5000);
  });

  it("a voided shipment puts the contents back on record; a correction keeps the history", async () => {
    const id = await ship();
    await amendShipment(t.db, { actor: manager(), id, input: { reason: "Reference typo", changes: { reference: "BOL-2" } } });
    expect((await getShipment(t.db, { scope: shipScope(), id }))!.amendments[0]).toMatchObject({
      previous: { reference: "BOL-1" },
      next: { reference: "BOL-2" },
    });
    await voidShipment(t.db, { actor: manager(), id, reason: "Truck never came" });
    expect(await contentsOf(t.db, f.northR22Cylinder)).toEqual({ contents_g: 5000, refrigerant: "R-22" });
    expect((await listShipments(t.db, { scope: shipScope(), query: { page: 1, pageSize: 25, sort: "date", dir: "desc" } })).total).toBe(0);
  });
});

describe("purchases", () => {
  const buy = () =>
    createPurchase(t.db, {
      actor: manager(),
      input: purchaseInput.parse({
        branchId: f.north,
        purchasedOn: "2026-02-10",
        supplierName: "Invented Supply",
        refrigerant: "R-410A",
        amount: "50",
        unit: "lb",
        containerCount: "2",
        invoiceReference: "INV-9",
      }),
    });

  it("records the purchase with its movement and lists it by branch", async () => {
    const id = await buy();
    expect(await t.db("purchases").where({ id }).first()).toMatchObject({ mass_g: 22680, container_count: 2, refrigerant: "R-410A" }); // 50 lb = 22,679.6 g
    expect(await t.db("refrigerant_movements").where({ purchase_id: id })).toMatchObject([
      { direction: "purchased", mass_g: 22680, cylinder_id: null },
    ]);
    const page = await listPurchases(t.db, {
      scope: purchaseScope(),
      query: { page: 1, pageSize: 25, sort: "date", dir: "desc", branchId: f.north },
    });
    expect(page.rows.map((r) => r.id)).toEqual([id]);
    expect(
      (
        await listPurchases(t.db, {
          scope: purchaseScope(),
          query: { page: 1, pageSize: 25, sort: "date", dir: "desc", branchId: f.south },
        })
      ).total,
    ).toBe(0);
  });

  it("a corrected quantity replaces the movement; a void voids it", async () => {
    const id = await buy();
    await amendPurchase(t.db, {
      actor: manager(),
      id,
      input: purchaseAmendmentInput.parse({ reason: "Invoice says 25 lb", changes: { amount: 25, unit: "lb" } }),
    });
    const live = await t.db("refrigerant_movements").where({ purchase_id: id }).whereNull("voided_at");
    expect(live.map((m) => m.mass_g)).toEqual([11340]);
    await voidPurchase(t.db, { actor: manager(), id, reason: "Returned to supplier" });
    expect(await t.db("refrigerant_movements").where({ purchase_id: id }).whereNull("voided_at")).toHaveLength(0);
    expect(
      (
        await listPurchases(t.db, { scope: purchaseScope(), query: { page: 1, pageSize: 25, sort: "date", dir: "desc", voided: "only" } })
      ).rows.map((r) => r.id),
    ).toEqual([id]);
  });

  it("the schema refuses a zero quantity by field", () => {
    const r = purchaseInput.safeParse({
      branchId: f.north,
      purchasedOn: "2026-02-10",
      supplierName: "S",
      refrigerant: "R-410A",
      amount: "0",
      unit: "lb",
    });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]).toMatchObject({ path: ["amount"], message: "The amount must be more than zero" });
  });
});
