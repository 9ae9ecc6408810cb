import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { expireIdempotencyKeys } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";
import { smallFixture } from "./fixture";
import { routeHarness, type Harness, type RouteModule } from "./route-harness";

/**
 * A creating route with `Idempotency-Key`: the same job form posted twice (a technician retrying after
 * an error) makes one job and moves the refrigerant once; the repeat gets the first answer.
 */

let t: TestDb;
let f: Awaited<ReturnType<typeof smallFixture>>;
let h: Harness;
let jobs: RouteModule;

beforeAll(async () => {
  t = await createTestDb();
  f = await smallFixture(t.db);
  h = routeHarness(() => t.db);
  jobs = await h.load("jobs");
  await h.signInAs(f.tech);
});
afterAll(async () => {
  await t.destroy();
});

const job = (over: Record<string, unknown> = {}) => ({
  kind: "recovery",
  applianceId: f.northAppliance,
  performedOn: "2026-03-14",
  refrigerant: "R-410A",
  // Small amounts: the cylinder takes every job of this file without passing its safe fill.
  recoveredAmount: 2.5,
  recoveredUnit: "lb",
  cylinderId: f.northCylinder,
  equipmentId: f.northEquipment,
  evacuationValue: 15,
  evacuationUnit: "in_hg_vacuum",
  accessMethod: "service_valve",
  ...over,
});

const count = async (table: string) => Number((await t.db(table).count({ n: "*" }).first())!.n);
const contents = async () => Number((await t.db("cylinders").where({ id: f.northCylinder }).first("contents_g")).contents_g);

describe("Idempotency-Key on creating routes", () => {
  it("a repeat with the same key returns the first answer and writes nothing", async () => {
    const before = { jobs: await count("jobs"), movements: await count("refrigerant_movements"), contents: await contents() };
    const headers = { "idempotency-key": "job-form-0b6f2a1e-0001" };
    const first = await h.call(jobs, "POST", { body: job(), headers, path: "/api/jobs" });
    expect(first.status).toBe(201);
    const afterFirst = { jobs: await count("jobs"), movements: await count("refrigerant_movements"), contents: await contents() };
    expect(afterFirst.jobs).toBe(before.jobs + 1);
    expect(afterFirst.contents).toBe(before.contents + 1134); // 2.5 lb (1,133.98 g) into the cylinder, once

    const again = await h.call(jobs, "POST", { body: job(), headers, path: "/api/jobs" });
    expect(again.status).toBe(201);
    expect(again.json).toEqual(first.json);
    expect(again.headers.get("idempotency-replayed")).toBe("true");
    expect({ jobs: await count("jobs"), movements: await count("refrigerant_movements"), contents: await contents() }).toEqual(afterFirst);
  });

  it("concurrent repeats of one key make one job", async () => {
    const before = await count("jobs");
    const headers = { "idempotency-key": "job-form-0b6f2a1e-0002" };
    const answers = await Promise.all(
      [1, 2, 3, 4].map(() => h.call(jobs, "POST", { body: job({ performedOn: "2026-03-15" }), headers, path: "/api/jobs" })),
    );
    expect(answers.map((a) => a.status)).toEqual([201, 201, 201, 201]);
    expect(new Set(answers.map((a) => JSON.stringify(a.json))).size).toBe(1);
    expect(await count("jobs")).toBe(before + 1);
  });

  it("the same key with a different body is refused with 422 and writes nothing", async () => {
    const headers = { "idempotency-key": "job-form-0b6f2a1e-0003" };
    expect((await h.call(jobs, "POST", { body: job({ performedOn: "2026-03-16" }), headers, path: "/api/jobs" })).status).toBe(201);
    const before = await count("jobs");
    const other = await h.call(jobs, "POST", { body: job({ performedOn: "2026-03-17" }), headers, path: "/api/jobs" });
    expect(other.status).toBe(422);
    expect(String((other.json.error as { message: string }).message)).toMatch(/already used for a different request/);
    expect(await count("jobs")).toBe(before);
  });

  it("a refused request stores no key, so the corrected form can be sent with it", async () => {
    const headers = { "idempotency-key": "job-form-0b6f2a1e-0004" };
    const refused = await h.call(jobs, "POST", { body: job({ cylinderId: f.southCylinder }), headers, path: "/api/jobs" });
    expect(refused.status).toBeGreaterThanOrEqual(400);
    expect(await t.db("idempotency_keys").where({ key: headers["idempotency-key"] }).first()).toBeUndefined();
    const before = await count("jobs");
    expect((await h.call(jobs, "POST", { body: job({ performedOn: "2026-03-18" }), headers, path: "/api/jobs" })).status).toBe(201);
    expect(await count("jobs")).toBe(before + 1);
  });

  it("keys belong to one person, and without a key every post creates", async () => {
    const before = await count("jobs");
    expect((await h.call(jobs, "POST", { body: job({ performedOn: "2026-03-19" }), path: "/api/jobs" })).status).toBe(201);
    expect((await h.call(jobs, "POST", { body: job({ performedOn: "2026-03-19" }), path: "/api/jobs" })).status).toBe(201);
    expect(await count("jobs")).toBe(before + 2);
    const stored = await t.db("idempotency_keys").where({ key: "job-form-0b6f2a1e-0001" }).first("user_id");
    expect(Number(stored.user_id)).toBe(f.tech);
  });

  it("a malformed key is refused before anything is written", async () => {
    const before = await count("jobs");
    const res = await h.call(jobs, "POST", { body: job(), headers: { "idempotency-key": "no spaces allowed" }, path: "/api/jobs" });
    expect(res.status).toBe(400);
    expect(await count("jobs")).toBe(before);
  });

  it("housekeeping forgets keys after a week", async () => {
    const n = await count("idempotency_keys");
    expect(n).toBeGreaterThan(0);
    expect(await expireIdempotencyKeys(t.db, { now: new Date(Date.now() + 6 * 86_400_000) })).toBe(0);
    expect(await expireIdempotencyKeys(t.db, { now: new Date(Date.now() + 8 * 86_400_000) })).toBe(n);
    expect(await count("idempotency_keys")).toBe(0);
  });
});
