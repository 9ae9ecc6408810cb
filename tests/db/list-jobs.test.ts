import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { jobListQuery, type JobListQuery } from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  findUserForSignIn,
  getJob,
  listApplianceOptions,
  listBranches,
  listCylinderOptions,
  listEquipmentOptions,
  listJobs,
  loadActor,
  type ScopeFn,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

let t: TestDb;
let orgId: number;
let otherOrgId: number;
let branch: Record<"COL" | "TUC" | "DEN" | "PIA" | "BOI", number>;

const query = (over: Partial<JobListQuery> = {}): JobListQuery => jobListQuery.parse(over);
const org: () => ScopeFn = () => (qb) => qb.where("jobs.organisation_id", orgId);

beforeAll(async () => {
  t = await createSeededTestDb();
  orgId = (await t.db("organisations").where({ name: "Kestrelmoor Climate Services" }).first()).id;
  otherOrgId = (await t.db("organisations").where({ name: "Quillfield Refrigeration" }).first()).id;
  branch = Object.fromEntries((await t.db("branches").select("code", "id")).map((b) => [b.code, b.id])) as typeof branch;
});
afterAll(async () => {
  await t.destroy();
});

describe("listJobs", () => {
  it("pages through every job in scope exactly once, with the total", async () => {
    const all = await t.db("jobs").where({ organisation_id: orgId }).whereNull("voided_at").pluck("id");
    const seen: number[] = [];
    let total: number;
    for (let page = 1; ; page++) {
      const r = await listJobs(t.db, { scope: org(), query: query({ page, pageSize: 200 }) });
      total = r.total;
      expect(r.page).toBe(page);
      expect(r.pageSize).toBe(200);
      if (!r.rows.length) break;
      seen.push(...r.rows.map((row) => row.id));
    }
    expect(total).toBe(all.length);
    expect(new Set(seen).size).toBe(seen.length);
    expect([...seen].sort((a, b) => a - b)).toEqual([...all].sort((a, b) => a - b));
  });

  it("sorts by date descending by default, breaking ties by id", async () => {
    const r = await listJobs(t.db, { scope: org(), query: query({ pageSize: 200 }) });
    for (let i = 1; i < r.rows.length; i++) {
      const [a, b] = [r.rows[i - 1]!, r.rows[i]!];
      expect(a.performedOn > b.performedOn || (a.performedOn === b.performedOn && a.id > b.id)).toBe(true);
    }
  });

  it("sorts by technician name and by amount", async () => {
    const byTech = await listJobs(t.db, { scope: org(), query: query({ sort: "technician", dir: "asc", pageSize: 100 }) });
    const names = byTech.rows.map((r) => r.technicianName);
    expect(names).toEqual([...names].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0)));
    const byAmount = await listJobs(t.db, { scope: org(), query: query({ sort: "amount", dir: "desc", pageSize: 5 }) });
    const top = byAmount.rows.map((r) => r.recoveredG + r.chargedG);
    expect(top).toEqual([...top].sort((a, b) => b - a));
    expect(byAmount.rows[0]!.applianceTag).toBe("TUC-RACK-908"); // 95 kg added, the largest single movement
  });

  it("filters by kind, branch, technician and date window", async () => {
    const r = await listJobs(t.db, {
      scope: org(),
      query: query({ kind: "recovery", branchId: branch.COL, from: "2025-01-01", to: "2025-12-31", pageSize: 200 }),
    });
    expect(r.total).toBeGreaterThan(0);
    expect(r.rows.every((row) => row.kind === "recovery" && row.branchId === branch.COL)).toBe(true);
    expect(r.rows.every((row) => row.performedOn >= "2025-01-01" && row.performedOn <= "2025-12-31")).toBe(true);
    const expected = await t
      .db("jobs")
      .where({ kind: "recovery", branch_id: branch.COL })
      .whereBetween("performed_on", ["2025-01-01", "2025-12-31"])
      .count({ n: "*" })
      .first();
    expect(r.total).toBe(Number(expected?.n));

    const tech = await findUserForSignIn(t.db, DEMO_SIGN_INS.technician);
    const mine = await listJobs(t.db, { scope: org(), query: query({ technicianId: tech!.id, pageSize: 200 }) });
    expect(mine.total).toBeGreaterThan(0);
    expect(mine.rows.every((row) => row.technicianId === tech!.id)).toBe(true);
  });

  it("matches appliance tag or description case-insensitively, and wildcards literally", async () => {
    const r = await listJobs(t.db, { scope: org(), query: query({ q: "col-ch-911" }) });
    expect(r.total).toBe(1);
    expect(r.rows[0]).toMatchObject({ applianceTag: "COL-CH-911", kind: "recovery", evacuationValue: 4 });
    const byDescription = await listJobs(t.db, { scope: org(), query: query({ q: "CONVENIENCE STORE", pageSize: 50 }) });
    expect(byDescription.total).toBe(20); // PIA-RACK-910: 5 additions, 5 repairs, 10 verification tests
    expect((await listJobs(t.db, { scope: org(), query: query({ q: "%" }) })).total).toBe(0);
  });

  it("joins what the list shows", async () => {
    const r = await listJobs(t.db, { scope: org(), query: query({ q: "TUC-RES-915", kind: "recovery" }) });
    expect(r.rows[0]).toMatchObject({
      branchName: "Tucson",
      cylinderSerial: "DEN-C-915",
      technicianName: "Rafael Ibarra-Quint",
      recoveredG: 2600,
      applianceCategory: "residential_split",
    });
    expect(r.rows[0]!.equipmentSerial).toMatch(/^TUC-RE-0[12]$/);
  });

  it("applies the scope as one block that filters cannot widen", async () => {
    const scope: ScopeFn = (qb) => qb.where("jobs.branch_id", branch.DEN).orWhere("jobs.branch_id", branch.TUC);
    const r = await listJobs(t.db, { scope, query: query({ branchId: branch.COL }) });
    expect(r.total).toBe(0);
    const both = await listJobs(t.db, { scope, query: query({ pageSize: 200 }) });
    expect(both.rows.every((row) => row.branchId === branch.DEN || row.branchId === branch.TUC)).toBe(true);
  });

  it("keeps other organisations' jobs out of an organisation scope", async () => {
    const r = await listJobs(t.db, { scope: org(), query: query({ pageSize: 200, q: "BOI-" }) });
    expect(r.total).toBe(0);
    const theirs = await listJobs(t.db, { scope: (qb) => qb.where("jobs.organisation_id", otherOrgId), query: query({ pageSize: 200 }) });
    expect(theirs.total).toBeGreaterThan(0);
    expect(theirs.rows.every((row) => row.applianceTag.startsWith("BOI-"))).toBe(true);
  });

  it("leaves voided jobs out unless asked", async () => {
    const victim = await t.db("jobs").where({ organisation_id: otherOrgId }).orderBy("id").first("id");
    const before = await listJobs(t.db, { scope: (qb) => qb.where("jobs.organisation_id", otherOrgId), query: query() });
    await t.db("jobs").where({ id: victim.id }).update({ voided_at: "2026-11-30T10:00:00.000Z", void_reason: "Entered twice" });
    const after = await listJobs(t.db, { scope: (qb) => qb.where("jobs.organisation_id", otherOrgId), query: query() });
    expect(after.total).toBe(before.total - 1);
    const withVoided = await listJobs(t.db, {
      scope: (qb) => qb.where("jobs.organisation_id", otherOrgId),
      query: query(),
      includeVoided: true,
    });
    expect(withVoided.total).toBe(before.total);
  });
});

