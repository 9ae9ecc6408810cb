import { reevaluateAfterWrite } from "@/lib/server/continuous-audit";
import "server-only";
import {
  checkImportRows,
  commitImportRows,
  createDb,
  getDb,
  databaseFile,
  failAbandonedImports,
  failImport,
  getImportFile,
  type ActorRef,
  type ImportProgress,
  type Knex,
} from "@coldtrail/db";
import { storedRows } from "./read-spreadsheet";

/**
 * Runs the long steps of an import in the background of this server process, one at a time per
 * import, and keeps their live progress for the page's polling. The work uses its own database
 * connection: the one transaction that writes an import's rows then does not hold the connection
 * that answers the page (which keeps reading the state meanwhile).
 */

interface WorkerState {
  running: Map<number, ImportProgress | null>;
  db?: Knex;
}

const globalForImports = globalThis as unknown as { coldtrailImports?: WorkerState };
const state: WorkerState = (globalForImports.coldtrailImports ??= { running: new Map() });

function workerDb(): Knex {
  state.db ??= createDb(databaseFile());
  return state.db;
}

/** Live progress of an import this process is working on, if any. */
export function liveProgress(id: number): ImportProgress | null | undefined {
  return state.running.get(id);
}

export function isRunning(id: number): boolean {
  return state.running.has(id);
}

function run(id: number, work: (db: Knex, onProgress: (p: ImportProgress) => void) => Promise<unknown>): void {
  if (state.running.has(id)) return;
  state.running.set(id, null);
  const db = workerDb();
  void work(db, (p) => state.running.set(id, p))
    .catch(async (err) => {
      console.error(`import ${id} stopped`, err);
      await failImport(db, { id, message: "The file could not be read from storage. Nothing was imported." }).catch(() => undefined);
    })
    .finally(() => state.running.delete(id));
}

/** Checks every row of the import in the background (state `checking` → `checked` or `failed`). */
export function startCheck(id: number, actor: ActorRef): void {
  run(id, async (db, onProgress) => {
    const file = await getImportFile(db, { id });
    if (!file) return;
    const source = await storedRows(file);
    await checkImportRows(db, { importId: id, actor, source, onProgress });
  });
}

/** Writes the valid rows in one transaction in the background (state `importing` → `imported` or `failed`). */
export function startCommit(id: number, actor: ActorRef): void {
  run(id, async (db, onProgress) => {
    const file = await getImportFile(db, { id });
    if (!file) return;
    const source = await storedRows(file);
    await commitImportRows(db, { importId: id, actor, source, onProgress });
    // Continuous audit: the imported records' branch is re-checked like after any other write.
    const row = await db("imports")
      .where({ id })
      .first<{ branch_id: number; organisation_id: number } | undefined>("branch_id", "organisation_id");
    if (row)
      void reevaluateAfterWrite(getDb(), {
        organisationId: Number(row.organisation_id),
        branchId: Number(row.branch_id),
        actorId: actor.userId,
      });
  });
}

/** An import left `checking`/`importing` by a process that stopped is marked failed (nothing written). */
export async function settleAbandoned(db: Knex, id: number): Promise<void> {
  await failAbandonedImports(db, { running: new Set(state.running.keys()), olderThanMs: 60_000, ids: [id] });
}
