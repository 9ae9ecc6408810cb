import { spawn, type ChildProcess } from "node:child_process";
import { createRequire } from "node:module";
import { afterEach, describe, expect, it } from "vitest";
import { createDb, DatabaseBusyError, type Knex } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * Writers wait for SQLite's write lock instead of failing. better-sqlite3 waits synchronously, so the
 * other writer must be another process: a child holds the lock (BEGIN IMMEDIATE + an insert) for a
 * while, as a second server instance or a maintenance script would.
 */

const betterSqlite = createRequire(new URL("../../packages/db/package.json", import.meta.url)).resolve("better-sqlite3");

let t: TestDb;
let holder: ChildProcess | null = null;
const others: Knex[] = [];

afterEach(async () => {
  holder?.kill("SIGKILL");
  holder = null;
  for (const db of others.splice(0)) await db.destroy();
  await t?.destroy();
});

/** Starts a process that takes the write lock, inserts a row, holds the lock `holdMs`, then commits. Resolves once it holds the lock. */
function holdLock(file: string, holdMs: number): Promise<void> {
  const script = `
    const Database = require(${JSON.stringify(betterSqlite)});
    const db = new Database(${JSON.stringify(file)});
    db.pragma("busy_timeout = 5000");
    db.exec("BEGIN IMMEDIATE");
    db.prepare("INSERT INTO organisations (name, created_at) VALUES ('Held by the other writer', '2026-12-03T00:00:00.000Z')").run();
    process.stdout.write("locked\\n");
    setTimeout(() => { db.exec("COMMIT"); db.close(); process.stdout.write("committed\\n"); }, ${holdMs});
  `;
  holder = spawn(process.execPath, ["-e", script], { stdio: ["ignore", "pipe", "inherit"] });
  return new Promise((resolve, reject) => {
    holder!.stdout!.on("data", (chunk: Buffer) => chunk.toString().includes("locked") && resolve());
    holder!.on("exit", (code) => code !== 0 && code !== null && reject(new Error(`lock holder exited ${code}`)));
  });
}

const orgNames = async (db: Knex) => (await db("organisations").orderBy("id").select("name")).map((r) => r.name as string);

describe("writers and the SQLite write lock", () => {
  it("a transaction that finds the lock taken waits for it and then commits", async () => {
    t = await createTestDb();
    await holdLock(t.file, 400);
    // A transaction that reads first and writes later: begun IMMEDIATE, it waits for the lock at BEGIN
    // (a deferred BEGIN would fail with SQLITE_BUSY at the first write, without waiting).
    await t.db.transaction(async (trx) => {
      await trx("organisations").count({ n: "*" });
      await trx("organisations").insert({ name: "Written after the wait", created_at: "2026-12-03T00:00:01.000Z" });
    });
    expect(await orgNames(t.db)).toEqual(["Held by the other writer", "Written after the wait"]);
  });

  it("a lock held past the wait is a DatabaseBusyError and nothing is written", async () => {
    t = await createTestDb();
    const impatient = createDb(t.file, { busyTimeoutMs: 50 });
    others.push(impatient);
    await holdLock(t.file, 3_000);
    const attempt = impatient.transaction(async (trx) => {
      await trx("organisations").insert({ name: "Never written", created_at: "2026-12-03T00:00:01.000Z" });
    });
    await expect(attempt).rejects.toBeInstanceOf(DatabaseBusyError);
    holder!.kill("SIGKILL");
    await new Promise((resolve) => holder!.once("exit", resolve));
    holder = null;
    expect(await orgNames(impatient)).toEqual([]);
  });

  it("nested transactions stay savepoints inside the immediate one", async () => {
    t = await createTestDb();
    await t.db.transaction(async (trx) => {
      await trx("organisations").insert({ name: "Outer", created_at: "2026-12-03T00:00:00.000Z" });
      await trx
        .transaction(async (inner) => {
          await inner("organisations").insert({ name: "Inner, rolled back", created_at: "2026-12-03T00:00:00.000Z" });
          throw new Error("undo the inner part");
        })
        .catch(() => undefined);
    });
    expect(await orgNames(t.db)).toEqual(["Outer"]);
  });
});
