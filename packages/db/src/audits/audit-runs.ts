import type { Knex } from "knex";
import { recordHealth, type AuditInput, type RulePack, type Severity } from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import type { ActorRef, ScopeFn } from "../types";
import { getOrganisationAuditSettings } from "./organisation-settings";
import { auditBranchFindings, type BranchAuditSummary } from "./persist-findings";

export type AuditState = "queued" | "running" | "done" | "failed";

export interface AuditSummary {
  branches: BranchAuditSummary[];
  totals: { found: number; created: number; noLongerFound: number; foundAgain: number; bySeverity: Record<Severity, number> };
  byRule: Record<string, number>;
}

export interface AuditRun {
  id: number;
  organisationId: number;
  branchIds: number[];
  periodFrom: string;
  periodTo: string;
  packs: RulePack[];
  state: AuditState;
  progress: number;
  progressNote: string | null;
  error: string | null;
  summary: AuditSummary | null;
  startedBy: number;
  startedByName: string;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  branchesDone: number[];
  attempts: number;
  heartbeatAt: string | null;
}

export interface AuditListRow extends AuditRun {
  branchNames: string[];
}

const json = <T>(text: unknown, fallback: T): T => {
  if (typeof text !== "string" || text === "") return fallback;
  try {
    return JSON.parse(text) as T;
  } catch {
    return fallback;
  }
};

function toRun(r: any): AuditRun {
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchIds: json<{ branchIds: number[] }>(r.scope, { branchIds: [] }).branchIds.map(Number),
    periodFrom: r.period_from,
    periodTo: r.period_to,
    packs: json<RulePack[]>(r.rule_packs, []),
    state: r.state,
    progress: Number(r.progress),
    progressNote: r.progress_note ?? null,
    error: r.error ?? null,
    summary: json<AuditSummary | null>(r.summary, null),
    startedBy: Number(r.started_by),
    startedByName: r.started_by_name ?? "",
    createdAt: r.created_at,
    startedAt: r.started_at ?? null,
    finishedAt: r.finished_at ?? null,
    branchesDone: json<number[]>(r.branches_done, []).map(Number),
    attempts: Number(r.attempts ?? 0),
    heartbeatAt: r.heartbeat_at ?? null,
  };
}

const RUN_COLUMNS = ["a.*", "u.name as started_by_name"];

/**
 * Queues an audit of the chosen branches, period and rule packs. Every branch must belong to the
 * actor's organisation (archived branches may be audited for past periods). The run itself happens
 * in the background (`runAuditBranches`).
 */
export async function createAudit(db: Knex, opts: { actor: ActorRef; input: AuditInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const branches = await trx("branches")
      .where({ organisation_id: actor.organisationId })
      .whereIn("id", input.branchIds)
      .select("id", "name");
    if (branches.length !== new Set(input.branchIds).size)
      throw new InvalidInputError("One of the chosen branches is not in your organisation", "branchIds");
    const byId = new Map(branches.map((b) => [Number(b.id), b.name as string]));
    const branchIds = [...input.branchIds].sort((x, y) => (byId.get(x)! < byId.get(y)! ? -1 : byId.get(x)! > byId.get(y)! ? 1 : x - y));
    const [row] = await trx("audits")
      .insert({
        organisation_id: actor.organisationId,
        scope: JSON.stringify({ branchIds }),
        period_from: input.periodFrom,
        period_to: input.periodTo,
        rule_packs: JSON.stringify([...new Set(input.packs)]),
        state: "queued",
        progress: 0,
        progress_note: "Waiting to start",
        started_by: actor.userId,
        created_at: at,
        branches_done: "[]",
        attempts: 0,
      })
      .returning("id");
    const id = rowId(row);
    const names = branchIds.map((b) => byId.get(b)).join(", ");
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: "audit.created",
      subjectType: "audit",
      subjectId: id,
      at,
      summary: `Started audit #${id} of ${names} for ${input.periodFrom} to ${input.periodTo}`,
      data: { branchIds, periodFrom: input.periodFrom, periodTo: input.periodTo, packs: input.packs },
    });
    return id;
  });
}

