import type { Knex } from "knex";

/**
 * jobs.same_leak_as_job_id: a charge made for the same leak as an earlier charge on the appliance.
 * 82.152 sums "multiple additions related to the same leak" into one leak-rate calculation, also when
 * they fall on different days; the technician says so on the job, and the rules core sums them.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("jobs", (t) => {
    t.integer("same_leak_as_job_id").references("id").inTable("jobs");
    t.index(["same_leak_as_job_id"], "jobs_same_leak_idx");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("jobs", (t) => {
    t.dropIndex(["same_leak_as_job_id"], "jobs_same_leak_idx");
  });
  await knex.schema.alterTable("jobs", (t) => {
    t.dropForeign(["same_leak_as_job_id"]);
  });
  await knex.schema.alterTable("jobs", (t) => {
    t.dropColumn("same_leak_as_job_id");
  });
}
