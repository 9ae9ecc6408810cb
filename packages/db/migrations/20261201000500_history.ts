import type { Knex } from "knex";

const APPEND_ONLY = ["activity", "amendments"] as const;

function clientName(knex: Knex): string {
  const client = knex.client.config.client;
  return typeof client === "string" ? client : "";
}

/** Amendments (previous and next values of an edited regulated record) and the append-only activity history. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("amendments", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").references("id").inTable("branches");
    t.string("subject_type", 40).notNullable();
    t.integer("subject_id").notNullable();
    t.integer("actor_id").notNullable().references("id").inTable("users");
    t.string("at", 32).notNullable();
    t.text("reason").notNullable();
    t.text("previous").notNullable(); // JSON of the changed fields before
    t.text("next").notNullable(); // JSON of the changed fields after
    t.index(["subject_type", "subject_id", "at"]);
    t.index(["organisation_id", "at"]);
  });

  await knex.schema.createTable("activity", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("actor_id").references("id").inTable("users"); // null = the system
    t.integer("branch_id").references("id").inTable("branches");
    t.string("action", 60).notNullable(); // e.g. job.recovery.created
    t.string("subject_type", 40).notNullable();
    t.integer("subject_id");
    t.string("at", 32).notNullable();
    t.text("summary").notNullable(); // plain words
    t.text("data"); // JSON
    t.index(["organisation_id", "at", "id"]);
    t.index(["branch_id", "at", "id"]);
    t.index(["actor_id", "at"]);
    t.index(["subject_type", "subject_id"]);
  });

  // The history tables refuse UPDATE and DELETE. Triggers are dialect-specific DDL, so each dialect gets its own.
  const client = clientName(knex);
  if (client === "better-sqlite3" || client === "sqlite3") {
    for (const table of APPEND_ONLY) {
      await knex.raw(
        `CREATE TRIGGER ${table}_no_update BEFORE UPDATE ON ${table} BEGIN SELECT RAISE(ABORT, '${table} is append-only'); END`,
      );
      await knex.raw(
        `CREATE TRIGGER ${table}_no_delete BEFORE DELETE ON ${table} BEGIN SELECT RAISE(ABORT, '${table} is append-only'); END`,
      );
    }
  } else if (client === "pg" || client === "postgres" || client === "postgresql") {
    await knex.raw(
      `CREATE OR REPLACE FUNCTION coldtrail_append_only() RETURNS trigger AS $$
       BEGIN RAISE EXCEPTION '% is append-only', TG_TABLE_NAME; END $$ LANGUAGE plpgsql`,
    );
    for (const table of APPEND_ONLY) {
      await knex.raw(
        `CREATE TRIGGER ${table}_append_only BEFORE UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION coldtrail_append_only()`,
      );
    }
  }
}

export async function down(knex: Knex): Promise<void> {
  // Dropping the tables drops their triggers in both dialects.
  await knex.schema.dropTableIfExists("activity");
  await knex.schema.dropTableIfExists("amendments");
  const client = clientName(knex);
  if (client === "pg" || client === "postgres" || client === "postgresql") {
    await knex.raw("DROP FUNCTION IF EXISTS coldtrail_append_only()");
  }
}
