/**
 * A background runner process of the fault bench: runs `slow` tasks (each takes FAULT_TASK_MS) with the
 * production lease settings, printing "done <id>" when one finishes. The bench kills it mid-task.
 */
import { createDb, TaskRunner } from "../../../packages/db/src/index";

const db = createDb(process.env.FAULT_DB!);
const runner = new TaskRunner(db, {
  owner: `bench-runner-${process.pid}`,
  log: () => undefined,
  handlers: {
    slow: {
      run: async ({ task }) => {
        process.stdout.write(`started ${task.id} attempt ${task.attempts} ${new Date().toISOString()}\n`);
        await new Promise((r) => setTimeout(r, Number(process.env.FAULT_TASK_MS ?? 2000)));
        process.stdout.write(`done ${task.id}\n`);
      },
    },
  },
});
runner.start();
