import type { Knex } from "knex";

/**
 * Server-side sign-in sessions and sign-in throttling:
 * - user_sessions: one row per sign-in, keyed by the SHA-256 of the random session id the session
 *   cookie carries (a copy of the table never yields a usable id). A session ends when its row is
 *   revoked (sign-out, sign out everywhere, password change, deactivation) or when it has been idle
 *   longer than the organisation's idle timeout for the person's roles;
 * - organisations.session_idle_minutes_officers / _others: those idle timeouts, in minutes;
 * - rate_limits: the store of rate-limiter-flexible (RateLimiterSQLite / RateLimiterPostgres with
 *   storeType "knex"), so failed sign-ins count across restarts and server instances. Its columns are
 *   the library's own (key, points, expire in epoch milliseconds); the limiters are built with
 *   tableCreated: true because this migration creates the table.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("user_sessions", (t) => {
    t.increments("id");
    t.string("id_hash", 64).notNullable().unique();
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("user_id").notNullable().references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.string("last_seen_at", 32).notNullable();
    t.string("revoked_at", 32);
    t.string("revoked_reason", 32);
    t.string("user_agent", 300);
    t.index(["user_id", "revoked_at"], "user_sessions_user_revoked_idx");
  });
  await knex.schema.alterTable("organisations", (t) => {
    t.integer("session_idle_minutes_officers").notNullable().defaultTo(30);
    t.integer("session_idle_minutes_others").notNullable().defaultTo(30);
  });
  await knex.schema.createTable("rate_limits", (t) => {
    t.string("key", 255).primary();
    t.integer("points").notNullable().defaultTo(0);
    t.bigInteger("expire");
    t.index(["expire"], "rate_limits_expire_idx");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("rate_limits");
  await knex.schema.alterTable("organisations", (t) => {
    t.dropColumn("session_idle_minutes_others");
    t.dropColumn("session_idle_minutes_officers");
  });
  await knex.schema.dropTable("user_sessions");
}
