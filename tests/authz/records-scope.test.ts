import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { subject } from "@casl/ability";
import { defineAbilityFor, type AppAbility, type SubjectName } from "@coldtrail/core";
import { DEMO_SIGN_INS, listDisposals, listPurchases, listShipments, loadActor, scopeByAbility } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * Disposals, reclaim shipments and purchases: for every demo role, a row is listed exactly when the
 * ability allows reading it, on both organisations' data; and who may correct or void which job.
 */

let t: TestDb;
type Row = { id: number; organisationId: number; branchId: number } & Record<string, unknown>;
const all: Record<"record" | "statement" | "shipment" | "purchase", Row[]> = { record: [], statement: [], shipment: [], purchase: [] };

async function abilityOf(email: string): Promise<{ ability: AppAbility; userId: number; organisationId: number }> {
  const user = await t.db("users").where({ email }).first("id");
  const actor = await loadActor(t.db, Number(user.id));
  if (!actor) throw new Error(`no actor for ${email}`);
  return { ability: defineAbilityFor(actor, new Date("2026-12-01T12:00:00Z")), userId: actor.userId, organisationId: actor.organisationId };
}

async function pages(fetch: (page: number) => Promise<{ rows: { id: number }[] }>): Promise<number[]> {
  const ids: number[] = [];
  for (let page = 1; ; page++) {
    const r = await fetch(page);
    ids.push(...r.rows.map((x) => x.id));
    if (r.rows.length < 200) break;
  }
  return ids.sort((a, b) => a - b);
}

/** Rows with the fields the permission conditions read, the record's date included (an inspector's window). */
const rowsOf = async (table: string, dateColumn: string, dateField: string): Promise<Row[]> =>
  (await t.db(table).whereNull("voided_at").select("id", "organisation_id", "branch_id", dateColumn)).map((r) => ({
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    [dateField]: r[dateColumn],
  }));

beforeAll(async () => {
  t = await createSeededTestDb();
  all.record = await rowsOf("disposal_records", "disposed_on", "recordedOn");
  all.statement = await rowsOf("disposal_statements", "recovered_on", "recordedOn");
  all.shipment = await rowsOf("reclaim_shipments", "shipped_on", "shippedOn");
  all.purchase = await rowsOf("purchases", "purchased_on", "purchasedOn");
}, 120_000);
afterAll(async () => {
  await t?.destroy();
});

const readable = (ability: AppAbility, name: SubjectName, rows: Row[]) =>
  rows
    .filter((r) => ability.can("read", subject(name, { ...r })))
    .map((r) => r.id)
    .sort((a, b) => a - b);

describe("record lists agree with the record-level permission", () => {
  for (const [role, email] of Object.entries(DEMO_SIGN_INS)) {
    it(`${role}: disposals, shipments and purchases are listed exactly when readable`, async () => {
      const { ability } = await abilityOf(email);
      const base = { pageSize: 200, dir: "desc" as const };
      for (const type of ["record", "statement"] as const) {
        const listed = await pages((page) =>
          listDisposals(t.db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), query: { ...base, page, type, sort: "date" } }),
        );
        expect(listed, `${role} ${type}s`).toEqual(readable(ability, "Disposal", all[type]));
      }
      const shipments = await pages((page) =>
        listShipments(t.db, { scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"), query: { ...base, page, sort: "date" } }),
      );
      expect(shipments).toEqual(readable(ability, "ReclaimShipment", all.shipment));
      const purchases = await pages((page) =>
        listPurchases(t.db, { scope: scopeByAbility(ability, "read", "Purchase", "p"), query: { ...base, page, sort: "date" } }),
      );
      expect(purchases).toEqual(readable(ability, "Purchase", all.purchase));
    });
  }

  it("a branch manager sees only their branch; the other organisation's rows never appear", async () => {
    const { ability, organisationId } = await abilityOf(DEMO_SIGN_INS.branch_manager);
    const listed = await pages((page) =>
      listShipments(t.db, {
        scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"),
        query: { page, pageSize: 200, dir: "desc", sort: "date" },
      }),
    );
    expect(listed.length).toBeGreaterThan(0);
    const rows = all.shipment.filter((r) => listed.includes(r.id));
    expect(new Set(rows.map((r) => r.branchId)).size).toBe(1);
    expect(rows.every((r) => r.organisationId === organisationId)).toBe(true);
  });

  it("a technician lists their branch's disposals but no shipments or purchases", async () => {
    const { ability } = await abilityOf(DEMO_SIGN_INS.technician);
    const disposals = await pages((page) =>
      listDisposals(t.db, {
        scope: scopeByAbility(ability, "read", "Disposal", "d"),
        query: { page, pageSize: 200, dir: "desc", sort: "date", type: "record" },
      }),
    );
    expect(disposals.length).toBeGreaterThan(0);
    expect(
      await pages((page) =>
        listShipments(t.db, {
          scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"),
          query: { page, pageSize: 200, dir: "desc", sort: "date" },
        }),
      ),
    ).toEqual([]);
    expect(
      await pages((page) =>
        listPurchases(t.db, {
          scope: scopeByAbility(ability, "read", "Purchase", "p"),
          query: { page, pageSize: 200, dir: "desc", sort: "date" },
        }),
      ),
    ).toEqual([]);
  });
});

