import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { subject } from "@casl/ability";
import { defineAbilityFor, type AppAbility } from "@coldtrail/core";
import { DEMO_SIGN_INS, listJobs, loadActor, scopeByAbility } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * The list scope must agree with the ability's own record check, job by job: a job is listed for a
 * person exactly when `ability.can("read", job)`. Checked for every role on the whole demo data,
 * both organisations.
 */

let t: TestDb;
let allJobs: Array<{ id: number; organisationId: number; branchId: number; technicianId: number; performedOn: string }>;

async function abilityOf(
  email: string,
  now = new Date("2026-12-01T12:00:00Z"),
): Promise<{ ability: AppAbility; userId: number; organisationId: number }> {
  const user = await t.db("users").where({ email }).first("id");
  const actor = await loadActor(t.db, Number(user.id));
  if (!actor) throw new Error(`no actor for ${email}`);
  return { ability: defineAbilityFor(actor, now), userId: actor.userId, organisationId: actor.organisationId };
}

async function listedIds(ability: AppAbility): Promise<Set<number>> {
  const ids = new Set<number>();
  for (let page = 1; ; page++) {
    const res = await listJobs(t.db, {
      scope: scopeByAbility(ability, "read", "Job", "jobs"),
      query: { page, pageSize: 200, sort: "performedOn", dir: "desc" },
    });
    for (const r of res.rows) ids.add(r.id);
    if (res.rows.length < 200) break;
  }
  return ids;
}

beforeAll(async () => {
  t = await createSeededTestDb();
  const rows = await t.db("jobs").whereNull("voided_at").select("id", "organisation_id", "branch_id", "technician_id", "performed_on");
  allJobs = rows.map((r) => ({
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    technicianId: Number(r.technician_id),
    performedOn: String(r.performed_on),
  }));
}, 120_000);

afterAll(async () => {
  await t?.destroy();
});

describe("job list scope agrees with the record-level permission", () => {
  for (const [role, email] of Object.entries(DEMO_SIGN_INS)) {
    it(`${role}: listed exactly when readable`, async () => {
      const { ability } = await abilityOf(email);
      const listed = await listedIds(ability);
      const readable = allJobs.filter((j) => ability.can("read", subject("Job", { ...j }))).map((j) => j.id);
      expect(readable.length).toBeGreaterThan(0);
      expect([...listed].sort((a, b) => a - b)).toEqual(readable.sort((a, b) => a - b));
    });
  }

  it("a technician lists only their own jobs, in their own organisation", async () => {
    const { ability, userId, organisationId } = await abilityOf(DEMO_SIGN_INS.technician);
    const listed = await listedIds(ability);
    for (const j of allJobs.filter((x) => listed.has(x.id))) {
      expect(j.technicianId).toBe(userId);
      expect(j.organisationId).toBe(organisationId);
    }
  });

  it("a branch manager lists nothing from another branch or organisation", async () => {
    const { ability, organisationId } = await abilityOf(DEMO_SIGN_INS.branch_manager);
    const listed = await listedIds(ability);
    const branches = new Set(allJobs.filter((j) => listed.has(j.id)).map((j) => j.branchId));
    expect(branches.size).toBe(1);
    expect(allJobs.filter((j) => listed.has(j.id)).every((j) => j.organisationId === organisationId)).toBe(true);
  });

  it("the inspector lists only the granted branch and dates, and nothing once the grant has expired", async () => {
    const { ability } = await abilityOf(DEMO_SIGN_INS.inspector);
    const ids = await listedIds(ability);
    const rows = allJobs.filter((j) => ids.has(j.id));
    expect(rows.length).toBeGreaterThan(0);
    expect(new Set(rows.map((r) => r.branchId)).size).toBe(1);
    expect(rows.every((r) => r.performedOn >= "2025-01-01" && r.performedOn <= "2025-12-31")).toBe(true);

    const later = await abilityOf(DEMO_SIGN_INS.inspector, new Date("2027-04-01T00:00:00Z"));
    expect((await listedIds(later.ability)).size).toBe(0);
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
    expect((await listedIds(ability)).size).toBe(0);
  });
});
