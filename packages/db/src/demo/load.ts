import type { Knex } from "knex";
import { buildDemoData, type DemoData } from "./generate";

/** Tables in an order that satisfies every foreign key. */
const LOAD_ORDER = [
  "organisations",
  "branches",
  "users",
  "memberships",
  "inspector_grants",
  "inspector_grant_branches",
  "customers",
  "sites",
  "appliances",
  "recovery_equipment",
  "cylinders",
  "certifications",
  "certification_types",
  "jobs",
  "reclaim_shipments",
  "reclaim_shipment_lines",
  "purchases",
  "refrigerant_movements",
  "cylinder_weighings",
  "disposal_records",
  "disposal_statements",
  "activity",
] as const;

const CHUNK = 200;

/**
 * Loads the demo data into an empty, migrated database in one transaction.
 * Refuses a database that already holds an organisation (reset it instead).
 */
export async function loadDemoData(knex: Knex): Promise<DemoData> {
  const existing = await knex("organisations").count({ n: "*" }).first();
  if (Number(existing?.n ?? 0) > 0) {
    throw new Error("The database already holds data; run `pnpm db:reset` to start again from the demo data.");
  }
  const data = buildDemoData();
  const tables = data.tables;

  // The activity history reads best in time order: renumber it by timestamp (nothing refers to its ids).
  const activity = tables.rows("activity");
  activity.sort((x, y) => (String(x.at) < String(y.at) ? -1 : String(x.at) > String(y.at) ? 1 : Number(x.id) - Number(y.id)));
  activity.forEach((row, i) => {
    row.id = i + 1;
  });

  await knex.transaction(async (trx) => {
    for (const table of LOAD_ORDER) {
      const rows = tables.data.get(table) ?? [];
      for (let i = 0; i < rows.length; i += CHUNK) await trx(table).insert(rows.slice(i, i + CHUNK));
    }
    const client = trx.client.config.client;
    if (client === "pg" || client === "postgres" || client === "postgresql") {
      // Explicit ids were inserted; move PostgreSQL's sequences past them (SQLite needs nothing).
      for (const table of LOAD_ORDER) {
        const rows = tables.data.get(table) ?? [];
        if (!rows.length || !("id" in rows[0]!)) continue;
        await trx.raw(`SELECT setval(pg_get_serial_sequence(?, 'id'), (SELECT MAX(id) FROM ??))`, [table, table]);
      }
    }
  });
  return data;
}
