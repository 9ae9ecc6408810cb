import type { Knex } from "knex";
import {
  findingRefResolver,
  reconcileFindings,
  runAudit,
  type AuditPeriod,
  type AuditSettings,
  type Finding,
  type FindingState,
  type RulePack,
  type Severity,
} from "@coldtrail/core";
import { appendActivity } from "../activity";
import { loadBranchRecords } from "./load-branch-records";

type Row = Record<string, any>;

export interface BranchAuditSummary {
  branchId: number;
  branchName: string;
  /** Findings this run found (any state). */
  found: number;
  foundBySeverity: Record<Severity, number>;
  foundByRule: Record<string, number>;
  created: number;
  foundAgain: number;
  noLongerFound: number;
  /** Open or fix-proposed findings of the branch after the run, by severity (all findings of the branch, not only this run's). */
  activeAfter: Record<Severity, number>;
  recordsAudited: number;
  asOf: string;
}

const zeroSeverities = (): Record<Severity, number> => ({ critical: 0, major: 0, minor: 0 });
const CHUNK = 200;
/** What the rules write on a finding; compared to tell a changed finding from one found again as it was. */
const CONTENT_COLUMNS = [
  "rule_id",
  "record_type",
  "record_id",
  "appliance_id",
  "technician_id",
  "severity",
  "pack",
  "title",
  "detail",
  "fix",
  "citation",
  "occurred_on",
  "data",
] as const;

/**
 * Runs the rules over one branch and reconciles the branch's stored findings with what they found,
 * in one transaction: new findings open (with their due date), findings found again keep their
 * identity (and state, unless they were no longer found), findings of the period that are gone are
 * "no longer found". Each change writes a finding event; the run writes one activity row.
 * With an `auditId`, every finding the run saw is linked to the audit; without one (a record was
 * saved, continuous audit) the findings are reconciled on their own.
 */
