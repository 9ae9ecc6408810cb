import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { subject } from "@casl/ability";
import { defineAbilityFor, type AppAbility, type InspectorGrantInput } from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  acceptInvitation,
  createInspectorGrant,
  listInspectorGrants,
  listJobs,
  listPeople,
  loadActor,
  revokeInspectorGrant,
  scopeByAbility,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * The admin lists are filtered by the same rules that guard single records, and inspector access
 * created here reaches the permission rules: granted branches and dates only, nothing once withdrawn
 * or expired.
 */

/** Grant input as the schema leaves it (the schema itself checks the end of access against today's date). */
const grantInput = (v: Omit<InspectorGrantInput, "note"> & { note?: string }): InspectorGrantInput => v;

async function abilityOf(db: TestDb["db"], email: string, now = new Date()): Promise<AppAbility> {
  const user = await db("users").where({ email }).first("id");
  const actor = await loadActor(db, Number(user.id));
  if (!actor) throw new Error(`no actor for ${email}`);
  return defineAbilityFor(actor, now);
}

describe("people list scope agrees with the record-level permission", () => {
  let t: TestDb;
  let rows: Array<{ userId: number; organisationId: number; branchId: number | null }>;
  beforeAll(async () => {
    t = await createSeededTestDb();
    const memberships = await t.db("memberships").select("user_id", "organisation_id", "branch_id");
    const users = await t.db("users").select("id", "organisation_id");
    rows = [
      ...memberships.map((m) => ({
        userId: Number(m.user_id),
        organisationId: Number(m.organisation_id),
        branchId: m.branch_id === null ? null : Number(m.branch_id),
      })),
      ...users.map((u) => ({ userId: Number(u.id), organisationId: Number(u.organisation_id), branchId: null })),
    ];
  }, 120_000);
  afterAll(async () => {
    await t?.destroy();
  });

  for (const [role, email] of Object.entries(DEMO_SIGN_INS)) {
    it(`${role}: a person is listed exactly when one of their memberships is readable`, async () => {
      const ability = await abilityOf(t.db, email);
      const page = await listPeople(t.db, {
        scope: scopeByAbility(ability, "read", "User", "pb"),
        query: { page: 1, pageSize: 200, sort: "name", dir: "asc" },
      });
      const readable = new Set(
        rows
          .filter((r) => ability.can("read", subject("User", { organisationId: r.organisationId, branchId: r.branchId })))
          .map((r) => r.userId),
      );
      expect(page.rows.map((p) => p.id).sort((a, b) => a - b)).toEqual([...readable].sort((a, b) => a - b));
    });
  }
});

