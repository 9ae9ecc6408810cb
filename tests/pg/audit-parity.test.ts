import { afterAll, beforeAll, expect, it } from "vitest";
import { subject } from "@casl/ability";
import { FINDING_GROUP_FIELDS, FINDING_SORT_FIELDS, findingListQuery } from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  acceptFindingFix,
  assignFindings,
  auditFindingCounts,
  auditFindingExportRows,
  certificationExportRows,
  claimAudit,
  collectDigests,
  createAudit,
  cylinderExportRows,
  disposalExportRows,
  getAuditRun,
  getBranchDashboard,
  getFinding,
  getOrganisationAuditSettings,
  getOrganisationOverview,
  jobExportRows,
  leakRateExportRows,
  listAssignableUsers,
  listAudits,
  listFindings,
  loadBranchRecords,
  proposeFindingFix,
  reevaluateBranch,
  runAuditBranches,
  scopeByAbility,
  waiveFinding,
  type Knex,
} from "@coldtrail/db";
import { NOW, PG_URL, ROLES, TODAY, collect, describePg, destroyPair, same, seededPair, signIn, userIdOf, type Pair } from "./pg-helpers";

/**
 * An audit of every branch run on both dialects from the same data finds the same findings (same
 * identity keys, rules, states, deadlines and words); re-runs after workflow changes reconcile the
 * same way; the findings table, dashboards, export rows and digests read the same.
 */

const PERIOD = { periodFrom: "2024-12-01", periodTo: "2026-12-01" };
const ORG = 1;
let pair: Pair;
let branchIds: number[];
const auditIds: Record<"sqlite" | "pg", number[]> = { sqlite: [], pg: [] };

const which = (db: Knex): "sqlite" | "pg" => (db === pair.pg.db ? "pg" : "sqlite");

async function runAudit(db: Knex, ids: number[], now = NOW): Promise<number> {
  const officer = await userIdOf(db, DEMO_SIGN_INS.compliance_officer);
  const id = await createAudit(db, {
    actor: { userId: officer, organisationId: ORG },
    input: { branchIds: ids, ...PERIOD, packs: ["us_federal", "eu"] },
    now,
  });
  expect(await claimAudit(db, { id, now })).toBe(true);
  await runAuditBranches(db, { id, now: () => now });
  auditIds[which(db)].push(id);
  return id;
}

/** What identifies and describes each finding, independent of row order. */
const findingsOf = async (db: Knex) =>
  db("findings")
    .where({ organisation_id: ORG })
    .orderBy("identity_key")
    .select(
      "id",
      "identity_key",
      "rule_id",
      "branch_id",
      "record_type",
      "record_id",
      "appliance_id",
      "technician_id",
      "severity",
      "state",
      "due_on",
      "occurred_on",
      "pack",
      "title",
      "detail",
      "fix",
      "citation",
      "assignee_id",
      "waiver_reason",
      "audit_id",
      "first_audit_id",
    );

beforeAll(async () => {
  if (!PG_URL) return;
  pair = await seededPair();
  branchIds = (await pair.sqlite.db("branches").where({ organisation_id: ORG }).orderBy("id").pluck("id")).map(Number);
  await runAudit(pair.sqlite.db, branchIds);
  await runAudit(pair.pg.db, branchIds);
}, 300_000);
afterAll(async () => {
  await destroyPair(pair);
});