export async function auditBranchFindings(
  db: Knex,
  opts: {
    organisationId: number;
    branchId: number;
    period: AuditPeriod;
    packs: readonly RulePack[];
    settings: AuditSettings;
    auditId: number | null;
    now: Date;
    /** Person whose write triggered a continuous re-evaluation (activity only). */
    triggeredBy?: number | null;
  },
): Promise<BranchAuditSummary> {
  const loaded = await loadBranchRecords(db, {
    organisationId: opts.organisationId,
    branchId: opts.branchId,
    period: opts.period,
    asOf: opts.now,
  });
  const found = runAudit(loaded.records, { packs: [...opts.packs], period: opts.period, asOf: opts.now, settings: opts.settings });
  const refsOf = findingRefResolver(loaded.records);
  const applianceIds = new Set(loaded.records.appliances.map((a) => a.id));
  const at = opts.now.toISOString();

  return db.transaction(async (trx) => {
    const stored = await trx("findings")
      .where({ organisation_id: opts.organisationId, branch_id: opts.branchId })
      .select("id", "identity_key", "rule_id", "state", "occurred_on", "due_on", ...CONTENT_COLUMNS);
    const storedById = new Map(stored.map((s) => [Number(s.id), s as Row]));
    const rec = reconcileFindings({
      stored: stored.map((s) => ({
        id: Number(s.id),
        identityKey: s.identity_key,
        ruleId: s.rule_id,
        state: s.state as FindingState,
        occurredOn: s.occurred_on ?? null,
        dueOn: s.due_on ?? null,
      })),
      found,
      scope: { period: opts.period, packs: opts.packs },
      today: loaded.asOf,
    });

    const content = (f: Finding) => {
      const refs = refsOf(f);
      return {
        rule_id: f.ruleId,
        record_type: f.recordType,
        record_id: f.recordId,
        appliance_id: refs.applianceId !== null && applianceIds.has(refs.applianceId) ? refs.applianceId : null,
        technician_id: refs.technicianId,
        severity: f.severity,
        pack: f.pack,
        title: f.title,
        detail: f.detail,
        fix: f.fix,
        citation: f.citation,
        occurred_on: f.on ?? null,
        data: JSON.stringify({ identityKey: f.identityKey, ruleDueOn: f.dueOn ?? null }),
      };
    };

    const linked: { findingId: number; severity: Severity }[] = [];
    // New findings and their "opened" events, inserted in batches (SQLite caps a multi-row insert at 500 rows).
    for (let i = 0; i < rec.create.length; i += CHUNK) {
      const batch = rec.create.slice(i, i + CHUNK);
      const inserted = await trx("findings")
        .insert(
          batch.map((c) => ({
            organisation_id: opts.organisationId,
            branch_id: opts.branchId,
            audit_id: opts.auditId,
            first_audit_id: opts.auditId,
            identity_key: c.finding.identityKey,
            state: "open",
            due_on: c.dueOn,
            opened_at: at,
            last_seen_at: at,
            state_changed_at: at,
            updated_at: at,
            ...content(c.finding),
          })),
        )
        .returning(["id", "identity_key"]);
      const idOf = new Map(inserted.map((r: { id: number; identity_key: string }) => [r.identity_key, Number(r.id)]));
      await trx("finding_events").insert(
        batch.map((c) => ({
          organisation_id: opts.organisationId,
          finding_id: idOf.get(c.finding.identityKey),
          actor_id: null,
          at,
          action: "opened",
          from_state: null,
          to_state: "open",
          note: opts.auditId ? `Found by audit #${opts.auditId}` : "Found when the branch's records were re-checked after a change",
          data: JSON.stringify({ auditId: opts.auditId, dueOn: c.dueOn }),
        })),
      );
      for (const c of batch) linked.push({ findingId: idOf.get(c.finding.identityKey)!, severity: c.finding.severity });
    }

    // Findings found again unchanged only get their "last seen" (and audit) stamp, in batches; the
    // others are rewritten one by one with their new words, deadline or references.
    const unchanged: number[] = [];
    for (const u of rec.update) {
      const update: Record<string, unknown> = {
        ...content(u.finding),
        due_on: u.dueOn,
        last_seen_at: at,
      };
      if (opts.auditId) update.audit_id = opts.auditId;
      const before = storedById.get(u.id);
      const same =
        !u.foundAgain && before && [...CONTENT_COLUMNS, "due_on"].every((c) => String(before[c] ?? "") === String(update[c] ?? ""));
      if (same) {
        unchanged.push(u.id);
        linked.push({ findingId: u.id, severity: u.finding.severity });
        continue;
      }
      if (u.foundAgain) {
        Object.assign(update, { state: "open", state_changed_at: at, closed_at: null, updated_at: at });
        await trx("finding_events").insert({
          organisation_id: opts.organisationId,
          finding_id: u.id,
          actor_id: null,
          at,
          action: "found_again",
          from_state: "no_longer_found",
          to_state: "open",
          note: opts.auditId
            ? `Found again by audit #${opts.auditId}`
            : "Found again when the branch's records were re-checked after a change",
          data: JSON.stringify({ auditId: opts.auditId }),
        });
      }
      await trx("findings").where({ id: u.id }).update(update);
      linked.push({ findingId: u.id, severity: u.finding.severity });
    }

    for (let i = 0; i < unchanged.length; i += CHUNK) {
      await trx("findings")
        .whereIn("id", unchanged.slice(i, i + CHUNK))
        .update({ last_seen_at: at, ...(opts.auditId ? { audit_id: opts.auditId } : {}) });
    }

    for (const r of rec.resolve) {
      await trx("findings").where({ id: r.id }).update({ state: "no_longer_found", state_changed_at: at, closed_at: at, updated_at: at });
      await trx("finding_events").insert({
        organisation_id: opts.organisationId,
        finding_id: r.id,
        actor_id: null,
        at,
        action: "no_longer_found",
        from_state: r.from,
        to_state: "no_longer_found",
        note: opts.auditId
          ? `Audit #${opts.auditId} no longer finds this gap in the records`
          : "The records no longer show this gap after a change",
        data: JSON.stringify({ auditId: opts.auditId }),
      });
    }

    if (opts.auditId) {
      for (let i = 0; i < linked.length; i += CHUNK) {
        await trx("audit_findings")
          .insert(
            linked.slice(i, i + CHUNK).map((l) => ({
              audit_id: opts.auditId,
              finding_id: l.findingId,
              organisation_id: opts.organisationId,
              branch_id: opts.branchId,
              severity: l.severity,
            })),
          )
          // A run resumed after a restart may check a branch again: its links are already there.
          .onConflict(["audit_id", "finding_id"])
          .ignore();
      }
    }

    const activeAfter = zeroSeverities();
    for (const r of (await trx("findings")
      .where({ organisation_id: opts.organisationId, branch_id: opts.branchId })
      .whereIn("state", ["open", "fix_proposed"])
      .groupBy("severity")
      .select("severity")
      .count({ n: "*" })) as Row[]) {
      activeAfter[r.severity as Severity] = Number(r.n);
    }

    const foundBySeverity = zeroSeverities();
    const foundByRule: Record<string, number> = {};
    for (const f of found) {
      foundBySeverity[f.severity] += 1;
      foundByRule[f.ruleId] = (foundByRule[f.ruleId] ?? 0) + 1;
    }
    const summary: BranchAuditSummary = {
      branchId: opts.branchId,
      branchName: loaded.branch.name,
      found: found.length,
      foundBySeverity,
      foundByRule,
      created: rec.create.length,
      foundAgain: rec.update.filter((u) => u.foundAgain).length,
      noLongerFound: rec.resolve.length,
      activeAfter,
      recordsAudited: loaded.recordsAudited,
      asOf: loaded.asOf,
    };

    const changes = `${summary.created} new, ${summary.noLongerFound} no longer found${summary.foundAgain ? `, ${summary.foundAgain} found again` : ""}`;
    await appendActivity(trx, {
      organisationId: opts.organisationId,
      actorId: opts.auditId ? null : (opts.triggeredBy ?? null),
      branchId: opts.branchId,
      action: opts.auditId ? "audit.branch_checked" : "findings.reevaluated",
      subjectType: opts.auditId ? "audit" : "branch",
      subjectId: opts.auditId ?? opts.branchId,
      at,
      summary: opts.auditId
        ? `Audit #${opts.auditId} checked ${loaded.branch.name}: ${summary.found} finding${summary.found === 1 ? "" : "s"} (${changes})`
        : `Re-checked ${loaded.branch.name} after a change: ${changes}`,
      data: { created: summary.created, noLongerFound: summary.noLongerFound, foundAgain: summary.foundAgain, found: summary.found },
    });
    return summary;
  });
}
