import { afterAll, beforeAll, expect, it } from "vitest";
import { MIGRATION_NAMES, type Knex } from "@coldtrail/db";
import { createPgTestDb, createTestDb, type TestDb } from "@coldtrail/db/testing";
import { PG_URL, describePg } from "./pg-helpers";

/**
 * The migrations on PostgreSQL: the same tables, columns and indexes as on SQLite; all the way down
 * and up again; PostgreSQL's own twin of the append-only triggers; foreign keys and unique indexes.
 */

let pg: TestDb;
let sqlite: TestDb;

beforeAll(async () => {
  if (!PG_URL) return;
  [pg, sqlite] = await Promise.all([createPgTestDb(PG_URL), createTestDb()]);
}, 120_000);
afterAll(async () => {
  await Promise.all([pg?.destroy(), sqlite?.destroy()]);
});

const isKnexTable = (name: string) => name.startsWith("knex_");

async function pgTables(db: Knex): Promise<string[]> {
  const rows: Array<{ table_name: string }> = await db("information_schema.tables")
    .where({ table_schema: db.raw("current_schema()"), table_type: "BASE TABLE" })
    .select("table_name");
  return rows
    .map((r) => r.table_name)
    .filter((n) => !isKnexTable(n))
    .sort();
}

/** SQLite's catalogue (test-only SQLite SQL: sqlite_master and pragma_table_info have no knex builder). */
async function sqliteTables(db: Knex): Promise<string[]> {
  const rows: Array<{ name: string }> = await db("sqlite_master")
    .where({ type: "table" })
    .whereNot("name", "like", "sqlite_%")
    .select("name");
  return rows
    .map((r) => r.name)
    .filter((n) => !isKnexTable(n))
    .sort();
}

async function pgColumns(db: Knex, table: string): Promise<Array<[string, string]>> {
  const rows: Array<{ column_name: string; data_type: string; is_nullable: string }> = await db("information_schema.columns")
    .where({ table_schema: db.raw("current_schema()"), table_name: table })
    .select("column_name", "data_type", "is_nullable");
  return rows
    .map((r) => [r.column_name, r.is_nullable === "YES" ? "null" : "not null"] as [string, string])
    .sort((a, b) => a[0].localeCompare(b[0]));
}

async function sqliteColumns(db: Knex, table: string): Promise<Array<[string, string]>> {
  const rows: Array<{ name: string; notnull: number; pk: number }> = await db.raw('select name, "notnull", pk from pragma_table_info(?)', [
    table,
  ]);
  // A SQLite primary-key column may be declared without NOT NULL; PostgreSQL always makes it NOT NULL.
  return rows.map((r) => [r.name, r.notnull || r.pk ? "not null" : "null"] as [string, string]).sort((a, b) => a[0].localeCompare(b[0]));
}

async function pgIndexes(db: Knex): Promise<string[]> {
  const rows: Array<{ indexname: string }> = await db("pg_indexes")
    .where({ schemaname: db.raw("current_schema()") })
    .select("indexname");
  // Primary keys are indexes in PostgreSQL (…_pkey) but not listed by name in SQLite.
  return rows
    .map((r) => r.indexname)
    .filter((n) => !n.endsWith("_pkey") && !isKnexTable(n))
    .sort();
}

async function sqliteIndexes(db: Knex): Promise<string[]> {
  const rows: Array<{ name: string }> = await db("sqlite_master")
    .where({ type: "index" })
    .whereNot("name", "like", "sqlite_autoindex_%")
    .select("name");
  return rows
    .map((r) => r.name)
    .filter((n) => !isKnexTable(n))
    .sort();
}

const appendOnlyFunction = async (db: Knex) =>
  Number(
    (
      await db("pg_proc")
        .join("pg_namespace as ns", "ns.oid", "pg_proc.pronamespace")
        .where({ proname: "coldtrail_append_only", nspname: db.raw("current_schema()") })
        .count({ n: "*" })
        .first()
    )?.n,
  );

