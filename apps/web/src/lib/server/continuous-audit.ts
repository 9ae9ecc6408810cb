import { describeAuditFailure, reevaluateBranch, type Knex } from "@coldtrail/db";

/**
 * Continuous audit. Call after a write that changes a branch's records (a job, a disposal, a cylinder
 * weighing …): the rules run again over that branch in the background and its findings are reconciled
 * (packages/db `reevaluateBranch`), so open findings close or new ones appear without waiting for the
 * next audit. Calls for one branch are coalesced: while a re-check runs, at most one more is queued.
 * Never throws; the returned promise settles when the re-check is done (tests may await it).
 */

interface BranchQueue {
  running: Promise<void> | null;
  next: Promise<void> | null;
  /** The earliest write the queued re-check answers (activity id before it); merged when calls coalesce. */
  nextAfter: number | null;
}

type RecheckOptions = { organisationId: number; branchId: number; actorId?: number | null; afterActivityId?: number | null };

const earliest = (a: number | null | undefined, b: number | null | undefined) =>
  a === null || a === undefined ? (b ?? null) : b === null || b === undefined ? a : Math.min(a, b);

const globalForContinuous = globalThis as unknown as { __coldtrailContinuous?: Map<number, BranchQueue> };
const queues: Map<number, BranchQueue> = (globalForContinuous.__coldtrailContinuous ??= new Map());

async function recheck(db: Knex, opts: RecheckOptions): Promise<void> {
  await new Promise<void>((resolve) => setImmediate(resolve));
  try {
    await reevaluateBranch(db, {
      organisationId: opts.organisationId,
      branchId: opts.branchId,
      triggeredBy: opts.actorId ?? null,
      afterActivityId: opts.afterActivityId ?? null,
    });
  } catch (err) {
    console.error(describeAuditFailure(err, `continuous re-check of branch #${opts.branchId}`).logLine);
  }
}

/**
 * `afterActivityId`: the newest activity id before the write, so the findings the re-check opens or
 * closes are linked to the writes it answers (shown on the saved record).
 */
export function reevaluateAfterWrite(db: Knex, opts: RecheckOptions): Promise<void> {
  const q = queues.get(opts.branchId) ?? { running: null, next: null, nextAfter: null };
  queues.set(opts.branchId, q);
  if (q.next) {
    q.nextAfter = earliest(q.nextAfter, opts.afterActivityId);
    return q.next;
  }
  if (!q.running) {
    q.running = recheck(db, opts).finally(() => {
      q.running = null;
    });
    return q.running;
  }
  q.nextAfter = opts.afterActivityId ?? null;
  q.next = q.running.then(() => {
    q.next = null;
    const afterActivityId = q.nextAfter;
    q.nextAfter = null;
    q.running = recheck(db, { ...opts, afterActivityId }).finally(() => {
      q.running = null;
    });
    return q.running;
  });
  return q.next;
}
