import "server-only";
import {
  expireIdempotencyKeys,
  getDb,
  pruneFinishedTasks,
  pruneSentMail,
  TaskRunner,
  enqueueTask,
  type Knex,
  type TaskHandler,
} from "@coldtrail/db";
import { adoptOrphanAudits, auditTask } from "./audit-runner";
import { recheckTask } from "./continuous-audit";
import { digestTask, scheduleDailyDigests } from "./finding-mail";
import { mailTask } from "./mail";
import { setTaskKick } from "./task-kick";
import { importCheckTask, importCommitTask } from "../../app/api/imports/_lib/import-worker";
import { env } from "../env";

/**
 * The one background runner of this server process (packages/db durable/runner.ts) with the app's
 * task kinds. Started once from src/instrumentation.ts; every server instance runs one, and the
 * leases in `background_tasks` keep each task to one runner at a time. When idle (every 30 s) it
 * queues scheduled work: today's digests after 07:00 UTC (one per organisation and day), a daily
 * housekeeping task, and a task for any audit left without one.
 */

const housekeepingTask: TaskHandler = {
  async run({ db }) {
    const keys = await expireIdempotencyKeys(db);
    const tasks = await pruneFinishedTasks(db);
    const mail = await pruneSentMail(db);
    if (keys || tasks || mail)
      console.log(`[tasks] housekeeping: ${keys} idempotency key(s), ${tasks} finished task(s), ${mail} sent mail(s) forgotten`);
  },
};

export const TASK_HANDLERS: Record<string, TaskHandler> = {
  audit: auditTask,
  import_check: importCheckTask,
  import_commit: importCommitTask,
  recheck: recheckTask,
  digest: digestTask,
  mail: mailTask,
  housekeeping: housekeepingTask,
};

/** Scheduled work, queued idempotently (unique keys) so any number of instances may call it. */
export async function queueScheduledWork(db: Knex, now: Date = new Date()): Promise<void> {
  if (env.COLDTRAIL_DIGEST !== "off") await scheduleDailyDigests(db, now);
  await enqueueTask(db, { kind: "housekeeping", uniqueKey: `housekeeping:${now.toISOString().slice(0, 10)}` });
  await adoptOrphanAudits(db);
}

const globalForRunner = globalThis as unknown as { __coldtrailRunner?: TaskRunner };

export function startTaskRunner(db: Knex = getDb()): TaskRunner {
  if (globalForRunner.__coldtrailRunner) return globalForRunner.__coldtrailRunner;
  const runner = new TaskRunner(db, { handlers: TASK_HANDLERS, onIdle: (d) => queueScheduledWork(d) });
  globalForRunner.__coldtrailRunner = runner;
  setTaskKick(() => runner.kick());
  runner.start();
  return runner;
}
