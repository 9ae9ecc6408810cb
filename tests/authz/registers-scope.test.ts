import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { subject } from "@casl/ability";
import {
  applianceListQuery,
  cylinderListQuery,
  defineAbilityFor,
  equipmentListQuery,
  type AppAbility,
  type SubjectName,
} from "@coldtrail/core";
import { DEMO_SIGN_INS, listAppliances, listCylinders, listEquipment, loadActor, scopeByAbility } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * The three registers: for every demo role (both organisations), a record is listed exactly when the
 * ability allows reading it; nobody can change a register of a branch they do not keep.
 */

let t: TestDb;
type Row = { id: number; organisationId: number; branchId: number };
const all: Record<"appliances" | "cylinders" | "recovery_equipment", Row[]> = { appliances: [], cylinders: [], recovery_equipment: [] };

async function abilityOf(email: string, now = new Date("2026-12-01T12:00:00Z")) {
  const user = await t.db("users").where({ email }).first("id");
  const actor = await loadActor(t.db, Number(user.id));
  if (!actor) throw new Error(`no actor for ${email}`);
  return { ability: defineAbilityFor(actor, now), actor };
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

const readable = (ability: AppAbility, name: SubjectName, rows: Row[]) =>
  rows
    .filter((r) => ability.can("read", subject(name, { ...r })))
    .map((r) => r.id)
    .sort((a, b) => a - b);

beforeAll(async () => {
  t = await createSeededTestDb();
  for (const table of Object.keys(all) as (keyof typeof all)[]) {
    all[table] = (await t.db(table).select("id", "organisation_id", "branch_id")).map((r) => ({
      id: Number(r.id),
      organisationId: Number(r.organisation_id),
      branchId: Number(r.branch_id),
    }));
  }
}, 120_000);
afterAll(async () => {
  await t?.destroy();
});

describe("register lists agree with the record-level permission", () => {
  for (const [role, email] of Object.entries(DEMO_SIGN_INS)) {
    it(`${role}: appliances, cylinders and equipment are listed exactly when readable`, async () => {
      const { ability, actor } = await abilityOf(email);
      const appliances = await pages((page) =>
        listAppliances(t.db, {
          scope: scopeByAbility(ability, "read", "Appliance", "appliances"),
          query: applianceListQuery.parse({ page, pageSize: 200 }),
        }),
      );
      expect(appliances).toEqual(readable(ability, "Appliance", all.appliances));
      const cylinders = await pages((page) =>
        listCylinders(t.db, {
          scope: scopeByAbility(ability, "read", "Cylinder", "cylinders"),
          organisationId: actor.organisationId,
          query: cylinderListQuery.parse({ page, pageSize: 200 }),
        }),
      );
      expect(cylinders).toEqual(readable(ability, "Cylinder", all.cylinders));
      const equipment = await pages((page) =>
        listEquipment(t.db, {
          scope: scopeByAbility(ability, "read", "RecoveryEquipment", "recovery_equipment"),
          query: equipmentListQuery.parse({ page, pageSize: 200 }),
        }),
      );
      expect(equipment).toEqual(readable(ability, "RecoveryEquipment", all.recovery_equipment));
      expect(appliances.length + cylinders.length + equipment.length, `${role} sees some register`).toBeGreaterThan(0);
    });
  }

  it("the inspector lists only the granted branch, and nothing once the grant has expired", async () => {
    const { ability } = await abilityOf(DEMO_SIGN_INS.inspector);
    const ids = await pages((page) =>
      listAppliances(t.db, {
        scope: scopeByAbility(ability, "read", "Appliance", "appliances"),
        query: applianceListQuery.parse({ page, pageSize: 200 }),
      }),
    );
    expect(new Set(all.appliances.filter((a) => ids.includes(a.id)).map((a) => a.branchId)).size).toBe(1);
    const later = await abilityOf(DEMO_SIGN_INS.inspector, new Date("2027-04-01T00:00:00Z"));
    const none = await listCylinders(t.db, {
      scope: scopeByAbility(later.ability, "read", "Cylinder", "cylinders"),
      organisationId: later.actor.organisationId,
      query: cylinderListQuery.parse({}),
    });
    expect(none.total).toBe(0);
    expect(none.rows).toEqual([]);
  });

  it("someone with no membership lists nothing", async () => {
    const ability = defineAbilityFor({
      userId: 999_999,
      organisationId: 1,
      name: "Nobody",
      email: "nobody@x.example",
      memberships: [],
      inspectorGrants: [],
    });
    const res = await listAppliances(t.db, {
      scope: scopeByAbility(ability, "read", "Appliance", "appliances"),
      query: applianceListQuery.parse({}),
    });
    expect(res.total).toBe(0);
  });
});

describe("who may change a register", () => {
  const branchOf = (table: keyof typeof all, orgId: number, not?: number) =>
    all[table].find((r) => r.organisationId === orgId && r.branchId !== not)!;
  it("a branch manager changes their own branch's registers only; technicians, officers and inspectors change none", async () => {
    const manager = await abilityOf(DEMO_SIGN_INS.branch_manager);
    const managed = manager.actor.memberships.find((m) => m.role === "branch_manager")!.branchId!;
    for (const [table, name] of [
      ["appliances", "Appliance"],
      ["cylinders", "Cylinder"],
      ["recovery_equipment", "RecoveryEquipment"],
    ] as const) {
      const own = all[table].find((r) => r.branchId === managed)!;
      const other = branchOf(table, 1, managed);
      const foreign = branchOf(table, 2);
      expect(manager.ability.can("update", subject(name, { ...own }))).toBe(true);
      expect(manager.ability.can("update", subject(name, { ...other }))).toBe(false);
      expect(manager.ability.can("update", subject(name, { ...foreign }))).toBe(false);
      for (const role of ["technician", "compliance_officer", "inspector"] as const) {
        const { ability } = await abilityOf(DEMO_SIGN_INS[role]);
        for (const r of [own, other, foreign]) {
          expect(ability.can("update", subject(name, { ...r })), `${role} updates ${name}`).toBe(false);
          expect(
            ability.can("create", subject(name, { organisationId: r.organisationId, branchId: r.branchId })),
            `${role} creates ${name}`,
          ).toBe(false);
        }
      }
      const owner = await abilityOf(DEMO_SIGN_INS.owner);
      expect(owner.ability.can("update", subject(name, { ...other }))).toBe(true);
      expect(owner.ability.can("update", subject(name, { ...foreign }))).toBe(false);
    }
  });
});
