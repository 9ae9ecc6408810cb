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
type Row = { id: number; organisationId: number; branchId: number };
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

const rowsOf = async (table: string): Promise<Row[]> =>
  (await t.db(table).whereNull("voided_at").select("id", "organisation_id", "branch_id")).map((r) => ({
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
  }));

beforeAll(async () => {
  t = await createSeededTestDb();
  all.record = await rowsOf("disposal_records");
  all.statement = await rowsOf("disposal_statements");
  all.shipment = await rowsOf("reclaim_shipments");
  all.purchase = await rowsOf("purchases");
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