describePg("migrations", () => {
  it("create the same tables, columns, nullability and indexes as on SQLite", async () => {
    const tables = await pgTables(pg.db);
    expect(tables.length).toBeGreaterThan(30);
    expect(tables).toEqual(await sqliteTables(sqlite.db));
    for (const table of tables) expect(await pgColumns(pg.db, table), table).toEqual(await sqliteColumns(sqlite.db, table));
    expect(await pgIndexes(pg.db)).toEqual(await sqliteIndexes(sqlite.db));
  });

  it("make booleans real booleans, masses integers and readings double precision", async () => {
    const typeOf = async (table: string, column: string) =>
      (
        await pg
          .db("information_schema.columns")
          .where({ table_schema: pg.db.raw("current_schema()"), table_name: table, column_name: column })
          .first("data_type")
      )?.data_type;
    expect(await typeOf("users", "active")).toBe("boolean");
    expect(await typeOf("jobs", "temporary_access_removed")).toBe("boolean");
    expect(await typeOf("jobs", "recovered_g")).toBe("integer");
    expect(await typeOf("jobs", "evacuation_value")).toBe("double precision");
    expect(await typeOf("jobs", "performed_on")).toBe("character varying");
  });

  it("roll all the way back, leaving nothing behind, and forward again", async () => {
    const before = await pgTables(pg.db);
    expect(await appendOnlyFunction(pg.db)).toBe(1);
    const [, rolledBack] = await pg.db.migrate.rollback(undefined, true);
    expect(rolledBack).toEqual([...MIGRATION_NAMES].reverse());
    expect(await pgTables(pg.db)).toEqual([]);
    expect(await appendOnlyFunction(pg.db)).toBe(0);
    const [, applied] = await pg.db.migrate.latest();
    expect(applied).toEqual(MIGRATION_NAMES);
    expect(await pgTables(pg.db)).toEqual(before);
    expect(await appendOnlyFunction(pg.db)).toBe(1);
  });

  it("keep the activity history and amendments append-only (PostgreSQL's trigger twin)", async () => {
    const [org] = await pg.db("organisations").insert({ name: "Test Co", created_at: "2026-01-01T00:00:00.000Z" }).returning("id");
    const [user] = await pg
      .db("users")
      .insert({ organisation_id: org.id, email: "a@test.example", name: "A", created_at: "2026-01-01T00:00:00.000Z" })
      .returning("id");
    const [activity] = await pg
      .db("activity")
      .insert({
        organisation_id: org.id,
        action: "test.done",
        subject_type: "test",
        at: "2026-01-01T00:00:00.000Z",
        summary: "Something happened",
      })
      .returning("id");
    const [amendment] = await pg
      .db("amendments")
      .insert({
        organisation_id: org.id,
        subject_type: "Job",
        subject_id: 1,
        actor_id: user.id,
        at: "2026-01-01T00:00:00.000Z",
        reason: "r",
        previous: "{}",
        next: "{}",
      })
      .returning("id");
    await expect(pg.db("activity").where({ id: activity.id }).update({ summary: "Rewritten" })).rejects.toThrow(/activity is append-only/);
    await expect(pg.db("activity").where({ id: activity.id }).del()).rejects.toThrow(/activity is append-only/);
    await expect(pg.db("amendments").where({ id: amendment.id }).update({ reason: "Rewritten" })).rejects.toThrow(
      /amendments is append-only/,
    );
    await expect(pg.db("amendments").del()).rejects.toThrow(/amendments is append-only/);
    expect((await pg.db("activity").where({ id: activity.id }).first()).summary).toBe("Something happened");
    expect((await pg.db("amendments").where({ id: amendment.id }).first()).reason).toBe("r");
    // Appending still works.
    await pg
      .db("activity")
      .insert({ organisation_id: org.id, action: "test.again", subject_type: "test", at: "2026-01-01T00:00:01.000Z", summary: "Again" });
    expect(Number((await pg.db("activity").count({ n: "*" }).first())?.n)).toBe(2);
  });

  it("enforce foreign keys and the one-finding-per-identity index", async () => {
    await expect(
      pg.db("branches").insert({
        organisation_id: 999,
        name: "Nowhere",
        code: "NOW",
        time_zone: "America/Chicago",
        mass_unit: "kg",
        created_at: "2026-01-01T00:00:00.000Z",
      }),
    ).rejects.toMatchObject({ code: "23503" });
    const [org] = await pg.db("organisations").insert({ name: "Finding Co", created_at: "2026-01-01T00:00:00.000Z" }).returning("id");
    const [branch] = await pg
      .db("branches")
      .insert({
        organisation_id: org.id,
        name: "Main",
        code: "M",
        time_zone: "America/Denver",
        mass_unit: "kg",
        created_at: "2026-01-01T00:00:00.000Z",
      })
      .returning("id");
    const at = "2026-01-01T00:00:00.000Z";
    const finding = {
      organisation_id: org.id,
      branch_id: branch.id,
      rule_id: "rule-x",
      identity_key: "rule-x:job:1",
      record_type: "job",
      record_id: 1,
      severity: "major",
      state: "open",
      title: "t",
      detail: "d",
      fix: "f",
      citation: "c",
      opened_at: at,
      last_seen_at: at,
      state_changed_at: at,
      updated_at: at,
    };
    await pg.db("findings").insert(finding);
    await expect(pg.db("findings").insert(finding)).rejects.toMatchObject({ code: "23505" });
  });
});