describePg("an audit of every branch", () => {
  it("finds the same findings, by identity key, on both dialects", async () => {
    const found = await same(pair, findingsOf, "findings");
    expect(found.length).toBeGreaterThan(16);
    // Every planted gap's rule family shows up (the list is checked in detail by tests/db/audits-run.test.ts).
    expect(new Set(found.map((f) => f.branch_id))).toEqual(new Set(branchIds));
    await same(
      pair,
      (db) => db("finding_events").orderBy("id").select("finding_id", "action", "from_state", "to_state", "at", "note"),
      "events",
    );
    await same(
      pair,
      (db) => db("audit_findings").orderBy(["audit_id", "finding_id"]).select("audit_id", "finding_id", "branch_id", "severity"),
      "links",
    );
  });

  it("records the same run: state, progress, summary by branch and health", async () => {
    expect(auditIds.pg).toEqual(auditIds.sqlite);
    const id = auditIds.sqlite[0]!;
    const run = await same(pair, (db) => getAuditRun(db, { organisationId: ORG, id }), "run");
    expect(run?.state).toBe("done");
    expect(run?.progress).toBe(100);
    await same(pair, (db) => listAudits(db, { organisationId: ORG, page: 1, pageSize: 20 }), "audits list");
  });

  it("reads the same branch records for the rules", async () => {
    for (const branchId of branchIds) {
      await same(
        pair,
        (db) =>
          loadBranchRecords(db, { organisationId: ORG, branchId, period: { from: PERIOD.periodFrom, to: PERIOD.periodTo }, asOf: NOW }),
        `records of ${branchId}`,
      );
    }
  });

  for (const [role, email] of ROLES) {
    it(`${role}: the findings table agrees on every sort, grouping and filter`, async () => {
      const list = (query: Record<string, unknown>) => async (db: Knex) => {
        const { actor, ability } = await signIn(db, email);
        return listFindings(db, {
          organisationId: actor.organisationId,
          scope: scopeByAbility(ability, "read", "Finding", "findings"),
          query: findingListQuery.parse(query),
          today: TODAY,
        });
      };
      await same(pair, list({ state: "all", pageSize: 200 }), `${role} all`);
      for (const sort of FINDING_SORT_FIELDS) {
        for (const dir of ["asc", "desc"]) await same(pair, list({ sort, dir, state: "all", pageSize: 30 }), `${role} ${sort} ${dir}`);
      }
      for (const groupBy of FINDING_GROUP_FIELDS)
        await same(pair, list({ groupBy, state: "all", pageSize: 200 }), `${role} grouped by ${groupBy}`);
      for (const due of ["overdue", "week", "month", "later", "none"]) await same(pair, list({ due, state: "all" }), `${role} due ${due}`);
      await same(pair, list({ q: "cylinder", severity: "critical" }), `${role} search`);
      await same(pair, list({ auditId: auditIds.sqlite[0], assignee: "none" }), `${role} of the audit, unassigned`);
    });
  }

  it("finding details, counts and export rows agree (officer)", async () => {
    const officer = DEMO_SIGN_INS.compliance_officer;
    const ids = (await pair.sqlite.db("findings").orderBy("id").pluck("id")).map(Number);
    for (const id of ids) {
      await same(
        pair,
        async (db) =>
          getFinding(db, {
            organisationId: ORG,
            scope: scopeByAbility((await signIn(db, officer)).ability, "read", "Finding", "findings"),
            id,
          }),
        `finding ${id}`,
      );
    }
    const auditId = auditIds.sqlite[0]!;
    const exportOf = async (db: Knex) => {
      const { ability } = await signIn(db, officer);
      const { settings } = await getOrganisationAuditSettings(db, ORG);
      const range = { organisationId: ORG, branchIds, from: PERIOD.periodFrom, to: PERIOD.periodTo };
      return {
        counts: await auditFindingCounts(db, {
          organisationId: ORG,
          auditId,
          scope: scopeByAbility(ability, "read", "Finding", "findings"),
        }),
        findings: await collect(
          auditFindingExportRows(db, { organisationId: ORG, auditId, scope: scopeByAbility(ability, "read", "Finding", "findings") }),
        ),
        jobs: await collect(jobExportRows(db, { ...range, scope: scopeByAbility(ability, "read", "Job", "jobs") })),
        leakRates: await collect(
          leakRateExportRows(db, {
            ...range,
            settings,
            jobVisible: (job) =>
              ability.can(
                "read",
                subject("Job", {
                  organisationId: ORG,
                  branchId: job.branchId,
                  technicianId: job.technicianId,
                  performedOn: job.performedOn,
                }),
              ),
          }),
        ),
        cylinders: await collect(
          cylinderExportRows(db, {
            organisationId: ORG,
            branchIds,
            scope: scopeByAbility(ability, "read", "Cylinder", "cylinders"),
            settings,
            asOf: range.to,
          }),
        ),
        certifications: await collect(certificationExportRows(db, { organisationId: ORG, branchIds })),
        disposals: await collect(disposalExportRows(db, { ...range, scope: scopeByAbility(ability, "read", "Disposal", "d") })),
      };
    };
    const workbook = await same(pair, exportOf, "export");
    expect(workbook.findings.length).toBeGreaterThan(0);
    expect(workbook.jobs.length).toBeGreaterThan(1000);
    expect(workbook.leakRates.length).toBeGreaterThan(0);
  });

  it("the overview, every branch dashboard and the assignable people agree", async () => {
    for (const email of [DEMO_SIGN_INS.owner, DEMO_SIGN_INS.branch_manager, DEMO_SIGN_INS.inspector]) {
      await same(
        pair,
        async (db) => {
          const { ability } = await signIn(db, email);
          const readable = branchIds.filter((id) => ability.can("read", subject("Branch", { organisationId: ORG, id, branchId: id })));
          return getOrganisationOverview(db, {
            organisationId: ORG,
            branchIds: readable,
            findingScope: scopeByAbility(ability, "read", "Finding", "findings"),
            today: TODAY,
          });
        },
        `overview for ${email}`,
      );
    }
    for (const branchId of branchIds) {
      const dashboard = await same(
        pair,
        async (db) => {
          const { ability } = await signIn(db, DEMO_SIGN_INS.owner);
          return getBranchDashboard(db, {
            organisationId: ORG,
            branchId,
            today: TODAY,
            months: 24,
            findingScope: scopeByAbility(ability, "read", "Finding", "findings"),
            jobScope: scopeByAbility(ability, "read", "Job", "jobs"),
            purchaseScope: scopeByAbility(ability, "read", "Purchase", "purchases"),
            shipmentScope: scopeByAbility(ability, "read", "ReclaimShipment", "reclaim_shipments"),
            includeLeakWatchlist: true,
          });
        },
        `dashboard of ${branchId}`,
      );
      expect(dashboard.findingsByRule.length, `branch ${branchId} has findings`).toBeGreaterThan(0);
    }
    await same(pair, (db) => listAssignableUsers(db, { organisationId: ORG }), "assignable");
    await same(pair, (db) => listAssignableUsers(db, { organisationId: ORG, branchIds: [branchIds[0]!] }), "assignable in one branch");
  });
});

