import { describe, expect } from "vitest";
import { defineAbilityFor, type AppAbility } from "@coldtrail/core";
import { DEMO_SIGN_INS, loadActor, type Actor, type Knex } from "@coldtrail/db";
import { createPgTestDb, createSeededTestDb, createTestDb, type TestDb } from "@coldtrail/db/testing";

/** The PostgreSQL server the tests use; empty means every test here is skipped. */
export const PG_URL = process.env.COLDTRAIL_PG_URL?.trim() ?? "";

/** A describe block that runs only when COLDTRAIL_PG_URL is set. */
export const describePg = (name: string, body: () => void) =>
  describe.skipIf(!PG_URL)(`${name} (PostgreSQL; set COLDTRAIL_PG_URL to run)`, body);

/** The clock the demo data is read with (the data runs to 2026-11-30). */
export const NOW = new Date("2026-12-01T12:00:00Z");
export const TODAY = "2026-12-01";

export const ROLES = Object.entries(DEMO_SIGN_INS) as Array<[keyof typeof DEMO_SIGN_INS, string]>;

/** The same data in SQLite and in PostgreSQL. */
export interface Pair {
  sqlite: TestDb;
  pg: TestDb;
}

/** Both dialects migrated and loaded with the demo data. */
export async function seededPair(): Promise<Pair> {
  const [sqlite, pg] = await Promise.all([createSeededTestDb(), createPgTestDb(PG_URL, { seeded: true })]);
  return { sqlite, pg };
}

/** Both dialects migrated, no data. */
export async function emptyPair(): Promise<Pair> {
  const [sqlite, pg] = await Promise.all([createTestDb(), createPgTestDb(PG_URL)]);
  return { sqlite, pg };
}

export async function destroyPair(pair: Pair | undefined): Promise<void> {
  if (!pair) return;
  await Promise.all([pair.sqlite.destroy(), pair.pg.destroy()]);
}

/**
 * Runs the same read on both databases and expects PostgreSQL to return exactly what SQLite returns
 * (same rows, same order, same JavaScript types). Returns the SQLite result for further checks.
 */
export async function same<T>(pair: Pair, read: (db: Knex) => Promise<T>, label?: string): Promise<T> {
  const fromSqlite = await read(pair.sqlite.db);
  const fromPg = await read(pair.pg.db);
  expect(fromPg, label).toStrictEqual(fromSqlite);
  return fromSqlite;
}

/**
 * Raw rows with the named boolean columns read as booleans: SQLite gives them back as 0/1 and
 * PostgreSQL as true/false (packages/db/README.md). The app's own reads normalise them; raw rows do not.
 */
export function withBooleans<T extends Record<string, unknown>>(rows: T[], columns: string[]): T[] {
  return rows.map((r) => {
    const out: Record<string, unknown> = { ...r };
    for (const c of columns) if (out[c] !== null && out[c] !== undefined) out[c] = out[c] === true || out[c] === 1;
    return out as T;
  });
}

/** Every value an async generator yields (the export rows). */
export async function collect<T>(rows: AsyncIterable<T>): Promise<T[]> {
  const out: T[] = [];
  for await (const r of rows) out.push(r);
  return out;
}

export async function userIdOf(db: Knex, email: string): Promise<number> {
  const row = await db("users").where({ email }).first("id");
  if (!row) throw new Error(`no user ${email}`);
  return Number(row.id);
}

/** The signed-in person and their ability, read from `db` (the ids are the same in both dialects). */
export async function signIn(db: Knex, email: string, now = NOW): Promise<{ actor: Actor; ability: AppAbility }> {
  const actor = await loadActor(db, await userIdOf(db, email));
  if (!actor) throw new Error(`no actor for ${email}`);
  return { actor, ability: defineAbilityFor(actor, now) };
}
