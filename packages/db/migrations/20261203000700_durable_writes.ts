import type { Knex } from "knex";

/**
 * Durable writes: idempotency keys of creating requests, the background task queue the one runner
 * works through (audits, imports, re-checks, digests, mail), and the mail outbox.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("idempotency_keys", (t) => {
    t.increments("id");
    t.integer("user_id").notNullable().references("id").inTable("users");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.string("key", 200).notNullable(); // client-generated, one per form opening
    t.string("method", 10).notNullable();
    t.string("path", 500).notNullable();
    t.string("request_hash", 64).notNullable(); // sha256 of the request body
    t.integer("status").notNullable(); // the first answer, replayed to repeats
    t.text("response_body").notNullable();
    t.string("content_type", 100).notNullable();
    t.string("created_at", 32).notNullable();
    t.unique(["user_id", "key"]);
    t.index(["created_at"]);
  });

  await knex.schema.createTable("background_tasks", (t) => {
    t.increments("id");
    t.string("kind", 40).notNullable(); // audit | import_check | import_commit | recheck | digest | mail
    t.text("payload").notNullable(); // JSON
    t.string("unique_key", 200).unique(); // e.g. "digest:org 3:2026-12-03": at most one such task ever
    t.integer("organisation_id").references("id").inTable("organisations");
    t.string("state", 16).notNullable().defaultTo("queued"); // queued | running | done | failed
    t.integer("attempts").notNullable().defaultTo(0);
    t.integer("max_attempts").notNullable().defaultTo(5);
    t.string("run_after", 32).notNullable(); // not claimed before this instant (backoff)
    t.string("lease_owner", 100); // the runner holding it
    t.string("lease_expires_at", 32); // another runner may take it over after this
    t.text("last_error");
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.string("finished_at", 32);
    t.index(["state", "run_after"]);
    t.index(["state", "lease_expires_at"]);
    t.index(["organisation_id", "created_at"]);
  });

  await knex.schema.createTable("mail_outbox", (t) => {
    t.increments("id");
    t.integer("organisation_id").references("id").inTable("organisations");
    t.string("to_address", 320).notNullable();
    t.string("subject", 500).notNullable();
    t.text("text").notNullable();
    t.text("html").notNullable();
    t.integer("notification_id").references("id").inTable("notifications"); // marked sent on delivery
    t.string("state", 16).notNullable().defaultTo("queued"); // queued | sent | failed
    t.integer("attempts").notNullable().defaultTo(0);
    t.text("last_error");
    t.string("created_at", 32).notNullable();
    t.string("sent_at", 32);
    t.index(["state", "created_at"]);
    t.index(["organisation_id", "state"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("mail_outbox");
  await knex.schema.dropTableIfExists("background_tasks");
  await knex.schema.dropTableIfExists("idempotency_keys");
}
