import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_SIGN_INS, DatabaseBusyError, enqueueTask, getTask, claimNextTask, failTaskAttempt } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";
import { routeHarness, type Harness, type RouteModule } from "./route-harness";

/**
 * The owner's background-work controls are checked on the server (only the owner may put a failed
 * task back in the queue, and only their organisation's), and a database lock that outlasts the
 * wait is answered 503 with Retry-After, never 500.
 */

let t: TestDb;
let h: Harness;
let retry: RouteModule;
const user = async (email: string) => Number((await t.db("users").where({ email }).first("id")).id);

async function failedTask(organisationId: number): Promise<number> {
  const id = (await enqueueTask(t.db, { kind: "mail", payload: { outboxId: 0 }, organisationId, maxAttempts: 1 }))!;
  const claimed = await claimNextTask(t.db, { owner: "r", leaseMs: 10_000, kinds: ["mail"] });
  expect(claimed?.id).toBe(id);
  expect(await failTaskAttempt(t.db, { id, owner: "r", error: "The mail server did not answer" })).toBe("failed");
  return id;
}

beforeAll(async () => {
  t = await createSeededTestDb();
  h = routeHarness(() => t.db);
  retry = await h.load("admin/background/[id]/retry");
});
afterAll(async () => {
  await t.destroy();
});

describe("background work, owner only", () => {
  it("an officer may not retry; the owner may, for their own organisation only", async () => {
    const own = await failedTask(1);
    const otherOrg = await failedTask(2);
    await h.signInAs(await user(DEMO_SIGN_INS.compliance_officer));
    expect((await h.call(retry, "POST", { params: { id: String(own) } })).status).toBe(403);
    expect((await getTask(t.db, own))?.state).toBe("failed");

    await h.signInAs(await user(DEMO_SIGN_INS.owner));
    expect((await h.call(retry, "POST", { params: { id: String(otherOrg) } })).status).toBe(404);
    expect((await getTask(t.db, otherOrg))?.state).toBe("failed");
    const ok = await h.call(retry, "POST", { params: { id: String(own) } });
    expect(ok.status).toBe(200);
    expect(await getTask(t.db, own)).toMatchObject({ state: "queued", attempts: 0 });
    expect((await h.call(retry, "POST", { params: { id: String(own) } })).status).toBe(409);
  });

  it("a lock that outlasts the wait is a 503 with Retry-After", async () => {
    const web = (p: string) => new URL(`../../apps/web/src/${p}`, import.meta.url).pathname;
    const { toErrorResponse } = (await import(web("lib/api/errors.ts"))) as { toErrorResponse: (e: unknown) => Response };
    const busy = toErrorResponse(new DatabaseBusyError());
    expect(busy.status).toBe(503);
    expect(busy.headers.get("retry-after")).toBe("2");
    expect(((await busy.json()) as { error: { code: string } }).error.code).toBe("busy");
    const raw = toErrorResponse(Object.assign(new Error("database is locked"), { code: "SQLITE_BUSY" }));
    expect(raw.status).toBe(503);
  });
});
