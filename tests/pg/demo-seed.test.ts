import { afterAll, beforeAll, expect, it } from "vitest";
import { DEMO_PASSWORD, DEMO_SIGN_INS, createOrganisationWithOwner, loadDemoData, verifyPassword, type Knex } from "@coldtrail/db";
import { PG_URL, describePg, destroyPair, seededPair, type Pair } from "./pg-helpers";

/**
 * The demo data loads on PostgreSQL with exactly the rows SQLite holds, value for value; the
 * sequences move past the explicit ids the loader inserts, so new rows get the ids SQLite gives.
 */

let pair: Pair;

beforeAll(async () => {
  if (!PG_URL) return;
  pair = await seededPair();
}, 180_000);
afterAll(async () => {
  await destroyPair(pair);
});

async function tablesOf(db: Knex): Promise<string[]> {
  const rows: Array<{ table_name: string }> = await db("information_schema.tables")
    .where({ table_schema: db.raw("current_schema()"), table_type: "BASE TABLE" })
    .select("table_name");
  return rows
    .map((r) => r.table_name)
    .filter((n) => !n.startsWith("knex_"))
    .sort();
}

async function columnsOf(db: Knex, table: string): Promise<Array<{ name: string; type: string }>> {
  const rows: Array<{ column_name: string; data_type: string }> = await db("information_schema.columns")
    .where({ table_schema: db.raw("current_schema()"), table_name: table })
    .orderBy("ordinal_position")
    .select("column_name", "data_type");
  return rows.map((r) => ({ name: r.column_name, type: r.data_type }));
}

const count = async (db: Knex, table: string) => Number((await db(table).count({ n: "*" }).first())?.n);

describePg("the demo data on PostgreSQL", () => {
  it("has the same number of rows in every table as on SQLite", async () => {
    const tables = await tablesOf(pair.pg.db);
    const counts: Record<string, [number, number]> = {};
    for (const table of tables) counts[table] = [await count(pair.sqlite.db, table), await count(pair.pg.db, table)];
    for (const [table, [fromSqlite, fromPg]] of Object.entries(counts)) expect(fromPg, table).toBe(fromSqlite);
    for (const table of [
      "organisations",
      "branches",
      "users",
      "appliances",
      "jobs",
      "cylinders",
      "refrigerant_movements",
      "reclaim_shipments",
      "purchases",
      "certifications",
      "disposal_records",
      "disposal_statements",
      "activity",
    ]) {
      expect(counts[table]![0], table).toBeGreaterThan(0);
    }
    expect(counts.jobs![0]).toBeGreaterThan(1500);
  });

  it("holds the same values, row by row (booleans read as booleans)", async () => {
    for (const table of await tablesOf(pair.pg.db)) {
      const columns = await columnsOf(pair.pg.db, table);
      const names = columns.map((c) => c.name);
      const order = names.includes("id") ? ["id"] : names.filter((n) => n.endsWith("_id") || n === "type");
      const booleans = columns.filter((c) => c.type === "boolean").map((c) => c.name);
      const read = async (db: Knex) => {
        const rows: Record<string, unknown>[] = await db(table).orderBy(order).select(names);
        // SQLite keeps booleans as 0/1 (packages/db/README.md); compare them as booleans.
        return rows.map((r) => {
          for (const b of booleans) if (r[b] !== null) r[b] = r[b] === true || r[b] === 1;
          return r;
        });
      };
      expect(await read(pair.pg.db), table).toStrictEqual(await read(pair.sqlite.db));
    }
  });

  it("moves every id sequence to the highest id loaded", async () => {
    for (const table of await tablesOf(pair.pg.db)) {
      if (!(await columnsOf(pair.pg.db, table)).some((c) => c.name === "id")) continue;
      const max = Number((await pair.pg.db(table).max({ m: "id" }).first())?.m ?? 0);
      // PostgreSQL-only catalogue read: the sequence behind the serial id column.
      const seq = (await pair.pg.db.raw("select pg_get_serial_sequence(?, 'id') as s", [table])).rows[0].s as string;
      const state = (await pair.pg.db.raw(`select last_value, is_called from ${seq}`)).rows[0];
      if (max === 0) expect(state.is_called, `${table} is empty, its sequence untouched`).toBe(false);
      else expect([Number(state.last_value), state.is_called], table).toEqual([max, true]);
    }
  });

  it("gives new rows the same ids as SQLite, and refuses a second load", async () => {
    const open = (db: Knex) =>
      createOrganisationWithOwner(db, {
        name: "Sequence Check Ltd",
        ownerName: "Ida Sequence",
        ownerEmail: "ida@sequence-check.example",
        now: new Date("2026-12-01T00:00:00Z"),
      });
    const ids = async (db: Knex) => {
      const { organisationId, ownerId } = await open(db);
      const newest = async (table: string) => Number((await db(table).max({ m: "id" }).first())?.m);
      return {
        organisationId,
        ownerId,
        membership: await newest("memberships"),
        invitation: await newest("invitations"),
        activity: await newest("activity"),
      };
    };
    const fromSqlite = await ids(pair.sqlite.db);
    expect(await ids(pair.pg.db)).toStrictEqual(fromSqlite);
    expect(fromSqlite.organisationId).toBe(3);
    await expect(loadDemoData(pair.pg.db)).rejects.toThrow(/already holds data/);
  });

  it("signs the demo people in with the demo password", async () => {
    for (const email of Object.values(DEMO_SIGN_INS)) {
      const row = await pair.pg.db("users").where({ email }).first("password_hash", "active");
      expect(row.active, email).toBe(true);
      expect(await verifyPassword(DEMO_PASSWORD, row.password_hash), email).toBe(true);
    }
  });
});
