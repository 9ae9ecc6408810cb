import type { Knex } from "knex";
import {
  findingRefResolver,
  isPersonLevelRecordType,
  packsForBranchAudit,
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
import { whereFindingShowsIn } from "./finding-branches";
import { amendmentsBehindGap, type GapAmendment } from "./amendment-fixes";
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
  /** Rule packs applied to this branch: the audit's packs that apply where the branch is. */
  packs: RulePack[];
  /** Findings that were gone because a record was corrected, now waiting for the officer's review. */
  fixProposed: number;
  /** Open or fix-proposed findings of the branch after the run, by severity (all findings of the branch, not only this run's). */
  activeAfter: Record<Severity, number>;
  recordsAudited: number;
  asOf: string;
}

const PERSON_TYPES = ["technician", "certification"];
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
 * "no longer found" — or a proposed fix, when a correction of their own records by someone other
 * than a reviewer made them disappear. Only the packs of `packs` that cover the branch's place run.
 * Person-level findings (a technician's card) are shared with the other branches the person works
 * in: found here, they show here too; not judged here, the branch only stops showing them.
 * Each change writes a finding event; the run writes one activity row.
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
    /** Packs the organisation switched on beyond those the law imposes (e.g. a stricter local pack). */
    chosenPacks?: readonly RulePack[];
    settings: AuditSettings;
    auditId: number | null;
    now: Date;
    /** Person whose write triggered a continuous re-evaluation (activity only). */
    triggeredBy?: number | null;
    /** The writes a continuous re-evaluation answers (activity ids after `afterActivityId` up to `toActivityId`). */
    cause?: { afterActivityId: number; toActivityId: number } | null;
  },
): Promise<BranchAuditSummary> {
  const cause = opts.cause ? { cause_after_activity_id: opts.cause.afterActivityId, cause_to_activity_id: opts.cause.toActivityId } : {};
  const loaded = await loadBranchRecords(db, {
    organisationId: opts.organisationId,
    branchId: opts.branchId,
    period: opts.period,
    asOf: opts.now,
  });
  const place = await db("branches").where({ id: opts.branchId }).first("country", "region");
  const applied = packsForBranchAudit(
    { country: place?.country ?? "US", region: place?.region ?? null },
    opts.packs,
    opts.chosenPacks ?? [],
  );
  const found = runAudit(loaded.records, { packs: applied, period: opts.period, asOf: opts.now, settings: opts.settings });
  const refsOf = findingRefResolver(loaded.records);
  const applianceIds = new Set(loaded.records.appliances.map((a) => a.id));
  const technicianIds = new Set(loaded.records.technicians.map((t) => t.id));
  const at = opts.now.toISOString();

  return db.transaction(async (trx) => {
    // The branch's own findings; person-level findings of the people the branch's records name or
    // that already show in the branch; and any finding with the identity of one found now (an
    // identity is unique in the organisation, so a finding found now is never inserted twice).
    const columns = [
      "id",
      "branch_id",
      "identity_key",
      "rule_id",
      "state",
      "occurred_on",
      "due_on",
      "last_seen_at",
      "state_changed_at",
      ...CONTENT_COLUMNS,
    ];
    const storedRows = new Map<number, Row>();
    const keep = (rows: Row[]) => rows.forEach((r) => storedRows.set(Number(r.id), r));
    keep(await trx("findings").where({ organisation_id: opts.organisationId, branch_id: opts.branchId }).select(columns));
    keep(
      await trx("findings")
        .where({ organisation_id: opts.organisationId })
        .whereIn("record_type", PERSON_TYPES)
        .where((w) => {
          w.whereIn("technician_id", [...technicianIds]).orWhereExists((sub) => {
            sub.select(1).from("finding_branches as fb").whereRaw("fb.finding_id = findings.id").where("fb.branch_id", opts.branchId);
          });
        })
        .select(columns),
    );
    const foundKeys = [...new Set(found.map((f) => f.identityKey))];
    for (let i = 0; i < foundKeys.length; i += CHUNK)
      keep(
        await trx("findings")
          .where({ organisation_id: opts.organisationId })
          .whereIn("identity_key", foundKeys.slice(i, i + CHUNK))
          .select(columns),
      );

    // A person-level finding is this run's to judge only when the person is in the branch's records
    // and its rule pack applies here; otherwise the branch merely stops showing it.
    const foundKeySet = new Set(foundKeys);
    const personLevel = (s: Row) => isPersonLevelRecordType(s.record_type);
    const judged = (s: Row) =>
      !personLevel(s) ||
      foundKeySet.has(s.identity_key) ||
      (s.technician_id !== null && technicianIds.has(Number(s.technician_id)) && applied.includes(s.pack as RulePack));
    const stored = [...storedRows.values()].filter(judged);
    const notJudged = [...storedRows.values()].filter((s) => !judged(s));
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
          ...cause,
        })),
      );
      for (const c of batch) linked.push({ findingId: idOf.get(c.finding.identityKey)!, severity: c.finding.severity });
      const people = batch.filter((c) => isPersonLevelRecordType(c.finding.recordType));
      if (people.length)
        await trx("finding_branches").insert(
          people.map((c) => ({
            finding_id: idOf.get(c.finding.identityKey),
            branch_id: opts.branchId,
            organisation_id: opts.organisationId,
          })),
        );
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
          ...cause,
        });
      }
      await trx("findings").where({ id: u.id }).update(update);
      linked.push({ findingId: u.id, severity: u.finding.severity });
    }

    // Person-level findings found again here show in this branch too.
    const shownHere = rec.update.filter((u) => isPersonLevelRecordType(u.finding.recordType)).map((u) => u.id);
    for (let i = 0; i < shownHere.length; i += CHUNK) {
      await trx("finding_branches")
        .insert(
          shownHere.slice(i, i + CHUNK).map((id) => ({ finding_id: id, branch_id: opts.branchId, organisation_id: opts.organisationId })),
        )
        .onConflict(["finding_id", "branch_id"])
        .ignore();
    }

    for (let i = 0; i < unchanged.length; i += CHUNK) {
      await trx("findings")
        .whereIn("id", unchanged.slice(i, i + CHUNK))
        .update({ last_seen_at: at, ...(opts.auditId ? { audit_id: opts.auditId } : {}) });
    }

    // A gap that vanished because someone other than a reviewer corrected the finding's own records is
    // a proposed fix for the officer to review; any other vanished gap is "no longer found".
    let fixProposed = 0;
    let noLongerFound = 0;
    for (const r of rec.resolve) {
      const before = storedById.get(r.id)!;
      const behind = await amendmentsBehindGap(trx, { organisationId: opts.organisationId, finding: before });
      if (behind.kind === "reviewed") continue;
      if (behind.kind === "amended") {
        fixProposed += 1;
        await proposeFixFromAmendments(trx, {
          organisationId: opts.organisationId,
          findingId: r.id,
          from: r.from,
          amendments: behind.amendments,
          at,
          auditId: opts.auditId,
          cause,
        });
        continue;
      }
      noLongerFound += 1;
      await resolveFinding(trx, {
        organisationId: opts.organisationId,
        findingId: r.id,
        from: r.from,
        at,
        auditId: opts.auditId,
        note: opts.auditId
          ? `Audit #${opts.auditId} no longer finds this gap in the records`
          : "The records no longer show this gap after a change",
        cause,
      });
    }

    // Person-level findings this branch could not judge: the branch no longer shows them. One shown
    // nowhere any more (the person left every branch that finds it) is no longer found.
    for (const s of notJudged) {
      const removed = await trx("finding_branches").where({ finding_id: s.id, branch_id: opts.branchId }).del();
      if (!removed && Number(s.branch_id) !== opts.branchId) continue;
      const others = await trx("finding_branches").where({ finding_id: s.id }).orderBy("branch_id").select("branch_id");
      if (others.length > 0) {
        if (Number(s.branch_id) === opts.branchId)
          await trx("findings")
            .where({ id: s.id })
            .update({ branch_id: Number(others[0]!.branch_id) });
        continue;
      }
      if (s.state !== "open" && s.state !== "fix_proposed") continue;
      noLongerFound += 1;
      await resolveFinding(trx, {
        organisationId: opts.organisationId,
        findingId: Number(s.id),
        from: s.state as FindingState,
        at,
        auditId: opts.auditId,
        note: "No branch the person works in is audited against this rule any more",
        cause,
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
    for (const r of (await trx("findings as findings")
      .where({ "findings.organisation_id": opts.organisationId })
      .where((w) => whereFindingShowsIn(w, [opts.branchId]))
      .whereIn("findings.state", ["open", "fix_proposed"])
      .groupBy("findings.severity")
      .select("findings.severity")
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
      noLongerFound,
      packs: applied,
      fixProposed,
      activeAfter,
      recordsAudited: loaded.recordsAudited,
      asOf: loaded.asOf,
    };

    const changes = `${summary.created} new, ${summary.noLongerFound} no longer found${summary.fixProposed ? `, ${summary.fixProposed} fixed by a correction (to review)` : ""}${summary.foundAgain ? `, ${summary.foundAgain} found again` : ""}`;
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
      data: {
        created: summary.created,
        noLongerFound: summary.noLongerFound,
        fixProposed: summary.fixProposed,
        foundAgain: summary.foundAgain,
        found: summary.found,
        packs: applied,
      },
    });
    return summary;
  });
}

