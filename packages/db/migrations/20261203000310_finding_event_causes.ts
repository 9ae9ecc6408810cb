import type { Knex } from "knex";

/**
 * Which writes a continuous re-check answered: the activity ids after `cause_after_activity_id` up
 * to and including `cause_to_activity_id`. A finding opened, found again or no longer found by that
 * re-check was raised or closed by those writes, so a saved job can list what it changed.
 * Null on events of audits run by an officer and of people's own decisions.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("finding_events", (t) => {
    t.integer("cause_after_activity_id");
    t.integer("cause_to_activity_id");
    t.index(["organisation_id", "cause_to_activity_id"], "finding_events_org_cause_idx");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("finding_events", (t) => {
    t.dropIndex(["organisation_id", "cause_to_activity_id"], "finding_events_org_cause_idx");
  });
  await knex.schema.alterTable("finding_events", (t) => {
    t.dropColumn("cause_to_activity_id");
    t.dropColumn("cause_after_activity_id");
  });
}
