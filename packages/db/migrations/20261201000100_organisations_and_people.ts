import type { Knex } from "knex";

/** Organisations, branches, people and how they get in (memberships, inspector grants, invitations, resets). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("organisations", (t) => {
    t.increments("id");
    t.string("name", 200).notNullable();
    t.text("rule_packs").notNullable().defaultTo('["us_federal"]'); // JSON array of rule pack ids
    t.text("settings").notNullable().defaultTo("{}"); // JSON object: tolerances the rules leave to the company
    t.string("created_at", 32).notNullable();
  });

  await knex.schema.createTable("branches", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.string("name", 200).notNullable();
    t.string("code", 16).notNullable();
    t.text("address");
    t.string("time_zone", 64).notNullable(); // IANA, e.g. America/Chicago
    t.string("mass_unit", 8).notNullable().defaultTo("lb_oz"); // 'lb_oz' | 'kg'
    t.string("created_at", 32).notNullable();
    t.string("archived_at", 32);
    t.unique(["organisation_id", "code"]);
    t.index(["organisation_id", "name"]);
  });

  await knex.schema.createTable("users", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.string("email", 320).notNullable().unique(); // stored lower-case
    t.string("name", 200).notNullable();
    t.string("password_hash", 100); // null until an invitation is accepted
    t.boolean("active").notNullable().defaultTo(true);
    t.string("created_at", 32).notNullable();
    t.string("deactivated_at", 32);
    t.index(["organisation_id", "name"]);
  });

  await knex.schema.createTable("memberships", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("user_id").notNullable().references("id").inTable("users");
    t.integer("branch_id").references("id").inTable("branches"); // null = organisation-wide (owner, compliance officer)
    t.string("role", 32).notNullable();
    t.string("created_at", 32).notNullable();
    t.unique(["user_id", "branch_id", "role"]);
    t.index(["organisation_id", "role"]);
    t.index(["branch_id", "role"]);
  });

  await knex.schema.createTable("inspector_grants", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("user_id").notNullable().references("id").inTable("users");
    t.integer("granted_by").notNullable().references("id").inTable("users");
    t.string("records_from", 10).notNullable(); // calendar dates of the records the inspector may read
    t.string("records_to", 10).notNullable();
    t.string("expires_at", 32).notNullable();
    t.string("revoked_at", 32);
    t.integer("revoked_by").references("id").inTable("users");
    t.text("note");
    t.string("created_at", 32).notNullable();
    t.index(["organisation_id", "created_at"]);
    t.index(["user_id"]);
  });

  await knex.schema.createTable("inspector_grant_branches", (t) => {
    t.integer("grant_id").notNullable().references("id").inTable("inspector_grants");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.primary(["grant_id", "branch_id"]);
    t.index(["branch_id"]);
  });

  await knex.schema.createTable("invitations", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.string("email", 320).notNullable();
    t.string("name", 200);
    t.text("memberships").notNullable().defaultTo("[]"); // JSON [{ role, branchId|null }]
    t.integer("inspector_grant_id").references("id").inTable("inspector_grants");
    t.integer("invited_by").notNullable().references("id").inTable("users");
    t.string("token_hash", 128).notNullable().unique();
    t.string("expires_at", 32).notNullable();
    t.string("used_at", 32);
    t.string("revoked_at", 32);
    t.integer("accepted_user_id").references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.index(["organisation_id", "created_at"]);
    t.index(["email"]);
  });

  await knex.schema.createTable("password_reset_tokens", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("user_id").notNullable().references("id").inTable("users");
    t.string("token_hash", 128).notNullable().unique();
    t.string("expires_at", 32).notNullable();
    t.string("used_at", 32);
    t.string("created_at", 32).notNullable();
    t.index(["user_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    "password_reset_tokens",
    "invitations",
    "inspector_grant_branches",
    "inspector_grants",
    "memberships",
    "users",
    "branches",
    "organisations",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
