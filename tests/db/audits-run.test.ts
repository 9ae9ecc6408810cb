import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { defineAbilityFor, findingListQuery, type FindingListQuery } from "@coldtrail/core";
import {
  amendRecord,
  auditFindingExportRows,
  claimAudit,
  createAudit,
  getAuditRun,
  listFindings,
  loadActor,
  reevaluateBranch,
  requeueInterruptedAudits,
  runAuditBranches,
  scopeByAbility,
  type FindingListRow,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";
import { PLANTED_GAPS } from "../e2e/demo-data";

const NOW = new Date("2026-12-01T15:00:00Z");
const PERIOD = { periodFrom: "2024-12-01", periodTo: "2026-12-01" };

let t: TestDb;
let officer: { userId: number; organisationId: number };
let branchIds: number[];

async function userId(email: string): Promise<number> {
  return Number((await t.db("users").where({ email }).first("id")).id);
}

async function runAudit(ids = branchIds): Promise<number> {
  const id = await createAudit(t.db, { actor: officer, input: { branchIds: ids, ...PERIOD, packs: ["us_federal"] }, now: NOW });
  expect(await claimAudit(t.db, { id, now: NOW })).toBe(true);
  await runAuditBranches(t.db, { id, now: () => NOW });
  return id;
}

async function officerFindings(query: Partial<FindingListQuery>): Promise<FindingListRow[]> {
  const actor = (await loadActor(t.db, officer.userId))!;
  const ability = defineAbilityFor(actor, NOW);
  const rows: FindingListRow[] = [];
  for (let page = 1; ; page++) {
    const res = await listFindings(t.db, {
      organisationId: officer.organisationId,
      scope: scopeByAbility(ability, "read", "Finding", "findings"),
      query: findingListQuery.parse({ pageSize: 200, page, ...query }),
      today: "2026-12-01",
    });
    rows.push(...res.rows);
    if (res.rows.length < 200) return rows;
  }
}

const matches = (gap: (typeof PLANTED_GAPS)[number]) => (f: FindingListRow) =>
  gap.ruleIds.includes(f.ruleId) && f.branchName === gap.branch && (f.applianceTag === gap.record || f.recordLabel.includes(gap.record));

beforeAll(async () => {
  t = await createSeededTestDb();
  officer = { userId: await userId("teodora.vasquez-lind@kestrelmoor.example"), organisationId: 1 };
  branchIds = (await t.db("branches").where({ organisation_id: 1 }).orderBy("id").select("id")).map((b) => Number(b.id));
}, 120_000);

afterAll(async () => {
  await t?.destroy();
});

describe("an audit of every demo branch", () => {
  let first: number;
  let firstFindings: FindingListRow[];

  beforeAll(async () => {
    first = await runAudit();
    firstFindings = await officerFindings({ auditId: first, state: "all" });
  }, 120_000);

  it("finishes with progress 100 and a summary by branch", async () => {
    const run = (await getAuditRun(t.db, { organisationId: 1, id: first }))!;
    expect(run.state).toBe("done");
    expect(run.progress).toBe(100);
    expect(run.branchesDone.sort()).toEqual([...branchIds].sort());
    expect(run.summary!.branches.map((b) => b.branchName).sort()).toEqual(["Columbus", "Denver", "Peoria", "Rotterdam", "Tucson"]);
    expect(run.summary!.totals.found).toBe(firstFindings.length);
  });

  for (const gap of PLANTED_GAPS) {
    it(`finds planted gap ${gap.gap} (${gap.ruleIds.join(" or ")} on ${gap.record})`, () => {
      expect(firstFindings.filter(matches(gap)).length, JSON.stringify(gap)).toBeGreaterThanOrEqual(1);
    });
  }

  it("names the technician of the work a finding is about, and gives every finding a due date", async () => {
    const g01 = firstFindings.find(matches(PLANTED_GAPS[0]!))!;
    expect(g01.technicianName).toBe("Caleb Runyon");
    const g08 = firstFindings.find(matches(PLANTED_GAPS.find((g) => g.gap === "G08")!))!;
    expect(g08.technicianName).toBe("Rafael Ibarra-Quint");
    expect(g08.dueOn).toBe("2026-10-12"); // the rule's own deadline: 30 days after the exceedance
    expect(firstFindings.every((f) => f.dueOn !== null)).toBe(true);
    const g12 = firstFindings.find(matches(PLANTED_GAPS.find((g) => g.gap === "G12")!))!;
    expect(g12.dueOn).toBe("2026-12-31"); // major, no deadline of its own: 30 days from today
  });

  it("writes one opened event per finding and one activity row per branch checked", async () => {
    const events = await t
      .db("finding_events")
      .whereIn(
        "finding_id",
        firstFindings.map((f) => f.id),
      )
      .where({ action: "opened" })
      .count({ n: "*" })
      .first();
    expect(Number(events!.n)).toBe(firstFindings.length);
    const activity = await t.db("activity").where({ action: "audit.branch_checked", subject_id: first }).count({ n: "*" }).first();
    expect(Number(activity!.n)).toBe(branchIds.length);
  });

  it("a re-run keeps each finding's identity and links it to both audits", async () => {
    const second = await runAudit();
    const again = await officerFindings({ auditId: second, state: "all" });
    expect(again.map((f) => f.id).sort((a, b) => a - b)).toEqual(firstFindings.map((f) => f.id).sort((a, b) => a - b));
    const total = await t.db("findings").where({ organisation_id: 1 }).count({ n: "*" }).first();
    expect(Number(total!.n)).toBe(firstFindings.length);
    const run = (await getAuditRun(t.db, { organisationId: 1, id: second }))!;
    expect(run.summary!.totals.created).toBe(0);
    expect(run.summary!.totals.noLongerFound).toBe(0);
  });

  it("a re-run after the record is fixed closes the finding as no longer found", async () => {
    const gap = PLANTED_GAPS.find((g) => g.gap === "G12")!;
    const finding = firstFindings.find(matches(gap))!;
    await t.db.transaction((trx) =>
      amendRecord(trx, {
        table: "jobs",
        subjectType: "Job",
        id: finding.recordId!,
        organisationId: 1,
        actorId: officer.userId,
        reason: "The technician went back and removed the line tap",
        changes: { temporary_access_removed: true },
        summary: "Recorded that the line tap was removed",
      }),
    );
    const third = await runAudit([finding.branchId]);
    const row = await t.db("findings").where({ id: finding.id }).first("state", "closed_at");
    expect(row.state).toBe("no_longer_found");
    const event = await t.db("finding_events").where({ finding_id: finding.id, action: "no_longer_found" }).first("note", "from_state");
    expect(event.note).toBe(`Audit #${third} no longer finds this gap in the records`);
    expect(event.from_state).toBe("open");
    const run = (await getAuditRun(t.db, { organisationId: 1, id: third }))!;
    expect(run.summary!.totals.noLongerFound).toBe(1);
  });

  it("the export rows of an audit are exactly its findings, once each", async () => {
    const actor = (await loadActor(t.db, officer.userId))!;
    const scope = scopeByAbility(defineAbilityFor(actor, NOW), "read", "Finding", "findings");
    const ids: number[] = [];
    for await (const r of auditFindingExportRows(t.db, { organisationId: 1, auditId: first, scope })) ids.push(r.id);
    expect(ids).toEqual(firstFindings.map((f) => f.id).sort((a, b) => a - b));
  });
});

describe("continuous audit after a record is saved", () => {
  it("raises a new finding for the saved record without waiting for the next run", async () => {
    const tech = await userId("marcus.delacroix-byrd@kestrelmoor.example");
    const col = Number((await t.db("branches").where({ code: "COL" }).first("id")).id);
    const appliance = await t.db("appliances").where({ branch_id: col, tag: "COL-RES-101" }).first("id", "refrigerant");
    const [job] = await t
      .db("jobs")
      .insert({
        organisation_id: 1,
        branch_id: col,
        appliance_id: appliance.id,
        technician_id: tech,
        kind: "recovery",
        performed_on: "2026-11-30",
        refrigerant: appliance.refrigerant,
        recovered_g: 0,
        charged_g: 0,
        access_method: "piercing_pliers",
        temporary_access_removed: false,
        evacuation_value: 15,
        evacuation_unit: "in_hg_vacuum",
        source: "field",
        created_by: tech,
        created_at: NOW.toISOString(),
        updated_at: NOW.toISOString(),
      })
      .returning("id");
    const jobId = Number(job.id ?? job);
    const summary = await reevaluateBranch(t.db, { organisationId: 1, branchId: col, now: NOW, triggeredBy: tech });
    expect(summary).not.toBeNull();
    expect(summary!.created).toBeGreaterThanOrEqual(1);
    const finding = await t
      .db("findings")
      .where({ identity_key: `CT-ACCESS-01:job:${jobId}` })
      .first("state", "audit_id", "technician_id");
    expect(finding).toMatchObject({ state: "open", audit_id: null, technician_id: tech });
  });

  it("leaves a branch that was never audited alone", async () => {
    const boise = Number((await t.db("branches").where({ code: "BOI" }).first("id")).id);
    expect(await reevaluateBranch(t.db, { organisationId: 2, branchId: boise, now: NOW })).toBeNull();
  });
});

describe("a run interrupted by a restart", () => {
  it("goes back to the queue and resumes with the branches not done yet", async () => {
    const id = await createAudit(t.db, { actor: officer, input: { branchIds, ...PERIOD, packs: ["us_federal"] }, now: NOW });
    await claimAudit(t.db, { id, now: NOW });
    // The server stopped after the first branch.
    const firstBranch = (await getAuditRun(t.db, { organisationId: 1, id }))!.branchIds[0]!;
    await t
      .db("audits")
      .where({ id })
      .update({ branches_done: JSON.stringify([firstBranch]), heartbeat_at: "2026-12-01T14:00:00.000Z", progress: 25 });
    const { requeued, failed } = await requeueInterruptedAudits(t.db, { staleBefore: new Date("2026-12-01T14:58:00Z"), now: NOW });
    expect(requeued).toContain(id);
    expect(failed).not.toContain(id);
    expect((await getAuditRun(t.db, { organisationId: 1, id }))!.state).toBe("queued");
    expect(await claimAudit(t.db, { id, now: NOW })).toBe(true);
    const run = await runAuditBranches(t.db, { id, now: () => NOW });
    expect(run.state).toBe("done");
    expect(run.attempts).toBe(2);
    const checked = await t.db("activity").where({ action: "audit.branch_checked", subject_id: id }).count({ n: "*" }).first();
    expect(Number(checked!.n)).toBe(branchIds.length - 1);
  });

  it("fails with a reason after repeated interruptions", async () => {
    const id = await createAudit(t.db, {
      actor: officer,
      input: { branchIds: [branchIds[0]!], ...PERIOD, packs: ["us_federal"] },
      now: NOW,
    });
    await claimAudit(t.db, { id, now: NOW });
    await t.db("audits").where({ id }).update({ attempts: 3, heartbeat_at: "2026-12-01T10:00:00.000Z" });
    const { failed } = await requeueInterruptedAudits(t.db, { staleBefore: new Date("2026-12-01T14:58:00Z"), now: NOW });
    expect(failed).toContain(id);
    const run = (await getAuditRun(t.db, { organisationId: 1, id }))!;
    expect(run.state).toBe("failed");
    expect(run.error).toMatch(/interrupted 3 times/);
  });

  it("a queued run can be claimed once only", async () => {
    const id = await createAudit(t.db, {
      actor: officer,
      input: { branchIds: [branchIds[0]!], ...PERIOD, packs: ["us_federal"] },
      now: NOW,
    });
    expect(await claimAudit(t.db, { id })).toBe(true);
    expect(await claimAudit(t.db, { id })).toBe(false);
  });
});

describe("creating an audit", () => {
  it("refuses a branch of another organisation and writes nothing", async () => {
    const boise = Number((await t.db("branches").where({ code: "BOI" }).first("id")).id);
    const before = await t.db("audits").count({ n: "*" }).first();
    await expect(
      createAudit(t.db, { actor: officer, input: { branchIds: [branchIds[0]!, boise], ...PERIOD, packs: ["us_federal"] } }),
    ).rejects.toMatchObject({
      code: "invalid",
      field: "branchIds",
    });
    const after = await t.db("audits").count({ n: "*" }).first();
    expect(Number(after!.n)).toBe(Number(before!.n));
  });
});
