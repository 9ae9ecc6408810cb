import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { subject } from "@casl/ability";
import { defineAbilityFor, findingListQuery, type Action, type AppAbility } from "@coldtrail/core";
import {
  claimAudit,
  createAudit,
  DEMO_SIGN_INS,
  listFindings,
  loadActor,
  runAuditBranches,
  scopeByAbility,
  type Knex,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * Every findings list and write goes through a scope made from the ability. Here the scope is checked
 * against the ability's own record check, finding by finding, for every role of both organisations,
 * on the findings of an audit of every branch of both organisations.
 */

const NOW = new Date("2026-12-01T12:00:00Z");
let t: TestDb;
let all: Array<{
  id: number;
  organisationId: number;
  branchId: number;
  technicianId: number | null;
  occurredOn: string | null;
  openedAt: string;
}>;
/** Findings of the inspector's granted branch (Denver) about events inside and outside the granted 2025 window. */
const windowed = { inside: 0, outside: 0, standingInside: 0 };

async function abilityOf(email: string): Promise<AppAbility> {
  const user = await t.db("users").where({ email }).first("id");
  return defineAbilityFor((await loadActor(t.db, Number(user.id)))!, NOW);
}

async function idsInScope(ability: AppAbility, action: Action): Promise<number[]> {
  const scope = scopeByAbility(ability, action, "Finding", "findings");
  const rows = await t
    .db("findings as findings")
    .where(function scoped(this: Knex.QueryBuilder) {
      scope(this);
    })
    .select("findings.id");
  return rows.map((r) => Number(r.id)).sort((a, b) => a - b);
}

beforeAll(async () => {
  t = await createSeededTestDb();
  for (const org of [1, 2]) {
    const officer = await t
      .db("memberships")
      .where({ organisation_id: org })
      .whereIn("role", ["compliance_officer", "owner"])
      .first("user_id");
    const branchIds = (await t.db("branches").where({ organisation_id: org }).select("id")).map((b) => Number(b.id));
    const id = await createAudit(t.db, {
      actor: { userId: Number(officer.user_id), organisationId: org },
      input: { branchIds, periodFrom: "2024-12-01", periodTo: "2026-12-01", packs: ["us_federal"] },
      now: NOW,
    });
    await claimAudit(t.db, { id, now: NOW });
    await runAuditBranches(t.db, { id, now: () => NOW });
  }
  // The audit above finds nothing in Denver dated 2025 (the inspector's window): add findings about events
  // inside and outside the window, and a standing one opened inside it, copied from a Denver finding.
  const den = Number((await t.db("branches").where({ code: "DEN" }).first("id")).id);
  const { id: _id, ...model } = await t.db("findings").where({ branch_id: den }).first();
  const add = async (key: string, occurredOn: string | null, openedAt: string) =>
    Number(
      (
        await t
          .db("findings")
          .insert({ ...model, identity_key: `window-test:${key}`, occurred_on: occurredOn, opened_at: openedAt })
          .returning("id")
      )[0].id,
    );
  windowed.inside = await add("inside", "2025-06-15", "2026-11-30T10:00:00.000Z");
  windowed.outside = await add("outside", "2026-01-02", "2026-11-30T10:00:00.000Z");
  windowed.standingInside = await add("standing", null, "2025-12-31T23:00:00.000Z");
  all = (await t.db("findings").select("id", "organisation_id", "branch_id", "technician_id", "occurred_on", "opened_at")).map((r) => ({
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    technicianId: r.technician_id === null ? null : Number(r.technician_id),
    occurredOn: r.occurred_on ?? null,
    openedAt: r.opened_at,
  }));
  expect(all.length).toBeGreaterThan(20);
}, 120_000);

afterAll(async () => {
  await t?.destroy();
});

const ACTIONS: Action[] = ["read", "assign", "propose_fix", "accept", "reopen", "waive", "comment"];

describe("finding scopes agree with the record-level permission", () => {
  for (const [role, email] of Object.entries(DEMO_SIGN_INS)) {
    for (const action of ACTIONS) {
      it(`${role} · ${action}: in scope exactly when allowed`, async () => {
        const ability = await abilityOf(email);
        const allowed = all
          .filter((f) => ability.can(action, subject("Finding", { ...f })))
          .map((f) => f.id)
          .sort((a, b) => a - b);
        expect(await idsInScope(ability, action)).toEqual(allowed);
      });
    }
  }
});

describe("who sees which findings", () => {
  const branchOf = async (code: string) => Number((await t.db("branches").where({ code }).first("id")).id);

  it("a branch manager reads their own branch's findings only and cannot assign, accept or waive", async () => {
    const ability = await abilityOf(DEMO_SIGN_INS.branch_manager);
    const col = await branchOf("COL");
    const ids = await idsInScope(ability, "read");
    expect(ids.length).toBeGreaterThan(0);
    expect(all.filter((f) => ids.includes(f.id)).every((f) => f.branchId === col)).toBe(true);
    for (const action of ["assign", "accept", "waive", "reopen"] as Action[]) expect(await idsInScope(ability, action)).toEqual([]);
    expect((await idsInScope(ability, "propose_fix")).length).toBe(ids.length);
  });

  it("a technician reads only the findings that name them", async () => {
    const ability = await abilityOf(DEMO_SIGN_INS.technician);
    const me = Number((await t.db("users").where({ email: DEMO_SIGN_INS.technician }).first("id")).id);
    const ids = await idsInScope(ability, "read");
    expect(ids.length).toBeGreaterThan(0);
    expect(all.filter((f) => ids.includes(f.id)).every((f) => f.technicianId === me)).toBe(true);
    expect(await idsInScope(ability, "propose_fix")).toEqual([]);
  });

  it("the inspector reads the granted branch only, inside the granted dates, and can change nothing", async () => {
    const ability = await abilityOf(DEMO_SIGN_INS.inspector);
    const den = await branchOf("DEN");
    const ids = await idsInScope(ability, "read");
    // Source of the window: the demo grant covers records of 2025-01-01 … 2025-12-31 for Denver.
    expect(ids).toContain(windowed.inside);
    expect(ids).toContain(windowed.standingInside);
    expect(ids).not.toContain(windowed.outside);
    expect(all.filter((f) => ids.includes(f.id)).every((f) => f.branchId === den)).toBe(true);
    for (const f of all.filter((x) => ids.includes(x.id))) {
      const on = f.occurredOn ?? f.openedAt.slice(0, 10);
      expect(on >= "2025-01-01" && on <= "2025-12-31", `finding ${f.id} dated ${on}`).toBe(true);
    }
    for (const action of ["assign", "propose_fix", "accept", "waive", "reopen", "comment"] as Action[])
      expect(await idsInScope(ability, action)).toEqual([]);
  });

  it("another organisation's people see none of Kestrelmoor's findings, through the list query too", async () => {
    for (const email of [DEMO_SIGN_INS.other_org_manager, DEMO_SIGN_INS.other_org_technician]) {
      const ability = await abilityOf(email);
      const ids = await idsInScope(ability, "read");
      expect(all.filter((f) => ids.includes(f.id)).every((f) => f.organisationId === 2)).toBe(true);
      const listed = await listFindings(t.db, {
        organisationId: 1,
        scope: scopeByAbility(ability, "read", "Finding", "findings"),
        query: findingListQuery.parse({ state: "all" }),
        today: "2026-12-01",
      });
      expect(listed.total).toBe(0);
    }
  });

  it("only the compliance officer and the owner may run or create audits", async () => {
    for (const [role, email] of Object.entries(DEMO_SIGN_INS)) {
      const ability = await abilityOf(email);
      const expected = role === "owner" || role === "compliance_officer";
      expect(ability.can("run", subject("Audit", { organisationId: 1 })), role).toBe(expected);
    }
  });
});
