import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
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
  h = routeHarness(
    () => t.db,
    (web) => {
      vi.doMock("@/lib/env", () => import(web("lib/env.ts")));
      vi.doMock("@/lib/server/storage", () => import(web("lib/server/storage.ts")));
    },
  );
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

describe("file storage down", () => {
  it("an upload answers 503 'file storage is unavailable' and saves nothing", async () => {
    const net = await import("node:net");
    // A port with nothing listening: the S3 SDK's connection is refused.
    const port = await new Promise<number>((resolve) => {
      const s = net.createServer().listen(0, "127.0.0.1", () => {
        const p = (s.address() as { port: number }).port;
        s.close(() => resolve(p));
      });
    });
    process.env.S3_ENDPOINT = `http://127.0.0.1:${port}`;
    const imports = await h.load("imports");
    await h.signInAs(await user(DEMO_SIGN_INS.owner));
    const branch = await t.db("branches").where({ organisation_id: 1 }).orderBy("id").first("id");
    const before = Number((await t.db("imports").count({ n: "*" }).first())!.n);
    const form = new FormData();
    form.set("kind", "appliances");
    form.set("branchId", String(branch.id));
    form.set("file", new File(["tag,description\nRTU-1,Rooftop unit\n"], "appliances.csv", { type: "text/csv" }));
    const res = await h.call(imports, "POST", { form, headers: { "idempotency-key": "upload-while-storage-down-1" } });
    expect(res.status).toBe(503);
    expect((res.json.error as { message: string }).message).toMatch(/file storage is unavailable, nothing was saved/i);
    expect(Number((await t.db("imports").count({ n: "*" }).first())!.n)).toBe(before);
    expect(await t.db("idempotency_keys").where({ key: "upload-while-storage-down-1" }).first()).toBeUndefined();
  });
});