describe("inspector access reaches the permission rules", () => {
  let t: TestDb;
  beforeEach(async () => {
    t = await createSeededTestDb();
  });
  afterEach(async () => {
    await t.destroy();
  });

  const NOW = new Date("2026-12-01T10:00:00.000Z");
  const email = "orla.brennick@cold-review.example";

  async function jobsSeen(ability: AppAbility) {
    const res = await listJobs(t.db, {
      scope: scopeByAbility(ability, "read", "Job", "jobs"),
      query: { page: 1, pageSize: 200, sort: "performedOn", dir: "desc" },
    });
    return res;
  }

  it("a new inspector reads only the granted branches and dates; after withdrawal or expiry, nothing", async () => {
    const officer = await t.db("users").where({ email: DEMO_SIGN_INS.compliance_officer }).first("id");
    const actor = { userId: Number(officer.id), organisationId: 1 };
    const branches = Object.fromEntries(
      (await t.db("branches").where({ organisation_id: 1 }).select("id", "code")).map((b) => [b.code, Number(b.id)]),
    );

    const created = await createInspectorGrant(t.db, {
      actor,
      input: grantInput({
        email,
        name: "Orla Brennick",
        branchIds: [branches.PIA, branches.TUC],
        recordsFrom: "2025-04-01",
        recordsTo: "2025-06-30",
        expiresOn: "2027-01-31",
        note: "Insurer review",
      }),
      now: NOW,
    });
    expect(created.kind).toBe("invited");
    expect(created.token).toBeTruthy();
    await acceptInvitation(t.db, {
      input: { token: created.token!, name: "Orla Brennick", password: "inspector-pass-1", confirmPassword: "inspector-pass-1" },
      now: NOW,
    });

    const ability = await abilityOf(t.db, email, NOW);
    const seen = await jobsSeen(ability);
    expect(seen.total).toBeGreaterThan(0);
    expect(new Set(seen.rows.map((r) => r.branchId))).toEqual(new Set([branches.PIA, branches.TUC]));
    expect(seen.rows.every((r) => r.performedOn >= "2025-04-01" && r.performedOn <= "2025-06-30")).toBe(true);
    expect(ability.can("read", subject("Job", { organisationId: 1, branchId: branches.DEN, performedOn: "2025-05-01" }))).toBe(false);
    expect(ability.can("read", subject("Job", { organisationId: 1, branchId: branches.PIA, performedOn: "2025-07-01" }))).toBe(false);
    expect(ability.can("read", "User")).toBe(false);
    expect(ability.can("create", "InspectorGrant")).toBe(false);

    // Expiry: the same rules a day after the end of access give nothing.
    const afterExpiry = await abilityOf(t.db, email, new Date("2027-02-01T00:00:00.000Z"));
    expect((await jobsSeen(afterExpiry)).total).toBe(0);
    expect(afterExpiry.can("read", "Job")).toBe(false);

    await revokeInspectorGrant(t.db, { actor, id: created.grantId, now: NOW });
    const revoked = await abilityOf(t.db, email, NOW);
    expect(revoked.can("read", "Job")).toBe(false);
    expect((await jobsSeen(revoked)).total).toBe(0);

    const grants = await listInspectorGrants(t.db, {
      scope: scopeByAbility(await abilityOf(t.db, DEMO_SIGN_INS.compliance_officer, NOW), "read", "InspectorGrant", "g"),
      query: { page: 1, pageSize: 25, state: "revoked" },
      now: NOW,
    });
    expect(grants.rows.map((g) => g.id)).toContain(created.grantId);
    expect(grants.rows.find((g) => g.id === created.grantId)).toMatchObject({
      state: "revoked",
      inspectorEmail: email,
      branches: expect.arrayContaining([expect.objectContaining({ id: branches.PIA })]),
    });
    await expect(revokeInspectorGrant(t.db, { actor, id: created.grantId, now: NOW })).rejects.toMatchObject({ code: "conflict" });
  });

  it("an inspector who can already sign in is notified, and the new access adds to the old", async () => {
    const officer = await t.db("users").where({ email: DEMO_SIGN_INS.compliance_officer }).first("id");
    const actor = { userId: Number(officer.id), organisationId: 1 };
    const col = Number((await t.db("branches").where({ code: "COL", organisation_id: 1 }).first("id")).id);
    const created = await createInspectorGrant(t.db, {
      actor,
      input: grantInput({
        email: DEMO_SIGN_INS.inspector,
        name: "Harold Penwick",
        branchIds: [col],
        recordsFrom: "2026-01-01",
        recordsTo: "2026-03-31",
        expiresOn: "2027-01-31",
      }),
      now: NOW,
    });
    expect(created.kind).toBe("notified");
    expect(created.token).toBeUndefined();
    const ability = await abilityOf(t.db, DEMO_SIGN_INS.inspector, NOW);
    expect(ability.can("read", subject("Job", { organisationId: 1, branchId: col, performedOn: "2026-02-01" }))).toBe(true);
    expect(ability.can("read", subject("Job", { organisationId: 1, branchId: col, performedOn: "2025-02-01" }))).toBe(false);
  });

  it("the company's own people and other organisations' addresses cannot become inspectors", async () => {
    const officer = await t.db("users").where({ email: DEMO_SIGN_INS.compliance_officer }).first("id");
    const actor = { userId: Number(officer.id), organisationId: 1 };
    const col = Number((await t.db("branches").where({ code: "COL", organisation_id: 1 }).first("id")).id);
    const boise = Number((await t.db("branches").where({ code: "BOI" }).first("id")).id);
    const grant = (over: Record<string, unknown>) =>
      createInspectorGrant(t.db, {
        actor,
        input: grantInput({
          email,
          name: "Orla Brennick",
          branchIds: [col],
          recordsFrom: "2026-01-01",
          recordsTo: "2026-03-31",
          expiresOn: "2027-01-31",
          ...over,
        }),
        now: NOW,
      });
    await expect(grant({ email: DEMO_SIGN_INS.branch_manager })).rejects.toMatchObject({ code: "conflict", field: "email" });
    await expect(grant({ email: DEMO_SIGN_INS.other_org_manager })).rejects.toMatchObject({ code: "conflict", field: "email" });
    await expect(grant({ branchIds: [boise] })).rejects.toMatchObject({ code: "invalid", field: "branchIds" });
    expect(await t.db("users").where({ email }).first("id")).toBeUndefined();
  });
});
