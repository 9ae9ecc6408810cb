import { afterAll, beforeAll, expect, it } from "vitest";
import {
  claimNextTask,
  enqueueTask,
  getTask,
  isUniqueViolation,
  saveIdempotentAnswer,
  TaskRunner,
  writeTransaction,
  type TaskHandler,
} from "@coldtrail/db";
import { createPgTestDb, type TestDb } from "@coldtrail/db/testing";
import { PG_URL, describePg } from "./pg-helpers";

/**
 * Durable writes on PostgreSQL: concurrent runners on separate connections claim each task once
 * (the conditional UPDATE waits for the row lock and re-checks), a unique task key makes one task,
 * an expired lease is taken over, and a second commit of one idempotency key is a unique violation
 * (which the route wrapper answers with the first result).
 */

let t: TestDb;
let organisationId: number;

beforeAll(async () => {
  if (!PG_URL) return;
  t = await createPgTestDb(PG_URL);
  const [org] = await t.db("organisations").insert({ name: "Runner Cooling", created_at: "2026-12-01T00:00:00.000Z" }).returning("id");
  organisationId = Number(org.id);
}, 180_000);
afterAll(async () => {
  await t?.destroy();
});

describePg("durable writes", () => {
  it("four lanes of two runners run every task once", async () => {
    for (let i = 0; i < 40; i += 1) await enqueueTask(t.db, { kind: "count", payload: { n: i }, organisationId });
    const ran: number[] = [];
    const handler: TaskHandler = {
      run: async ({ task }) => {
        ran.push(Number(task.payload.n));
        await new Promise((r) => setTimeout(r, 2));
      },
    };
    const a = new TaskRunner(t.db, { handlers: { count: handler }, owner: "a" });
    const b = new TaskRunner(t.db, { handlers: { count: handler }, owner: "b" });
    await Promise.all([a.drain(), b.drain(), a.drain(), b.drain()]);
    expect(ran.sort((x, y) => x - y)).toEqual(Array.from({ length: 40 }, (_, i) => i));
  });

  it("a unique key makes one task however many queue it at once", async () => {
    const ids = await Promise.all(
      [1, 2, 3, 4].map(() => enqueueTask(t.db, { kind: "digest", uniqueKey: `digest:${organisationId}:2026-12-03` })),
    );
    expect(ids.filter((x) => x !== null)).toHaveLength(1);
  });

  it("an expired lease is taken over", async () => {
    const id = (await enqueueTask(t.db, { kind: "work" }))!;
    expect((await claimNextTask(t.db, { owner: "killed", leaseMs: 200, kinds: ["work"] }))?.id).toBe(id);
    const live = new TaskRunner(t.db, { owner: "live", handlers: { work: { run: async () => undefined } } });
    for (let i = 0; i < 100 && !(await live.runOne(["work"])); i += 1) await new Promise((r) => setTimeout(r, 50));
    expect(await getTask(t.db, id)).toMatchObject({ state: "done", attempts: 2 });
  });

  it("one idempotency key committed twice at once: the second is a unique violation and rolls back", async () => {
    const user = await t
      .db("users")
      .insert({
        organisation_id: organisationId,
        email: "kit@runner.example",
        name: "Kit",
        password_hash: "x",
        active: true,
        created_at: "2026-12-01T00:00:00.000Z",
      })
      .returning("id");
    const userId = Number(user[0].id);
    const answer = { method: "POST", path: "/api/jobs", requestHash: "h", status: 201, body: "{}", contentType: "application/json" };
    const results = await Promise.allSettled(
      [1, 2].map(() =>
        writeTransaction(t.db, async (trx) => {
          await trx("organisations").insert({ name: "written with the key", created_at: "2026-12-01T00:00:00.000Z" });
          await saveIdempotentAnswer(trx, { userId, organisationId, key: "same-key-0001", answer });
        }),
      ),
    );
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const rejected = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect(isUniqueViolation(rejected.reason)).toBe(true);
    expect(Number((await t.db("organisations").where({ name: "written with the key" }).count({ n: "*" }).first())!.n)).toBe(1);
  });
});