/** One audit of the organisation (any state), or undefined. */
export async function getAuditRun(db: Knex, opts: { organisationId: number; id: number }): Promise<AuditRun | undefined> {
  const r = await db("audits as a")
    .join("users as u", "u.id", "a.started_by")
    .where({ "a.id": opts.id, "a.organisation_id": opts.organisationId })
    .first(RUN_COLUMNS);
  return r ? toRun(r) : undefined;
}

/** The organisation's audits, newest first, one page at a time. The scope sees the table as `a` (audits). */
export async function listAudits(
  db: Knex,
  opts: { organisationId: number; scope?: ScopeFn; page: number; pageSize: number },
): Promise<{ rows: AuditListRow[]; total: number; page: number; pageSize: number }> {
  const base = () => {
    const q = db("audits as a").where("a.organisation_id", opts.organisationId);
    if (opts.scope)
      q.where(function scoped(this: Knex.QueryBuilder) {
        opts.scope!(this);
      });
    return q;
  };
  const countRow = await base().count({ n: "*" }).first();
  const rows = await base()
    .join("users as u", "u.id", "a.started_by")
    .orderBy([
      { column: "a.created_at", order: "desc" },
      { column: "a.id", order: "desc" },
    ])
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize)
    .select(RUN_COLUMNS);
  const branchNames = new Map(
    (await db("branches").where({ organisation_id: opts.organisationId }).select("id", "name")).map((b) => [
      Number(b.id),
      b.name as string,
    ]),
  );
  return {
    rows: rows.map((r) => {
      const run = toRun(r);
      return { ...run, branchNames: run.branchIds.map((id) => branchNames.get(id) ?? `#${id}`) };
    }),
    total: Number(countRow?.n ?? 0),
    page: opts.page,
    pageSize: opts.pageSize,
  };
}

/** Takes a queued audit for this process. False when another runner took it first or it is not queued. */
export async function claimAudit(db: Knex, opts: { id: number; now?: Date }): Promise<boolean> {
  const at = (opts.now ?? new Date()).toISOString();
  const changed = await db("audits")
    .where({ id: opts.id, state: "queued" })
    .update({ state: "running", attempts: db.raw("attempts + 1"), heartbeat_at: at, progress_note: "Reading the records" });
  if (changed === 1) await db("audits").where({ id: opts.id }).whereNull("started_at").update({ started_at: at });
  return changed === 1;
}

/** Tells other runners this run is alive (the runner calls it while a run goes on). */
export async function touchAuditHeartbeat(db: Knex, opts: { id: number; now?: Date }): Promise<void> {
  await db("audits")
    .where({ id: opts.id, state: "running" })
    .update({ heartbeat_at: (opts.now ?? new Date()).toISOString() });
}

/** The oldest queued audits, for the background runner. */
export async function listQueuedAuditIds(db: Knex, limit = 10): Promise<number[]> {
  const rows = await db("audits")
    .where({ state: "queued" })
    .orderBy([{ column: "created_at" }, { column: "id" }])
    .limit(limit)
    .select("id");
  return rows.map((r) => Number(r.id));
}

/**
 * Runs that stopped without finishing — the server went down mid-run, so their heartbeat is older
 * than `staleBefore` — go back to the queue and resume with the branches not done yet; after
 * `maxAttempts` interruptions a run fails with a reason instead.
 */
