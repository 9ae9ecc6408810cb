import type { Knex } from "knex";
import { isUniqueViolation } from "./idempotency";

/**
 * The background task queue (`background_tasks`), worked through by the one runner (./runner.ts).
 *
 * A task is claimed with a lease: `claimNextTask` takes a queued task whose time has come, or a
 * running one whose lease expired (its runner died), with ONE conditional UPDATE whose WHERE repeats
 * the condition. Two runners racing for a row both issue the UPDATE; the database applies them one
 * after the other and the second finds the condition false (0 rows) — on SQLite because writes are
 * serialized, on PostgreSQL because the second UPDATE waits for the first's row lock and re-checks
 * its WHERE on the new row (READ COMMITTED). So at most one runner holds a task, without
 * `FOR UPDATE SKIP LOCKED` (which SQLite lacks); losers just try the next candidate.
 * While it works the runner renews the lease (heartbeat); a failure puts the task back with
 * exponential backoff until `max_attempts`, then it stays failed with its reason.
 */

export type TaskState = "queued" | "running" | "done" | "failed";

export interface BackgroundTask {
  id: number;
  kind: string;
  payload: Record<string, unknown>;
  uniqueKey: string | null;
  organisationId: number | null;
  state: TaskState;
  attempts: number;
  maxAttempts: number;
  runAfter: string;
  leaseOwner: string | null;
  leaseExpiresAt: string | null;
  lastError: string | null;
  createdAt: string;
  updatedAt: string;
  finishedAt: string | null;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toTask(r: any): BackgroundTask {
  let payload: Record<string, unknown>;
  try {
    payload = JSON.parse(r.payload ?? "{}");
  } catch {
    payload = {};
  }
  return {
    id: Number(r.id),
    kind: r.kind,
    payload,
    uniqueKey: r.unique_key ?? null,
    organisationId: r.organisation_id === null || r.organisation_id === undefined ? null : Number(r.organisation_id),
    state: r.state,
    attempts: Number(r.attempts),
    maxAttempts: Number(r.max_attempts),
    runAfter: r.run_after,
    leaseOwner: r.lease_owner ?? null,
    leaseExpiresAt: r.lease_expires_at ?? null,
    lastError: r.last_error ?? null,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    finishedAt: r.finished_at ?? null,
  };
}

const iso = (d: Date) => d.toISOString();

/**
 * Queues a task. Call it inside the transaction that makes the work necessary, so the two commit
 * together. With `uniqueKey`, a second task with the same key is never created (returns null): that is
 * how the digest goes out once per organisation and day however many instances try.
 */
export async function enqueueTask(
  db: Knex | Knex.Transaction,
  opts: {
    kind: string;
    payload?: Record<string, unknown>;
    uniqueKey?: string;
    organisationId?: number | null;
    runAfter?: Date;
    maxAttempts?: number;
    now?: Date;
  },
): Promise<number | null> {
  const now = opts.now ?? new Date();
  const row = {
    kind: opts.kind,
    payload: JSON.stringify(opts.payload ?? {}),
    unique_key: opts.uniqueKey ?? null,
    organisation_id: opts.organisationId ?? null,
    state: "queued",
    attempts: 0,
    max_attempts: opts.maxAttempts ?? 5,
    run_after: iso(opts.runAfter ?? now),
    created_at: iso(now),
    updated_at: iso(now),
  };
  if (opts.uniqueKey) {
    // ON CONFLICT DO NOTHING (both SQLite and PostgreSQL): a concurrent twin is not an error.
    const rows = await db("background_tasks").insert(row).onConflict("unique_key").ignore().returning("id");
    const first = rows[0] as { id: number } | number | undefined;
    if (first === undefined) return null;
    return Number(typeof first === "object" ? first.id : first);
  }
  try {
    const [r] = await db("background_tasks").insert(row).returning("id");
    return Number(typeof r === "object" ? (r as { id: number }).id : r);
  } catch (err) {
    if (isUniqueViolation(err)) return null;
    throw err;
  }
}

/** Claimable now: queued and due, or running with an expired lease (its runner stopped). */
function claimable(q: Knex.QueryBuilder, nowIso: string): Knex.QueryBuilder {
  return q.where((w) =>
    w
      .where((a) => a.where("state", "queued").where("run_after", "<=", nowIso))
      .orWhere((b) => b.where("state", "running").where("lease_expires_at", "<", nowIso)),
  );
}

/**
 * Takes the next task for `owner` (a runner's id) with a lease of `leaseMs`, or undefined when none
 * is due. `kinds` limits the kinds this runner knows. Safe with any number of runners (see above).
 */
export async function claimNextTask(
  db: Knex,
  opts: { owner: string; leaseMs: number; kinds?: string[]; now?: Date },
): Promise<BackgroundTask | undefined> {
  const now = opts.now ?? new Date();
  const nowIso = iso(now);
  const candidates = claimable(db("background_tasks"), nowIso);
  if (opts.kinds) candidates.whereIn("kind", opts.kinds);
  const ids = (
    await candidates
      .orderBy([{ column: "run_after" }, { column: "id" }])
      .limit(5)
      .select("id")
  ).map((r: { id: number | string }) => Number(r.id));
  for (const id of ids) {
    const changed = await claimable(db("background_tasks").where({ id }), nowIso).update({
      state: "running",
      lease_owner: opts.owner,
      lease_expires_at: iso(new Date(now.getTime() + opts.leaseMs)),
      attempts: db.raw("attempts + 1"),
      updated_at: nowIso,
    });
    if (changed === 1) return toTask(await db("background_tasks").where({ id }).first());
  }
  return undefined;
}

/** Renews the lease. False when the task is no longer this runner's (it expired and another took it). */
export async function renewTaskLease(db: Knex, opts: { id: number; owner: string; leaseMs: number; now?: Date }): Promise<boolean> {
  const now = opts.now ?? new Date();
  const changed = await db("background_tasks")
    .where({ id: opts.id, state: "running", lease_owner: opts.owner })
    .update({ lease_expires_at: iso(new Date(now.getTime() + opts.leaseMs)), updated_at: iso(now) });
  return changed === 1;
}

/** The task is done (only while this runner holds it). */
export async function completeTask(db: Knex, opts: { id: number; owner: string; now?: Date }): Promise<boolean> {
  const at = iso(opts.now ?? new Date());
  const changed = await db("background_tasks")
    .where({ id: opts.id, state: "running", lease_owner: opts.owner })
    .update({ state: "done", lease_owner: null, lease_expires_at: null, finished_at: at, updated_at: at, last_error: null });
  return changed === 1;
}

/** Delay before attempt n+1 after n failed ones: 5 s, 10 s, 20 s … capped at 15 minutes. */
export function backoffMs(attempts: number, opts: { baseMs?: number; maxMs?: number } = {}): number {
  const base = opts.baseMs ?? 5_000;
  return Math.min(opts.maxMs ?? 15 * 60_000, base * 2 ** Math.max(0, attempts - 1));
}

/**
 * A failed attempt: back to the queue after the backoff, or failed for good with its reason once
 * `max_attempts` is reached (or when `permanent`).
 */
export async function failTaskAttempt(
  db: Knex,
  opts: { id: number; owner: string; error: string; permanent?: boolean; now?: Date; backoffBaseMs?: number },
): Promise<"retry" | "failed" | "lost"> {
  const now = opts.now ?? new Date();
  const row = await db("background_tasks")
    .where({ id: opts.id, state: "running", lease_owner: opts.owner })
    .first("attempts", "max_attempts");
  if (!row) return "lost";
  const attempts = Number(row.attempts);
  const giveUp = opts.permanent || attempts >= Number(row.max_attempts);
  const changed = await db("background_tasks")
    .where({ id: opts.id, state: "running", lease_owner: opts.owner })
    .update({
      state: giveUp ? "failed" : "queued",
      last_error: opts.error.slice(0, 2000),
      lease_owner: null,
      lease_expires_at: null,
      run_after: giveUp ? iso(now) : iso(new Date(now.getTime() + backoffMs(attempts, { baseMs: opts.backoffBaseMs }))),
      finished_at: giveUp ? iso(now) : null,
      updated_at: iso(now),
    });
  if (changed !== 1) return "lost";
  return giveUp ? "failed" : "retry";
}

/** Puts a failed task back in the queue now (the owner's "try again"), with a fresh count of attempts. */
export async function retryFailedTask(db: Knex, opts: { id: number; organisationId: number; now?: Date }): Promise<boolean> {
  const at = iso(opts.now ?? new Date());
  const changed = await db("background_tasks")
    .where({ id: opts.id, state: "failed", organisation_id: opts.organisationId })
    .update({ state: "queued", attempts: 0, run_after: at, finished_at: null, updated_at: at });
  return changed === 1;
}

export async function getTask(db: Knex, id: number): Promise<BackgroundTask | undefined> {
  const r = await db("background_tasks").where({ id }).first();
  return r ? toTask(r) : undefined;
}

/** For the status page: one organisation's tasks (newest first), optionally of some states. */
export async function listTasks(
  db: Knex,
  opts: { organisationId: number; states?: TaskState[]; limit?: number; page?: number },
): Promise<{ rows: BackgroundTask[]; total: number }> {
  const base = () => {
    const q = db("background_tasks").where("organisation_id", opts.organisationId);
    if (opts.states?.length) q.whereIn("state", opts.states);
    return q;
  };
  const total = Number((await base().count({ n: "*" }).first())?.n ?? 0);
  const limit = opts.limit ?? 50;
  const rows = await base()
    .orderBy([
      { column: "created_at", order: "desc" },
      { column: "id", order: "desc" },
    ])
    .limit(limit)
    .offset(((opts.page ?? 1) - 1) * limit)
    .select("*");
  return { rows: rows.map(toTask), total };
}

/** Counts by state for one organisation (status page), plus how many were retried (attempts > 1). */
export async function taskCounts(db: Knex, opts: { organisationId: number }): Promise<Record<TaskState | "retried", number>> {
  const out: Record<TaskState | "retried", number> = { queued: 0, running: 0, done: 0, failed: 0, retried: 0 };
  const rows = await db("background_tasks")
    .where("organisation_id", opts.organisationId)
    .groupBy("state")
    .select("state")
    .count({ n: "*" });
  for (const r of rows as Array<{ state: string; n: number | string }>) out[r.state as TaskState] = Number(r.n);
  const retried = await db("background_tasks")
    .where("organisation_id", opts.organisationId)
    .where("attempts", ">", 1)
    .count({ n: "*" })
    .first();
  out.retried = Number(retried?.n ?? 0);
  return out;
}

/** Housekeeping: forgets finished tasks older than `days` (failed ones are kept for the owner to read). */
export async function pruneFinishedTasks(db: Knex, opts: { days?: number; now?: Date } = {}): Promise<number> {
  const before = iso(new Date((opts.now ?? new Date()).getTime() - (opts.days ?? 14) * 86_400_000));
  return db("background_tasks").where({ state: "done" }).where("finished_at", "<", before).delete();
}