describePg("the findings workflow and re-runs", () => {
  it("assign, propose, accept, waive and re-run reconcile the same way on both dialects", async () => {
    const later = new Date("2026-12-02T09:00:00Z");
    const flow = async (db: Knex) => {
      const officer = await signIn(db, DEMO_SIGN_INS.compliance_officer, later);
      const manager = await signIn(db, DEMO_SIGN_INS.branch_manager, later);
      const officerRef = { userId: officer.actor.userId, organisationId: ORG };
      const managerRef = { userId: manager.actor.userId, organisationId: ORG };
      const managerBranch = manager.actor.memberships.find((m) => m.branchId !== null)!.branchId!;
      const open = await db("findings")
        .where({ organisation_id: ORG, branch_id: managerBranch, state: "open" })
        .orderBy("identity_key")
        .limit(2)
        .pluck("id");
      const other = await db("findings")
        .where({ organisation_id: ORG, state: "open" })
        .whereNot({ branch_id: managerBranch })
        .orderBy("identity_key")
        .first("id");
      const [toFix, toKeep] = open.map(Number);
      const scope = (who: typeof officer, action: Parameters<typeof scopeByAbility>[1]) =>
        scopeByAbility(who.ability, action, "Finding", "findings");
      const assigned = await assignFindings(db, {
        actor: officerRef,
        scope: scope(officer, "assign"),
        findingIds: [toFix!, toKeep!],
        assigneeId: manager.actor.userId,
        now: later,
      });
      const proposed = await proposeFindingFix(db, {
        actor: managerRef,
        scope: scope(manager, "propose_fix"),
        id: toFix!,
        note: "Fixed in the records",
        now: later,
      });
      const accepted = await acceptFindingFix(db, {
        actor: officerRef,
        scope: scope(officer, "accept"),
        id: toFix!,
        note: "Checked",
        now: later,
      });
      const waived = await waiveFinding(db, {
        actor: officerRef,
        scope: scope(officer, "waive"),
        id: Number(other.id),
        reason: "Covered by a written exemption on file",
        now: later,
      });
      const rerun = await runAudit(db, branchIds, later);
      const reevaluated = await reevaluateBranch(db, {
        organisationId: ORG,
        branchId: managerBranch,
        now: later,
        triggeredBy: manager.actor.userId,
      });
      return {
        ids: { toFix, toKeep, other: Number(other.id) },
        assigned: assigned.assigned,
        states: [proposed.state, accepted.state, waived.state],
        rerun: await getAuditRun(db, { organisationId: ORG, id: rerun }),
        reevaluated,
        findings: await findingsOf(db),
        events: await db("finding_events").orderBy("id").select("finding_id", "actor_id", "action", "from_state", "to_state", "note"),
        notifications: await db("notifications").orderBy("id").select("user_id", "kind", "title", "subject_type", "subject_id"),
        digests: await collectDigests(db, { organisationId: ORG, today: "2026-12-02" }),
      };
    };
    const result = await same(pair, flow, "workflow");
    expect(result.assigned).toBe(2);
    expect(result.states).toEqual(["fix_proposed", "closed", "waived"]);
    expect(result.findings.find((f) => f.id === result.ids.other)?.state).toBe("waived");
    expect(result.notifications.length).toBeGreaterThan(0);
  }, 300_000);
});
