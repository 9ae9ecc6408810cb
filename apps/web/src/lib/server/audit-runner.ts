import {
  claimAudit,
  describeAuditFailure,
  enqueueTask,
  failAudit,
  failAuditWithReference,
  isPostgres,
  runAuditBranches,
  type Knex,
  type TaskHandler,
} from "@coldtrail/db";
import { kickTaskRunner } from "./task-kick";

/**
 * Audits run as background tasks (kind `audit`) of the one runner (./task-runner.ts). An audit is a
 * row (queued → running → done or failed) with its progress; `queueAudit` queues its task in the
 * transaction that creates it. The runner claims the task with a lease and runs the audit branch by
 * branch (packages/db `runAuditBranches`), yielding between branches so requests are still served.
 * If the server stops mid-run the lease expires and any runner takes the task over within seconds;
 * the audit resumes with the branches not done yet. A run interrupted three times fails with a reason.
 * The page can be left and reopened: it reads the row.
 */

const pause = () => new Promise<void>((resolve) => setImmediate(resolve));

/** Queues the run of audit `auditId`; call it in the transaction that created the audit. */
export async function queueAudit(db: Knex, opts: { auditId: number; organisationId: number }): Promise<void> {
  await enqueueTask(db, {
    kind: "audit",
    payload: { auditId: opts.auditId },
    uniqueKey: `audit:${opts.auditId}`,
    organisationId: opts.organisationId,
    maxAttempts: 3,
  });
}

/** Asks the runner to look for work now (after the audit's transaction committed). */
export function kickAuditRunner(): void {
  kickTaskRunner();
}

export const auditTask: TaskHandler = {
  async run({ task, db }) {
    const id = Number(task.payload.auditId);
    const row = await db("audits").where({ id }).first("state");
    if (!row || row.state === "done" || row.state === "failed") return;
    // A queued audit is claimed; a running one was interrupted and resumes with the branches not done.
    if (row.state === "queued" && !(await claimAudit(db, { id }))) {
      const now = await db("audits").where({ id }).first("state");
      if (now?.state !== "running") return;
    }
    try {
      await runAuditBranches(db, { id, pause });
    } catch (err) {
      // The officer sees a plain sentence with a reference; the log gets one line with the same reference.
      await failAuditWithReference(db, { id, error: err }).catch((e: unknown) =>
        console.error(describeAuditFailure(e, `recording the failure of audit #${id}`).logLine),
      );
    }
  },
  async giveUp({ task, db }) {
    const id = Number(task.payload.auditId);
    await failAudit(db, {
      id,
      message: `The run was interrupted ${task.maxAttempts} times (the server stopped while it ran); start it again`,
    });
  },
};

/**
 * Audits queued or running without a task (queued before the runner existed, or by code that did not
 * queue one) get one. Cheap; the runner calls it when idle.
 */
export async function adoptOrphanAudits(db: Knex): Promise<number> {
  const orphans = await db("audits as a")
    .whereIn("a.state", ["queued", "running"])
    .whereNotExists(function tasks(this: Knex.QueryBuilder) {
      this.select(db.raw("1"))
        .from("background_tasks as t")
        .where("t.kind", "audit")
        .whereRaw("t.unique_key = " + concatAuditKey(db));
    })
    .select("a.id", "a.organisation_id");
  for (const o of orphans) await queueAudit(db, { auditId: Number(o.id), organisationId: Number(o.organisation_id) });
  return orphans.length;
}

/** `'audit:' || a.id` — the same concatenation operator on SQLite and PostgreSQL (with a cast for PostgreSQL). */
function concatAuditKey(db: Knex): string {
  return isPostgres(db) ? "('audit:' || a.id::text)" : "('audit:' || a.id)";
}
