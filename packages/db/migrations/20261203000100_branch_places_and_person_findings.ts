import type { Knex } from "knex";

/**
 * - branches.country / branches.region: where a branch is (ISO 3166-1 alpha-2 country, state or
 *   region), from which the rule packs its audits apply follow. Existing branches are taken to be in
 *   the United States, the only place the earlier schema could describe.
 * - finding_branches: the branches a person-level finding (about a technician or their certification
 *   card, not about one branch's records) shows in. Such a finding is one row in `findings` for the
 *   organisation (`findings.branch_id` is one of its branches); each branch whose audit finds it is
 *   listed here, so the managers of every branch the person works in see it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("branches", (t) => {
    t.string("country", 2).notNullable().defaultTo("US");
    t.string("region", 64);
  });
  await knex.schema.createTable("finding_branches", (t) => {
    t.integer("finding_id").notNullable().references("id").inTable("findings");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.primary(["finding_id", "branch_id"]);
    t.index(["branch_id", "finding_id"], "finding_branches_branch_idx");
  });
  // Person-level findings stored so far show in the branch that found them.
  await knex("finding_branches").insert(
    knex("findings").whereIn("record_type", ["certification", "technician"]).select("id", "branch_id", "organisation_id"),
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("finding_branches");
  await knex.schema.alterTable("branches", (t) => {
    t.dropColumn("region");
    t.dropColumn("country");
  });
}
