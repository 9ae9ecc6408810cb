import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { defineAbilityFor, disposalRecordInput, findingListQuery, type RulePack } from "@coldtrail/core";
import {
  amendRecord,
  claimAudit,
  createAudit,
  createDisposalRecord,
  describeAuditFailure,
  failAuditWithReference,
  getAuditRun,
  getFinding,
  listFindings,
  loadActor,
  RecordConflictError,
  reevaluateBranch,
  runAuditBranches,
  scopeByAbility,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

const NOW = new Date("2026-12-01T15:00:00Z");
const PERIOD = { periodFrom: "2024-12-01", periodTo: "2026-12-01" };
const ALL_PACKS: RulePack[] = ["us_federal", "eu"];

let t: TestDb;
let officer: { userId: number; organisationId: number };
const branch: Record<string, number> = {};

async function userId(email: string): Promise<number> {
  return Number((await t.db("users").where({ email }).first("id")).id);
}

async function audit(codes: string[], packs: RulePack[] = ALL_PACKS, now = NOW): Promise<number> {
  const id = await createAudit(t.db, {
    actor: officer,
    input: { branchIds: codes.map((c) => branch[c]!), ...PERIOD, packs },
    now,
  });
  expect(await claimAudit(t.db, { id, now })).toBe(true);
  const run = await runAuditBranches(t.db, { id, now: () => now });
  expect(run.state).toBe("done");
  return id;
}

/** Every finding of the organisation with its state and the branches it shows in. */
async function snapshot(): Promise<string[]> {
  const rows = await t.db("findings").where({ organisation_id: 1 }).orderBy("id").select("id", "identity_key", "state", "branch_id");
  const shown = await t.db("finding_branches").where({ organisation_id: 1 }).orderBy(["finding_id", "branch_id"]).select();
  return rows.map((r) => {
    const also = shown.filter((s) => Number(s.finding_id) === Number(r.id)).map((s) => Number(s.branch_id));
    return `${r.id} ${r.identity_key} ${r.state} ${[...new Set([Number(r.branch_id), ...also])].sort().join(",")}`;
  });
}

async function listFor(email: string, query: Record<string, unknown> = {}) {
  const actor = (await loadActor(t.db, await userId(email)))!;
  const ability = defineAbilityFor(actor, NOW);
  const res = await listFindings(t.db, {
    organisationId: 1,
    scope: scopeByAbility(ability, "read", "Finding", "findings"),
    query: findingListQuery.parse({ pageSize: 200, state: "all", ...query }),
    today: "2026-12-01",
  });
  return res.rows;
}

/** Non-empty subsets of `items`. */
function combinations<T>(items: T[]): T[][] {
  const out: T[][] = [];
  for (let mask = 1; mask < 1 << items.length; mask++) out.push(items.filter((_, i) => mask & (1 << i)));
  return out;
}

beforeAll(async () => {
  t = await createSeededTestDb();
  officer = { userId: await userId("teodora.vasquez-lind@kestrelmoor.example"), organisationId: 1 };
  for (const b of await t.db("branches").select("id", "code")) branch[b.code] = Number(b.id);
}, 120_000);

afterAll(async () => {
  await t?.destroy();
});

describe("a technician who works in two branches", () => {
  let cardFinding: { id: number; branch_id: number };
  let baseline: string[];

  beforeAll(async () => {
    await audit(["TUC", "PIA", "RTM"]);
    baseline = await snapshot();
    const diego = await userId("diego.castellanos-reyes@kestrelmoor.example");
    cardFinding = await t.db("findings").where({ rule_id: "CT-CERT-02", technician_id: diego }).first("id", "branch_id", "state");
  }, 120_000);

  it("has one card finding for the organisation, shown in both of the technician's branches", async () => {
    const diego = await userId("diego.castellanos-reyes@kestrelmoor.example");
    const all = await t.db("findings").where({ rule_id: "CT-CERT-02", technician_id: diego }).select("id", "state");
    expect(all).toEqual([{ id: cardFinding.id, state: "open" }]);
    const shownIn = await t.db("finding_branches").where({ finding_id: cardFinding.id }).orderBy("branch_id").pluck("branch_id");
    expect(shownIn.map(Number)).toEqual([branch.TUC, branch.PIA].sort((a, b) => a! - b!));
  });

  it("gives the same findings when any combination of branches is audited twice, or re-checked after a change", async () => {
    for (const codes of combinations(["TUC", "PIA", "RTM"])) {
      await audit(codes);
      expect(await snapshot(), `after auditing ${codes.join(" + ")}`).toEqual(baseline);
      await audit(codes);
      expect(await snapshot(), `after auditing ${codes.join(" + ")} again`).toEqual(baseline);
      for (const code of codes) {
        const summary = await reevaluateBranch(t.db, { organisationId: 1, branchId: branch[code]!, now: NOW });
        expect(summary, `re-check of ${code}`).not.toBeNull();
        expect(await snapshot(), `after re-checking ${code}`).toEqual(baseline);
      }
    }
  }, 300_000);

  it("counts the finding in each branch's summary but once in the audit's totals", async () => {
    const id = await audit(["TUC", "PIA"]);
    const run = (await getAuditRun(t.db, { organisationId: 1, id }))!;
    const byBranch = run.summary!.branches.map((b) => b.foundByRule["CT-CERT-02"] ?? 0);
    expect(byBranch).toEqual([1, 1]);
    const linked = await t.db("audit_findings").where({ audit_id: id }).count({ n: "*" }).first();
    expect(run.summary!.totals.found).toBe(Number(linked!.n));
  });

  it("shows the finding to the managers of both branches and to the technician, not to other branches", async () => {
    const seen = async (email: string) => (await listFor(email)).some((f) => f.id === cardFinding.id);
    expect(await seen("lucia.baptiste-moreno@kestrelmoor.example")).toBe(true); // manager, Tucson
    expect(await seen("danielle.achterberg@kestrelmoor.example")).toBe(true); // manager, Peoria
    expect(await seen("diego.castellanos-reyes@kestrelmoor.example")).toBe(true); // the technician
    expect(await seen("grant.oyelaran@kestrelmoor.example")).toBe(false); // manager, Columbus
    expect(await seen("harold.penwick@statewide-review.example")).toBe(false); // inspector, Denver
    expect(await seen("femke.oudendijk@kestrelmoor.example")).toBe(false); // manager, Rotterdam
  });

  it("lists the finding under either branch's filter, and its page names both branches", async () => {
    const officerEmail = "teodora.vasquez-lind@kestrelmoor.example";
    for (const code of ["TUC", "PIA"])
      expect((await listFor(officerEmail, { branchId: branch[code] })).map((f) => f.id)).toContain(cardFinding.id);
    expect((await listFor(officerEmail, { branchId: branch.COL })).map((f) => f.id)).not.toContain(cardFinding.id);
    const actor = (await loadActor(t.db, await userId("danielle.achterberg@kestrelmoor.example")))!;
    const detail = await getFinding(t.db, {
      organisationId: 1,
      scope: scopeByAbility(defineAbilityFor(actor, NOW), "read", "Finding", "findings"),
      id: cardFinding.id,
    });
    expect(detail?.branches.map((b) => b.name).sort()).toEqual(["Peoria", "Tucson"]);
  });

  it("stops showing the finding in a branch the technician left, and keeps it in the other", async () => {
    const diego = await userId("diego.castellanos-reyes@kestrelmoor.example");
    await t.db("memberships").where({ user_id: diego, branch_id: branch.PIA, role: "technician" }).del();
    await audit(["PIA"]);
    const shownIn = await t.db("finding_branches").where({ finding_id: cardFinding.id }).pluck("branch_id");
    expect(shownIn.map(Number)).toEqual([branch.TUC]);
    const row = await t.db("findings").where({ id: cardFinding.id }).first("state", "branch_id");
    expect(row).toEqual({ state: "open", branch_id: branch.TUC });
    await t.db("memberships").insert({
      organisation_id: 1,
      user_id: diego,
      branch_id: branch.PIA,
      role: "technician",
      created_at: NOW.toISOString(),
    });
    await audit(["PIA"]);
    const again = await t.db("finding_branches").where({ finding_id: cardFinding.id }).orderBy("branch_id").pluck("branch_id");
    expect(again.map(Number)).toEqual([branch.TUC, branch.PIA].sort((a, b) => a! - b!));
  });
});

describe("rule packs follow the branch's place", () => {
  let auditId: number;

  beforeAll(async () => {
    auditId = await audit(["COL", "RTM"], ALL_PACKS);
  }, 120_000);

  it("gives the EU branch EU leak-check findings and no US federal findings", async () => {
    const rows = await t.db("findings").where({ branch_id: branch.RTM }).select("rule_id", "pack", "title");
    const rules = new Set(rows.map((r) => r.rule_id));
    // Source: Regulation (EU) 2024/573 Art. 5 (leak checks by CO2e band) and Art. 6 (leak detection at 500 t CO2e).
    expect(rules).toEqual(new Set(["CT-EU-01", "CT-EU-02"]));
    expect(rows.every((r) => r.pack === "eu")).toBe(true);
    const run = (await getAuditRun(t.db, { organisationId: 1, id: auditId }))!;
    expect(run.summary!.branches.find((b) => b.branchId === branch.RTM)!.packs).toEqual(["eu"]);
  });

  it("never gives a US branch an EU finding, even when the audit includes the EU pack", async () => {
    const eu = await t.db("findings").whereIn("branch_id", [branch.COL, branch.TUC, branch.DEN, branch.PIA]).where({ pack: "eu" });
    expect(eu).toEqual([]);
    const run = (await getAuditRun(t.db, { organisationId: 1, id: auditId }))!;
    expect(run.summary!.branches.find((b) => b.branchId === branch.COL)!.packs).toEqual(["us_federal"]);
  });

  it("applies no pack to a branch when the audit chose only packs that do not cover it", async () => {
    const id = await audit(["RTM"], ["us_federal"]);
    const run = (await getAuditRun(t.db, { organisationId: 1, id }))!;
    expect(run.summary!.branches[0]!.packs).toEqual([]);
    expect(run.summary!.branches[0]!.found).toBe(0);
    // The EU findings are left alone: this audit did not look at EU rules.
    const open = await t.db("findings").where({ branch_id: branch.RTM, state: "open" }).count({ n: "*" }).first();
    expect(Number(open!.n)).toBeGreaterThan(0);
  });

  it("closes an EU finding stored on a branch that is not in the EU when the EU pack runs there", async () => {
    const [stale] = await t
      .db("findings")
      .insert({
        organisation_id: 1,
        branch_id: branch.COL,
        rule_id: "CT-EU-01",
        identity_key: "CT-EU-01:appliance:999999",
        record_type: "appliance",
        record_id: 999999,
        severity: "major",
        pack: "eu",
        state: "open",
        title: "EU leak check overdue",
        detail: "Left from when the EU pack applied to the whole organisation",
        fix: "—",
        citation: "Regulation (EU) 2024/573 Art. 5",
        opened_at: "2026-06-01T00:00:00.000Z",
        last_seen_at: "2026-06-01T00:00:00.000Z",
        state_changed_at: "2026-06-01T00:00:00.000Z",
        updated_at: "2026-06-01T00:00:00.000Z",
      })
      .returning("id");
    const staleId = Number(stale.id ?? stale);
    await audit(["COL"], ALL_PACKS);
    expect((await t.db("findings").where({ id: staleId }).first("state")).state).toBe("no_longer_found");
  });
});

describe("a correction of a finding's record goes to review", () => {
  it("turns the open finding into a proposed fix with the amendment as its evidence", async () => {
    await audit(["TUC"]);
    const finding = await t
      .db("findings as f")
      .join("jobs as j", "j.id", "f.record_id")
      .join("appliances as a", "a.id", "j.appliance_id")
      .where({ "f.rule_id": "CT-ACCESS-01", "a.tag": "TUC-SA-912" })
      .first("f.id", "f.record_id", "f.state");
    expect(finding.state).toBe("open");
    const manager = await userId("lucia.baptiste-moreno@kestrelmoor.example");
    const amendmentId = await t.db.transaction((trx) =>
      amendRecord(trx, {
        table: "jobs",
        subjectType: "Job",
        id: Number(finding.record_id),
        organisationId: 1,
        actorId: manager,
        reason: "The technician confirmed the line tap was taken off",
        changes: { temporary_access_removed: true },
        summary: "Recorded that the line tap was removed",
        at: "2026-12-01T15:05:00.000Z",
      }),
    );
    const summary = await reevaluateBranch(t.db, {
      organisationId: 1,
      branchId: branch.TUC!,
      now: new Date("2026-12-01T15:06:00Z"),
      triggeredBy: manager,
    });
    expect(summary!.fixProposed).toBe(1);
    const row = await t.db("findings").where({ id: finding.id }).first("state", "closed_at");
    expect(row).toEqual({ state: "fix_proposed", closed_at: null });
    const event = await t.db("finding_events").where({ finding_id: finding.id }).orderBy("id", "desc").first();
    expect(event).toMatchObject({ action: "fix_proposed", from_state: "open", to_state: "fix_proposed", actor_id: manager });
    expect(JSON.parse(event.data).amendments).toEqual([
      expect.objectContaining({ id: amendmentId, subjectType: "Job", reason: "The technician confirmed the line tap was taken off" }),
    ]);
    expect(await t.db("finding_events").where({ finding_id: finding.id, action: "no_longer_found" })).toEqual([]);

    // Later audits of the unchanged records leave the proposed fix waiting for the officer, once.
    const events = await t.db("finding_events").where({ finding_id: finding.id }).count({ n: "*" }).first();
    await audit(["TUC"], ["us_federal"], new Date("2026-12-01T16:00:00Z"));
    await reevaluateBranch(t.db, { organisationId: 1, branchId: branch.TUC!, now: new Date("2026-12-01T16:05:00Z") });
    expect((await t.db("findings").where({ id: finding.id }).first("state")).state).toBe("fix_proposed");
    const after = await t.db("finding_events").where({ finding_id: finding.id }).count({ n: "*" }).first();
    expect(Number(after!.n)).toBe(Number(events!.n));
  });

  it("lets a new record close its gap as no longer found", async () => {
    await audit(["COL"], ["us_federal"]);
    const appliance = await t.db("appliances").where({ tag: "COL-RES-904" }).first("id", "refrigerant", "disposed_on");
    const finding = await t.db("findings").where({ rule_id: "CT-DISP-01", appliance_id: appliance.id }).first("id", "state");
    expect(finding.state).toBe("open");
    const manager = await userId("grant.oyelaran@kestrelmoor.example");
    await createDisposalRecord(t.db, {
      actor: { userId: manager, organisationId: 1 },
      input: disposalRecordInput.parse({
        applianceId: appliance.id,
        disposedOn: appliance.disposed_on,
        companyName: "Kestrelmoor Climate Services",
        applianceLocation: "Customer site, Columbus OH",
        recoveredOn: appliance.disposed_on,
        refrigerant: appliance.refrigerant,
        recoveredAmount: "3.5",
        recoveredUnit: "lb",
      }),
      now: new Date("2026-12-01T15:10:00Z"),
    });
    await reevaluateBranch(t.db, { organisationId: 1, branchId: branch.COL!, now: new Date("2026-12-01T15:11:00Z"), triggeredBy: manager });
    expect((await t.db("findings").where({ id: finding.id }).first("state")).state).toBe("no_longer_found");
  });
});

describe("an audit that fails", () => {
  it("stores a plain message with a reference and logs one line without the SQL", async () => {
    const id = await createAudit(t.db, {
      actor: officer,
      input: { branchIds: [branch.COL!], ...PERIOD, packs: ["us_federal"] },
      now: NOW,
    });
    await claimAudit(t.db, { id, now: NOW });
    // A real driver error, whose message holds the whole statement with its values.
    const error = await t
      .db("findings")
      .insert({ id: 1, organisation_id: 1, branch_id: branch.COL, rule_id: "X", identity_key: "secret-identity" })
      .then(() => null)
      .catch((e: unknown) => e);
    expect(String((error as Error).message)).toMatch(/insert into/i);
    const lines: string[] = [];
    const failure = await failAuditWithReference(t.db, { id, error, now: NOW, log: (l) => lines.push(l) });
    const run = (await getAuditRun(t.db, { organisationId: 1, id }))!;
    expect(run.state).toBe("failed");
    expect(failure.reference).toMatch(/^AUD-[A-Z2-9]{6}$/);
    expect(run.error).toContain(`reference ${failure.reference}`);
    expect(run.error).toMatch(/^Something went wrong while the records were checked/);
    expect(run.error).not.toMatch(/insert into|`findings`|secret-identity|SQLITE/i);
    expect(lines).toHaveLength(1);
    expect(lines[0]).toContain(failure.reference);
    expect(lines[0]).toMatch(/SqliteError SQLITE_/);
    expect(lines[0]).not.toMatch(/insert|secret-identity/i);
  });

  it("shows the words of our own errors, which are written for people, and hides any other error's", () => {
    const ours = describeAuditFailure(new RecordConflictError("Audit #4 is done, not running"), "audit #4", "AUD-ABCDEF");
    expect(ours.message).toMatch(/^Audit #4 is done, not running\. .*reference AUD-ABCDEF\.$/);
    expect(ours.logLine).toBe("[audits] audit #4 failed, reference AUD-ABCDEF: RecordConflictError conflict");
    const other = describeAuditFailure(new TypeError("Cannot read properties of undefined (reading 'id')"), "audit #5", "AUD-GHJKLM");
    expect(other.message).not.toContain("undefined");
    expect(other.logLine).toBe("[audits] audit #5 failed, reference AUD-GHJKLM: TypeError");
  });
});