describe("getJob", () => {
  it("returns a job in scope and nothing outside it", async () => {
    const job = await t.db("jobs").where({ branch_id: branch.DEN }).first("id");
    const detail = await getJob(t.db, { scope: (qb) => qb.where("jobs.branch_id", branch.DEN), id: job.id });
    expect(detail?.id).toBe(job.id);
    expect(await getJob(t.db, { scope: (qb) => qb.where("jobs.branch_id", branch.COL), id: job.id })).toBeUndefined();
  });
});

describe("people", () => {
  it("finds a user to sign in by e-mail in any case", async () => {
    const u = await findUserForSignIn(t.db, DEMO_SIGN_INS.owner.toUpperCase());
    expect(u).toMatchObject({ organisationId: orgId, email: DEMO_SIGN_INS.owner, name: "Marguerite Halvorsen", active: true });
    expect(u?.passwordHash).toMatch(/^\$2[aby]\$10\$/);
    expect(await findUserForSignIn(t.db, "nobody@kestrelmoor.example")).toBeUndefined();
  });

  it("loads an actor's roles, memberships and inspector grants", async () => {
    const manager = await findUserForSignIn(t.db, DEMO_SIGN_INS.branch_manager);
    expect(await loadActor(t.db, manager!.id)).toMatchObject({
      roles: ["branch_manager"],
      memberships: [{ branchId: branch.COL, role: "branch_manager" }],
      inspectorGrants: [],
    });
    const officer = await findUserForSignIn(t.db, DEMO_SIGN_INS.compliance_officer);
    expect((await loadActor(t.db, officer!.id))?.memberships).toEqual([{ branchId: null, role: "compliance_officer" }]);
    const inspector = await findUserForSignIn(t.db, DEMO_SIGN_INS.inspector);
    const actor = await loadActor(t.db, inspector!.id);
    expect(actor?.roles).toEqual(["inspector"]);
    const active = actor!.inspectorGrants.filter((g) => g.revokedAt === null);
    expect(active).toHaveLength(1);
    expect(active[0]).toMatchObject({ branchIds: [branch.DEN], recordsFrom: "2025-01-01", recordsTo: "2025-12-31" });
    expect(actor!.inspectorGrants.some((g) => g.revokedAt !== null && g.branchIds[0] === branch.PIA)).toBe(true);
  });

  it("gives no actor for a deactivated user", async () => {
    const tech = await findUserForSignIn(t.db, DEMO_SIGN_INS.other_org_technician);
    await t.db("users").where({ id: tech!.id }).update({ active: false });
    expect(await loadActor(t.db, tech!.id)).toBeUndefined();
    expect((await findUserForSignIn(t.db, DEMO_SIGN_INS.other_org_technician))?.active).toBe(false);
  });
});

