import { describeAuditFailure, enqueueTask, reevaluateBranch, type Knex, type TaskHandler } from "@coldtrail/db";
import { kickTaskRunner } from "./task-kick";

/**
 * Continuous audit. After a write that changes a branch's records (a job, a disposal, a cylinder
 * weighing …) a `recheck` task is queued for the branch; the runner (./task-runner.ts) runs the rules
 * again over it and reconciles its findings (packages/db `reevaluateBranch`), so open findings close or
 * new ones appear without waiting for the next audit. Repeats are coalesced: while a re-check of the
 * branch is still queued, no second one is added. Being a task, a re-check survives a restart.
 */

const payloadFor = (opts: { organisationId: number; branchId: number }) =>
  JSON.stringify({ branchId: opts.branchId, organisationId: opts.organisationId });

type RecheckOptions = {
  organisationId: number;
  branchId: number;
  actorId?: number | null;
  /**
   * The newest activity id before the write, so the findings the re-check opens or closes are linked
   * to the writes it answers (shown on the saved record). A re-check already waiting answers an earlier
   * write, so it covers this one too.
   */
  afterActivityId?: number | null;
};

/** Queues a re-check of the branch unless one is already waiting. */
export async function queueRecheck(db: Knex, opts: RecheckOptions): Promise<void> {
  const waiting = await db("background_tasks")
    .where({ kind: "recheck", state: "queued", organisation_id: opts.organisationId })
    .where("payload", "like", `{"branchId":${opts.branchId},%`)
    .first("id");
  if (waiting) return;
  await enqueueTask(db, {
    kind: "recheck",
    payload: { ...JSON.parse(payloadFor(opts)), actorId: opts.actorId ?? null, afterActivityId: opts.afterActivityId ?? null },
    organisationId: opts.organisationId,
    maxAttempts: 3,
  });
}

/** Call after a write that changed the branch's records (the route wrapper does). Never throws. */
export async function reevaluateAfterWrite(db: Knex, opts: RecheckOptions): Promise<void> {
  try {
    await queueRecheck(db, opts);
    kickTaskRunner();
  } catch (err) {
    console.error(describeAuditFailure(err, `queuing a re-check of branch #${opts.branchId}`).logLine);
  }
}

export const recheckTask: TaskHandler = {
  async run({ task, db }) {
    await reevaluateBranch(db, {
      organisationId: Number(task.payload.organisationId),
      branchId: Number(task.payload.branchId),
      triggeredBy: task.payload.actorId === null || task.payload.actorId === undefined ? null : Number(task.payload.actorId),
      afterActivityId:
        task.payload.afterActivityId === null || task.payload.afterActivityId === undefined ? null : Number(task.payload.afterActivityId),
    });
  },
};