describe("the inspector's date window covers every dated record", () => {
  it("disposal records, statements, shipments and purchases of the granted branch: inside the window listed, outside absent", async () => {
    const { ability } = await abilityOf(DEMO_SIGN_INS.inspector);
    const den = Number((await t.db("branches").where({ code: "DEN" }).first("id")).id);
    // Source of the window: the demo grant covers records of 2025-01-01 … 2025-12-31 for Denver.
    const inWindow = (d: unknown) => typeof d === "string" && d >= "2025-01-01" && d <= "2025-12-31";
    const base = { pageSize: 200, dir: "desc" as const, sort: "date" as const };
    const lists = {
      record: (page: number) =>
        listDisposals(t.db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), query: { ...base, page, type: "record" } }),
      statement: (page: number) =>
        listDisposals(t.db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), query: { ...base, page, type: "statement" } }),
      shipment: (page: number) =>
        listShipments(t.db, { scope: scopeByAbility(ability, "read", "ReclaimShipment", "s"), query: { ...base, page } }),
      purchase: (page: number) =>
        listPurchases(t.db, { scope: scopeByAbility(ability, "read", "Purchase", "p"), query: { ...base, page } }),
    };
    const dateField = { record: "recordedOn", statement: "recordedOn", shipment: "shippedOn", purchase: "purchasedOn" } as const;
    let inside = 0;
    let outside = 0;
    for (const kind of Object.keys(lists) as (keyof typeof lists)[]) {
      const listed = await pages(lists[kind]);
      const denRows = all[kind].filter((r) => r.branchId === den);
      for (const r of denRows) {
        const visible = inWindow(r[dateField[kind]]);
        expect(listed.includes(r.id), `${kind} #${r.id} dated ${String(r[dateField[kind]])}`).toBe(visible);
        if (visible) inside++;
        else outside++;
      }
      expect(listed.every((id) => denRows.some((r) => r.id === id))).toBe(true);
    }
    expect(inside, "some Denver records lie inside the window").toBeGreaterThan(0);
    expect(outside, "some Denver records lie outside the window").toBeGreaterThan(0);
  });
});

describe("who may correct and void which job", () => {
  it("a technician: their own jobs only; the branch manager: any job of the branch; the officer and inspector: none", async () => {
    const tech = await abilityOf(DEMO_SIGN_INS.technician);
    const manager = await abilityOf(DEMO_SIGN_INS.branch_manager);
    const officer = await abilityOf(DEMO_SIGN_INS.compliance_officer);
    const inspector = await abilityOf(DEMO_SIGN_INS.inspector);
    const jobs = await t
      .db("jobs")
      .whereNull("voided_at")
      .where({ organisation_id: tech.organisationId })
      .select("id", "organisation_id", "branch_id", "technician_id", "performed_on");
    const shape = (j: (typeof jobs)[number]) =>
      subject("Job", {
        organisationId: Number(j.organisation_id),
        branchId: Number(j.branch_id),
        technicianId: Number(j.technician_id),
        performedOn: j.performed_on,
      });
    const own = jobs.find((j) => Number(j.technician_id) === tech.userId)!;
    const colleague = jobs.find((j) => Number(j.branch_id) === Number(own.branch_id) && Number(j.technician_id) !== tech.userId)!;
    const elsewhere = jobs.find((j) => Number(j.branch_id) !== Number(own.branch_id))!;
    for (const action of ["update", "void"] as const) {
      expect(tech.ability.can(action, shape(own)), `technician ${action}s own`).toBe(true);
      expect(tech.ability.can(action, shape(colleague)), `technician ${action}s a colleague's`).toBe(false);
      expect(tech.ability.can(action, shape(elsewhere))).toBe(false);
      expect(manager.ability.can(action, shape(colleague)), `manager ${action}s`).toBe(true);
      expect(manager.ability.can(action, shape(elsewhere))).toBe(false);
      expect(officer.ability.can(action, shape(own))).toBe(false);
      expect(inspector.ability.can(action, shape(own))).toBe(false);
    }
  });
});
