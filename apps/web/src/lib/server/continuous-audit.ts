import { reevaluateBranch, type Knex } from "@coldtrail/db";

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
}

const globalForContinuous = globalThis as unknown as { __coldtrailContinuous?: Map<number, BranchQueue> };
const queues: Map<number, BranchQueue> = (globalForContinuous.__coldtrailContinuous ??= new Map<number, BranchQueue>());

async function recheck(db: Knex, opts: { organisationId: number; branchId: number; actorId?: number | null }): Promise<void> {
  await new Promise<void>((resolve) => setImmediate(resolve));
  try {
    await reevaluateBranch(db, { organisationId: opts.organisationId, branchId: opts.branchId, triggeredBy: opts.actorId ?? null });
  } catch (err) {
    console.error(`[continuous audit] branch #${opts.branchId} could not be re-checked`, err);
  }
}

export function reevaluateAfterWrite(db: Knex, opts: { organisationId: number; branchId: number; actorId?: number | null }): Promise<void> {
  const q = queues.get(opts.branchId) ?? { running: null, next: null };
  queues.set(opts.branchId, q);
  if (q.next) return q.next;
  if (!q.running) {
    q.running = recheck(db, opts).finally(() => {
      q.running = null;
    });
    return q.running;
  }
  q.next = q.running.then(() => {
    q.next = null;
    q.running = recheck(db, opts).finally(() => {
      q.running = null;
    });
    return q.running;
  });
  return q.next;
}