describe("branches and form options", () => {
  it("lists an organisation's branches only", async () => {
    const list = await listBranches(t.db, { organisationId: orgId });
    expect(list.map((b) => b.code).sort()).toEqual(["COL", "DEN", "PIA", "RTM", "TUC"]);
    expect(list.find((b) => b.code === "DEN")).toMatchObject({ massUnit: "kg", timeZone: "America/Denver", country: "US", region: "CO" });
    expect(list.find((b) => b.code === "RTM")).toMatchObject({ massUnit: "kg", timeZone: "Europe/Amsterdam", country: "NL" });
  });

  it("offers in-service appliances in scope, filtered by text", async () => {
    const scope: ScopeFn = (qb) => qb.where("appliances.organisation_id", orgId);
    const options = await listApplianceOptions(t.db, { scope, branchIds: [branch.TUC], q: "rack", limit: 50 });
    expect(options.length).toBeGreaterThan(0);
    expect(options.every((o) => o.branchId === branch.TUC && o.status === "in_service")).toBe(true);
    expect(options.map((o) => o.tag)).toContain("TUC-RACK-908");
    const disposed = await listApplianceOptions(t.db, { scope, q: "DEN-SA-903", limit: 5 });
    expect(disposed).toEqual([]);
  });

  it("offers a branch's registered cylinders and equipment only", async () => {
    const cylinders = await listCylinderOptions(t.db, {
      scope: (qb) => qb.where("cylinders.organisation_id", orgId),
      branchId: branch.COL,
    });
    expect(cylinders.length).toBeGreaterThan(0);
    expect(cylinders.every((c) => c.branchId === branch.COL)).toBe(true);
    const equipment = await listEquipmentOptions(t.db, {
      scope: (qb) => qb.where("recovery_equipment.organisation_id", orgId),
      branchId: branch.COL,
    });
    const serials = equipment.map((e) => e.serial);
    expect(serials).toContain("COL-RE-01");
    expect(serials).not.toContain("RE-UNREG-925"); // flagged as missing from the register
    expect(serials).not.toContain("COL-RE-05"); // retired
    const nothing = await listEquipmentOptions(t.db, {
      scope: (qb) => qb.where("recovery_equipment.organisation_id", otherOrgId),
      branchId: branch.COL,
    });
    expect(nothing).toEqual([]);
  });
});
