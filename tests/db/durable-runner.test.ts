import { afterEach, describe, expect, it } from "vitest";
import {
  claimNextTask,
  createDb,
  enqueueTask,
  getTask,
  PermanentTaskError,
  TaskRunner,
  taskCounts,
  type Knex,
  type TaskHandler,
} from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * The background runner over `background_tasks`: one runner per task even with several runners on
 * the same database, takeover of a task whose runner died once its lease expires, retry with
 * backoff, and failure for good with a reason.
 */

let t: TestDb;
const extra: Knex[] = [];
afterEach(async () => {
  for (const db of extra.splice(0)) await db.destroy();
  await t.destroy();
});

async function org(db: Knex): Promise<number> {
  const [r] = await db("organisations").insert({ name: "Runner Test Cooling", created_at: "2026-12-01T00:00:00.000Z" }).returning("id");
  return Number(typeof r === "object" ? r.id : r);
}

/** Runs `step` until it returns true (each try after a short pause); no timing is asserted. */
async function eventually(step: () => Promise<boolean>, tries = 200): Promise<void> {
  for (let i = 0; i < tries; i += 1) {
    if (await step()) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error("did not happen");
}

describe("the background runner", () => {
  it("two runners on two connections run every task exactly once", async () => {
    t = await createTestDb();
    const second = createDb(t.file);
    extra.push(second);
    const organisationId = await org(t.db);
    for (let i = 0; i < 30; i += 1) await enqueueTask(t.db, { kind: "count", payload: { n: i }, organisationId });
    const ran: Array<{ n: number; owner: string }> = [];
    const handler = (owner: string): TaskHandler => ({
      run: async ({ task }) => {
        ran.push({ n: Number(task.payload.n), owner });
        await new Promise((r) => setTimeout(r, 5));
      },
    });
    const a = new TaskRunner(t.db, { handlers: { count: handler("a") }, owner: "runner-a" });
    const b = new TaskRunner(second, { handlers: { count: handler("b") }, owner: "runner-b" });
    await Promise.all([a.drain(), b.drain(), a.drain(), b.drain()]);
    expect(ran.map((r) => r.n).sort((x, y) => x - y)).toEqual(Array.from({ length: 30 }, (_, i) => i));
    expect(await taskCounts(t.db, { organisationId })).toMatchObject({ done: 30, queued: 0, running: 0, failed: 0 });
  });

  it("a task whose runner died is taken over once its lease expires, and counts the attempt", async () => {
    t = await createTestDb();
    const id = (await enqueueTask(t.db, { kind: "work", payload: { step: 1 } }))!;
    // A runner claims it and dies (never heartbeats or completes).
    const dead = await claimNextTask(t.db, { owner: "killed-runner", leaseMs: 300 });
    expect(dead?.id).toBe(id);
    const live = new TaskRunner(t.db, { handlers: { work: { run: async () => undefined } }, owner: "live-runner" });
    // While the lease holds, nobody else may take it.
    expect(await live.runOne()).toBe(false);
    await eventually(() => live.runOne());
    const task = await getTask(t.db, id);
    expect(task).toMatchObject({ state: "done", attempts: 2, leaseOwner: null });
  });

  it("a failed attempt is retried after a backoff and the reason is kept until it succeeds", async () => {
    t = await createTestDb();
    const id = (await enqueueTask(t.db, { kind: "flaky" }))!;
    let calls = 0;
    const runner = new TaskRunner(t.db, {
      owner: "r",
      backoffBaseMs: 60_000,
      log: () => undefined,
      handlers: {
        flaky: {
          run: async () => {
            calls += 1;
            if (calls === 1) throw new Error("the mail server did not answer");
          },
        },
      },
    });
    expect(await runner.runOne()).toBe(true);
    const waiting = await getTask(t.db, id);
    expect(waiting).toMatchObject({ state: "queued", attempts: 1, lastError: "the mail server did not answer" });
    expect(new Date(waiting!.runAfter).getTime()).toBeGreaterThan(Date.now() + 30_000); // backoff: not due yet
    expect(await runner.runOne()).toBe(false);
    await t
      .db("background_tasks")
      .where({ id })
      .update({ run_after: new Date(Date.now() - 1).toISOString() });
    expect(await runner.runOne()).toBe(true);
    expect(await getTask(t.db, id)).toMatchObject({ state: "done", attempts: 2 });
  });

  it("a task fails for good after its attempts, or at once on a permanent error, and its handler is told", async () => {
    t = await createTestDb();
    const gaveUp: string[] = [];
    const handlers: Record<string, TaskHandler> = {
      broken: {
        run: async () => {
          throw new Error("storage is unavailable");
        },
        giveUp: async ({ reason }) => void gaveUp.push(reason),
      },
      refused: {
        run: async () => {
          throw new PermanentTaskError("the file is not a spreadsheet");
        },
        giveUp: async ({ reason }) => void gaveUp.push(reason),
      },
    };
    const runner = new TaskRunner(t.db, { owner: "r", handlers, backoffBaseMs: 0, log: () => undefined });
    const broken = (await enqueueTask(t.db, { kind: "broken", maxAttempts: 3 }))!;
    const refused = (await enqueueTask(t.db, { kind: "refused", maxAttempts: 3 }))!;
    await runner.drain();
    expect(await getTask(t.db, broken)).toMatchObject({ state: "failed", attempts: 3, lastError: "storage is unavailable" });
    expect(await getTask(t.db, refused)).toMatchObject({ state: "failed", attempts: 1, lastError: "the file is not a spreadsheet" });
    expect(gaveUp.sort()).toEqual(["storage is unavailable", "the file is not a spreadsheet"]);
  });

  it("a task interrupted more often than its attempts allow is failed with the reason", async () => {
    t = await createTestDb();
    const id = (await enqueueTask(t.db, { kind: "work", maxAttempts: 2 }))!;
    for (const owner of ["killed-1", "killed-2"]) {
      await eventually(async () => Boolean(await claimNextTask(t.db, { owner, leaseMs: 1 })));
    }
    let ran = false;
    const runner = new TaskRunner(t.db, { owner: "r", handlers: { work: { run: async () => void (ran = true) } }, log: () => undefined });
    await eventually(() => runner.runOne());
    expect(ran).toBe(false);
    expect(await getTask(t.db, id)).toMatchObject({ state: "failed", lastError: "Interrupted 2 times (the server stopped while it ran)" });
  });

  it("a unique key makes a task once, however many try to queue it", async () => {
    t = await createTestDb();
    const second = createDb(t.file);
    extra.push(second);
    const ids = await Promise.all(
      [t.db, second, t.db, second].map((db) => enqueueTask(db, { kind: "digest", uniqueKey: "digest:1:2026-12-03" })),
    );
    expect(ids.filter((x) => x !== null)).toHaveLength(1);
    expect(Number((await t.db("background_tasks").count({ n: "*" }).first())!.n)).toBe(1);
  });
});