export async function requeueInterruptedAudits(
  db: Knex,
  opts: { staleBefore: Date; maxAttempts?: number; now?: Date },
): Promise<{ requeued: number[]; failed: number[] }> {
  const maxAttempts = opts.maxAttempts ?? 3;
  const at = (opts.now ?? new Date()).toISOString();
  const stale = await db("audits")
    .where({ state: "running" })
    .where((q) => q.whereNull("heartbeat_at").orWhere("heartbeat_at", "<", opts.staleBefore.toISOString()))
    .select("id", "organisation_id", "attempts");
  const out = { requeued: [] as number[], failed: [] as number[] };
  for (const s of stale) {
    const id = Number(s.id);
    if (Number(s.attempts) >= maxAttempts) {
      await failAudit(db, {
        id,
        message: `The run was interrupted ${s.attempts} times (the server stopped while it ran); start it again`,
        now: opts.now,
      });
      out.failed.push(id);
    } else {
      await db.transaction(async (trx) => {
        await trx("audits")
          .where({ id, state: "running" })
          .update({ state: "queued", progress_note: "Interrupted; resuming where it stopped" });
        await appendActivity(trx, {
          organisationId: Number(s.organisation_id),
          actorId: null,
          action: "audit.resumed",
          subjectType: "audit",
          subjectId: id,
          at,
          summary: `Audit #${id} was interrupted and goes back to the queue`,
        });
      });
      out.requeued.push(id);
    }
  }
  return out;
}

export async function failAudit(db: Knex, opts: { id: number; message: string; now?: Date | undefined }): Promise<void> {
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const row = await trx("audits").where({ id: opts.id }).first("organisation_id", "state");
    if (!row || row.state === "done" || row.state === "failed") return;
    await trx("audits")
      .where({ id: opts.id })
      .update({ state: "failed", error: opts.message.slice(0, 2000), finished_at: at, progress_note: "Stopped" });
    await appendActivity(trx, {
      organisationId: Number(row.organisation_id),
      actorId: null,
      action: "audit.failed",
      subjectType: "audit",
      subjectId: opts.id,
      at,
      summary: `Audit #${opts.id} stopped: ${opts.message}`.slice(0, 500),
    });
  });
}

function combine(branches: BranchAuditSummary[]): AuditSummary {
  const totals = {
    found: 0,
    created: 0,
    noLongerFound: 0,
    foundAgain: 0,
    bySeverity: { critical: 0, major: 0, minor: 0 } as Record<Severity, number>,
  };
  const byRule: Record<string, number> = {};
  for (const b of branches) {
    totals.found += b.found;
    totals.created += b.created;
    totals.noLongerFound += b.noLongerFound;
    totals.foundAgain += b.foundAgain;
    for (const s of Object.keys(b.foundBySeverity) as Severity[]) totals.bySeverity[s] += b.foundBySeverity[s];
    for (const [rule, n] of Object.entries(b.foundByRule)) byRule[rule] = (byRule[rule] ?? 0) + n;
  }
  return { branches, totals, byRule };
}

/**
 * The audit's totals count each finding once: a person-level finding found in two branches shows in
 * both branch summaries but is one finding of the audit.
 */
async function withDistinctTotals(db: Knex, auditId: number, summary: AuditSummary): Promise<AuditSummary> {
  const rows = await db("audit_findings").where({ audit_id: auditId }).groupBy("severity").select("severity").count({ n: "*" });
  const bySeverity: Record<Severity, number> = { critical: 0, major: 0, minor: 0 };
  for (const r of rows as { severity: string; n: unknown }[]) bySeverity[r.severity as Severity] = Number(r.n);
  const found = bySeverity.critical + bySeverity.major + bySeverity.minor;
  return { ...summary, totals: { ...summary.totals, found, bySeverity } };
}

/**
 * Runs a claimed audit to the end: each branch not done yet is read once, audited and reconciled in
 * its own transaction, then recorded as done with the progress (so a restart resumes after it).
 * `pause` lets the caller yield between branches (the web server stays responsive).
 */
