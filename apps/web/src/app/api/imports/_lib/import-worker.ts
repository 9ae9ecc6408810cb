import "server-only";
import {
  checkImportRows,
  clearImportIssues,
  commitImportRows,
  enqueueTask,
  failAbandonedImports,
  failImport,
  getImportFile,
  type ActorRef,
  type ImportProgress,
  type Knex,
  type TaskHandler,
} from "@coldtrail/db";
import { queueRecheck } from "../../../../lib/server/continuous-audit";
import { kickTaskRunner } from "../../../../lib/server/task-kick";
import { storedRows } from "./read-spreadsheet";

/**
 * The long steps of an import run as background tasks of the one runner (kinds `import_check` and
 * `import_commit`, see lib/server/task-runner.ts), queued in the request that starts them. This module
 * keeps the live progress of the steps this process is working on, for the page's polling. A step
 * interrupted by a restart is taken over by a runner once its lease expires: a check starts again
 * (its earlier problems cleared), a commit — one transaction, rolled back by the crash — runs again.
 */

interface WorkerState {
  running: Map<number, ImportProgress | null>;
}

const globalForImports = globalThis as unknown as { coldtrailImports?: WorkerState };
const state: WorkerState = (globalForImports.coldtrailImports ??= { running: new Map() });

/** Live progress of an import this process is working on, if any. */
export function liveProgress(id: number): ImportProgress | null | undefined {
  return state.running.get(id);
}

export function isRunning(id: number): boolean {
  return state.running.has(id);
}

const READ_FAILED = "The file could not be read from storage. Nothing was imported.";

async function tracked(db: Knex, id: number, work: (onProgress: (p: ImportProgress) => void) => Promise<unknown>): Promise<void> {
  state.running.set(id, null);
  try {
    await work((p) => state.running.set(id, p));
  } catch (err) {
    console.error(`import ${id} stopped`, err);
    await failImport(db, { id, message: READ_FAILED }).catch(() => undefined);
  } finally {
    state.running.delete(id);
  }
}

/** Queues the check of every row (state `checking` → `checked` or `failed`). Call it in the request's transaction. */
export async function queueCheck(db: Knex, id: number, actor: ActorRef): Promise<void> {
  await enqueueTask(db, {
    kind: "import_check",
    payload: { importId: id, actor },
    uniqueKey: `import:${id}:check:${Date.now()}`,
    organisationId: actor.organisationId,
    maxAttempts: 3,
  });
  kickTaskRunner();
}

/** Queues the writing of the valid rows in one transaction (state `importing` → `imported` or `failed`). */
export async function queueCommit(db: Knex, id: number, actor: ActorRef): Promise<void> {
  await enqueueTask(db, {
    kind: "import_commit",
    payload: { importId: id, actor },
    uniqueKey: `import:${id}:commit`,
    organisationId: actor.organisationId,
    maxAttempts: 3,
  });
  kickTaskRunner();
}

const payloadOf = (task: { payload: Record<string, unknown> }) => ({
  id: Number(task.payload.importId),
  actor: task.payload.actor as ActorRef,
});

export const importCheckTask: TaskHandler = {
  async run({ task, db }) {
    const { id, actor } = payloadOf(task);
    const row = await db("imports").where({ id }).first("state");
    if (row?.state !== "checking") return;
    if (task.attempts > 1) await clearImportIssues(db, { id });
    await tracked(db, id, async (onProgress) => {
      const file = await getImportFile(db, { id });
      if (!file) return;
      const source = await storedRows(file);
      await checkImportRows(db, { importId: id, actor, source, onProgress });
    });
  },
  async giveUp({ task, db }) {
    await failImport(db, {
      id: payloadOf(task).id,
      message: "The check was interrupted several times. Nothing was imported; start the check again.",
    });
  },
};

export const importCommitTask: TaskHandler = {
  async run({ task, db }) {
    const { id, actor } = payloadOf(task);
    const row = await db("imports").where({ id }).first("state", "branch_id", "organisation_id");
    if (row?.state !== "importing") return;
    await tracked(db, id, async (onProgress) => {
      const file = await getImportFile(db, { id });
      if (!file) return;
      const source = await storedRows(file);
      await commitImportRows(db, { importId: id, actor, source, onProgress });
    });
    // Continuous audit: the imported records' branch is re-checked like after any other write.
    await queueRecheck(db, { organisationId: Number(row.organisation_id), branchId: Number(row.branch_id), actorId: actor.userId });
  },
  async giveUp({ task, db }) {
    await failImport(db, {
      id: payloadOf(task).id,
      message: "The import was interrupted several times. Nothing was imported; start it again.",
    });
  },
};

/** An import left `checking`/`importing` with no task queued or running for it is marked failed (nothing written). */
export async function settleAbandoned(db: Knex, id: number): Promise<void> {
  const active = await db("background_tasks")
    .where("unique_key", "like", `import:${id}:%`)
    .whereIn("state", ["queued", "running"])
    .first("id");
  if (active) return;
  await failAbandonedImports(db, { running: new Set(state.running.keys()), olderThanMs: 60_000, ids: [id] });
}
