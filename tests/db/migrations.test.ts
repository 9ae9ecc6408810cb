import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { MIGRATION_NAMES } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";

const TABLES = [
  "organisations",
  "branches",
  "users",
  "memberships",
  "inspector_grants",
  "inspector_grant_branches",
  "invitations",
  "password_reset_tokens",
  "user_sessions",
  "rate_limits",
  "customers",
  "sites",
  "appliances",
  "appliance_plans",
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
  "audits",
  "findings",
  "audit_findings",
  "finding_events",
  "finding_branches",
  "comments",
  "evidence",
  "saved_views",
  "notifications",
  "amendments",
  "activity",
  // Spreadsheet imports (cards and imports):
  "imports",
  "import_row_issues",
];

let t: TestDb;
beforeAll(async () => {
  t = await createTestDb();
});
afterAll(async () => {
  await t.destroy();
});

async function userTables(): Promise<string[]> {
  const rows: Array<{ name: string }> = await t
    .db("sqlite_master")
    .where({ type: "table" })
    .whereNot("name", "like", "sqlite_%")
    .whereNot("name", "like", "knex_%")
    .select("name");
  return rows.map((r) => r.name).sort();
}

describe("migrations", () => {
  it("create every table of the model", async () => {
    expect(await userTables()).toEqual([...TABLES].sort());
  });

  it("roll all the way back and forward again", async () => {
    await t.db.migrate.rollback(undefined, true);
    expect(await userTables()).toEqual([]);
    const [, applied] = await t.db.migrate.latest();
    expect(applied).toEqual(MIGRATION_NAMES);
    expect(await userTables()).toEqual([...TABLES].sort());
  });

  it("set the connection pragmas on the pooled connection", async () => {
    const pragma = async (name: string) => {
      const rows = await t.db.raw(`PRAGMA ${name}`);
      return Object.values(rows[0] as Record<string, unknown>)[0];
    };
    expect(await pragma("foreign_keys")).toBe(1);
    expect(String(await pragma("journal_mode")).toLowerCase()).toBe("wal");
    expect(await pragma("busy_timeout")).toBe(5000);
    expect(await pragma("synchronous")).toBe(1); // NORMAL
  });

  it("enforce foreign keys", async () => {
    await expect(
      t.db("branches").insert({
        organisation_id: 999,
        name: "Nowhere",
        code: "NOW",
        time_zone: "America/Chicago",
        mass_unit: "kg",
        created_at: "2026-01-01T00:00:00.000Z",
      }),
    ).rejects.toThrow(/FOREIGN KEY/);
  });

  it("keep the activity history append-only", async () => {
    const [org] = await t.db("organisations").insert({ name: "Test Co", created_at: "2026-01-01T00:00:00.000Z" }).returning("id");
    const [row] = await t
      .db("activity")
      .insert({
        organisation_id: org.id,
        action: "test.done",
        subject_type: "test",
        at: "2026-01-01T00:00:00.000Z",
        summary: "Something happened",
      })
      .returning("id");
    await expect(t.db("activity").where({ id: row.id }).update({ summary: "Rewritten" })).rejects.toThrow(/append-only/);
    await expect(t.db("activity").where({ id: row.id }).del()).rejects.toThrow(/append-only/);
    expect((await t.db("activity").where({ id: row.id }).first()).summary).toBe("Something happened");
  });

  it("allow only one finding per organisation and identity", async () => {
    const [org] = await t.db("organisations").insert({ name: "Finding Co", created_at: "2026-01-01T00:00:00.000Z" }).returning("id");
    const [branch] = await t
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
      opened_at: "2026-01-01T00:00:00.000Z",
      last_seen_at: "2026-01-01T00:00:00.000Z",
      state_changed_at: "2026-01-01T00:00:00.000Z",
      updated_at: "2026-01-01T00:00:00.000Z",
    };
    await t.db("findings").insert(finding);
    await expect(t.db("findings").insert(finding)).rejects.toThrow(/UNIQUE/);
  });
});
