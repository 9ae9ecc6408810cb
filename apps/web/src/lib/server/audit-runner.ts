import {
  claimAudit,
  describeAuditFailure,
  failAuditWithReference,
  getDb,
  listQueuedAuditIds,
  requeueInterruptedAudits,
  runAuditBranches,
  touchAuditHeartbeat,
  type Knex,
} from "@coldtrail/db";

/**
 * Runs audits in the background of this server process. An audit is a row (queued → running → done
 * or failed) with its progress; the runner takes queued audits one at a time and runs them branch by
 * branch (packages/db `runAuditBranches`), yielding between branches so requests are still served.
 * While a run goes on it writes a heartbeat every 15 s. A watchdog puts runs whose heartbeat stopped
 * (the server went down mid-run) back in the queue to resume with the branches not done yet, and fails
 * a run interrupted three times. The page can be left and reopened: it reads the row.
 */

const HEARTBEAT_MS = 15_000;
const STALE_AFTER_MS = 60_000;
const WATCHDOG_MS = 60_000;

interface RunnerState {
  busy: boolean;
  again: boolean;
  watchdog: ReturnType<typeof setInterval> | null;
}

const globalForRunner = globalThis as unknown as { __coldtrailAuditRunner?: RunnerState };
const state: RunnerState = (globalForRunner.__coldtrailAuditRunner ??= { busy: false, again: false, watchdog: null });

const pause = () => new Promise<void>((resolve) => setImmediate(resolve));

async function runOne(db: Knex, id: number): Promise<void> {
  if (!(await claimAudit(db, { id }))) return;
  const beat = setInterval(() => {
    touchAuditHeartbeat(db, { id }).catch((err: unknown) => console.error(`[audits] heartbeat of audit #${id} failed`, err));
  }, HEARTBEAT_MS);
  beat.unref?.();
  try {
    await runAuditBranches(db, { id, pause });
  } catch (err) {
    await failAuditWithReference(db, { id, error: err }).catch((e: unknown) =>
      console.error(describeAuditFailure(e, `recording the failure of audit #${id}`).logLine),
    );
  } finally {
    clearInterval(beat);
  }
}

async function drain(db: Knex): Promise<void> {
  do {
    state.again = false;
    for (;;) {
      const [next] = await listQueuedAuditIds(db, 1);
      if (next === undefined) break;
      await runOne(db, next);
      await pause();
    }
  } while (state.again);
}

/** Starts working through the queue (again) unless it is already being worked through. */
export function kickAuditRunner(db: Knex = getDb()): void {
  if (state.busy) {
    state.again = true;
    return;
  }
  state.busy = true;
  setImmediate(() => {
    drain(db)
      .catch((err: unknown) => console.error("[audits] runner stopped", err))
      .finally(() => {
        state.busy = false;
      });
  });
}

/** Requeues runs whose heartbeat stopped (or fails them after repeated interruptions), then runs the queue. */
export async function resumeInterruptedAudits(db: Knex = getDb()): Promise<void> {
  const { requeued, failed } = await requeueInterruptedAudits(db, { staleBefore: new Date(Date.now() - STALE_AFTER_MS) });
  if (requeued.length || failed.length) console.log(`[audits] resumed ${requeued.length} interrupted run(s), failed ${failed.length}`);
  kickAuditRunner(db);
}

/** Called once when the server starts: resume what a restart interrupted, and keep watching. */
export function startAuditRunner(db: Knex = getDb()): void {
  if (state.watchdog) return;
  resumeInterruptedAudits(db).catch((err: unknown) => console.error("[audits] could not resume runs", err));
  state.watchdog = setInterval(() => {
    resumeInterruptedAudits(db).catch((err: unknown) => console.error("[audits] watchdog", err));
  }, WATCHDOG_MS);
  state.watchdog.unref?.();
}