type EventCause = { cause_after_activity_id?: number; cause_to_activity_id?: number };

async function resolveFinding(
  trx: Knex.Transaction,
  opts: {
    organisationId: number;
    findingId: number;
    from: FindingState;
    at: string;
    auditId: number | null;
    note: string;
    /** The writes a continuous re-check answered (finding_events.cause_*). */
    cause: EventCause;
  },
): Promise<void> {
  const { at } = opts;
  await trx("findings")
    .where({ id: opts.findingId })
    .update({ state: "no_longer_found", state_changed_at: at, closed_at: at, updated_at: at });
  await trx("finding_events").insert({
    organisation_id: opts.organisationId,
    finding_id: opts.findingId,
    actor_id: null,
    at,
    action: "no_longer_found",
    from_state: opts.from,
    to_state: "no_longer_found",
    note: opts.note,
    data: JSON.stringify({ auditId: opts.auditId }),
    ...opts.cause,
  });
}

/**
 * The gap is gone because its records were corrected: an open finding becomes a proposed fix by the
 * person who corrected them, with the corrections as its evidence; a finding whose fix was already
 * proposed keeps waiting for review and gets the corrections added to its history.
 */
async function proposeFixFromAmendments(
  trx: Knex.Transaction,
  opts: {
    organisationId: number;
    findingId: number;
    from: FindingState;
    amendments: GapAmendment[];
    at: string;
    auditId: number | null;
    cause: EventCause;
  },
): Promise<void> {
  const { at } = opts;
  const latest = opts.amendments[opts.amendments.length - 1]!;
  const words = opts.amendments.map((a) => `${a.actorName} corrected ${a.subjectLabel} on ${a.at.slice(0, 10)}: ${a.reason}`).join("\n");
  if (opts.from === "open")
    await trx("findings").where({ id: opts.findingId }).update({ state: "fix_proposed", state_changed_at: at, updated_at: at });
  else await trx("findings").where({ id: opts.findingId }).update({ updated_at: at });
  await trx("finding_events").insert({
    organisation_id: opts.organisationId,
    finding_id: opts.findingId,
    actor_id: latest.actorId,
    at,
    action: opts.from === "open" ? "fix_proposed" : "correction_added",
    from_state: opts.from,
    to_state: "fix_proposed",
    note: `The records no longer show this gap after a correction; the compliance officer reviews it before it closes.\n${words}`,
    data: JSON.stringify({
      via: "amendment",
      auditId: opts.auditId,
      amendments: opts.amendments.map((a) => ({
        id: a.id,
        subjectType: a.subjectType,
        subjectId: a.subjectId,
        subjectLabel: a.subjectLabel,
        actorId: a.actorId,
        actorName: a.actorName,
        at: a.at,
        reason: a.reason,
        fields: a.fields,
      })),
    }),
    ...opts.cause,
  });
}