export async function runAuditBranches(
  db: Knex,
  opts: { id: number; now?: () => Date; pause?: () => Promise<void>; onProgress?: (progress: number, note: string) => void },
): Promise<AuditRun> {
  const clock = opts.now ?? (() => new Date());
  const run = await db("audits as a").join("users as u", "u.id", "a.started_by").where("a.id", opts.id).first(RUN_COLUMNS);
  if (!run) throw new RecordNotFoundError("No such audit");
  let audit = toRun(run);
  if (audit.state !== "running") throw new RecordConflictError(`Audit #${audit.id} is ${audit.state}, not running`);
  const { settings, packs: chosenPacks } = await getOrganisationAuditSettings(db, audit.organisationId);
  const branchSummaries = [...(audit.summary?.branches ?? [])];
  const done = new Set(audit.branchesDone);
  const names = new Map(
    (await db("branches").whereIn("id", audit.branchIds).select("id", "name")).map((b) => [Number(b.id), b.name as string]),
  );

  for (const branchId of audit.branchIds) {
    if (done.has(branchId)) continue;
    const note = `Checking ${names.get(branchId) ?? `branch #${branchId}`} (${done.size + 1} of ${audit.branchIds.length})`;
    await db("audits").where({ id: audit.id }).update({ progress_note: note, heartbeat_at: clock().toISOString() });
    opts.onProgress?.(audit.progress, note);
    const summary = await auditBranchFindings(db, {
      organisationId: audit.organisationId,
      branchId,
      period: { from: audit.periodFrom, to: audit.periodTo },
      packs: audit.packs,
      chosenPacks,
      settings,
      auditId: audit.id,
      now: clock(),
    });
    done.add(branchId);
    branchSummaries.push(summary);
    const progress = Math.min(99, Math.floor((done.size / audit.branchIds.length) * 100));
    await db("audits")
      .where({ id: audit.id })
      .update({
        branches_done: JSON.stringify([...done]),
        summary: JSON.stringify(combine(branchSummaries)),
        progress,
        heartbeat_at: clock().toISOString(),
      });
    opts.onProgress?.(progress, note);
    if (opts.pause) await opts.pause();
  }

  const at = clock().toISOString();
  const summary = await withDistinctTotals(db, audit.id, combine(branchSummaries));
  await db.transaction(async (trx) => {
    await trx("audits")
      .where({ id: audit.id })
      .update({
        state: "done",
        progress: 100,
        progress_note: "Finished",
        finished_at: at,
        summary: JSON.stringify(summary),
        heartbeat_at: at,
      });
    await appendActivity(trx, {
      organisationId: audit.organisationId,
      actorId: null,
      action: "audit.finished",
      subjectType: "audit",
      subjectId: audit.id,
      at,
      summary: `Audit #${audit.id} finished: ${summary.totals.found} finding${summary.totals.found === 1 ? "" : "s"} (${summary.totals.created} new, ${summary.totals.noLongerFound} no longer found)`,
      data: summary.totals,
    });
  });
  audit = toRun(await db("audits as a").join("users as u", "u.id", "a.started_by").where("a.id", opts.id).first(RUN_COLUMNS));
  return audit;
}

/** Record health of a branch from an audit's summary of it (what the score was when the audit ran). */
export function healthOfBranchSummary(b: BranchAuditSummary) {
  return recordHealth({ open: b.activeAfter, recordsAudited: b.recordsAudited });
}

/** The latest finished audit that covered a branch, for continuous re-evaluation and trends. */
export async function latestDoneAuditForBranch(
  db: Knex,
  opts: { organisationId: number; branchId: number },
): Promise<AuditRun | undefined> {
  // The scope is JSON text; audits are few, so the newest finished ones are read and filtered here.
  const rows = await db("audits as a")
    .join("users as u", "u.id", "a.started_by")
    .where({ "a.organisation_id": opts.organisationId, "a.state": "done" })
    .orderBy([
      { column: "a.finished_at", order: "desc" },
      { column: "a.id", order: "desc" },
    ])
    .limit(200)
    .select(RUN_COLUMNS);
  for (const r of rows) {
    const run = toRun(r);
    if (run.branchIds.includes(opts.branchId)) return run;
  }
  return undefined;
}
