import type { Knex } from "knex";

/**
 * What audit runs and the findings workflow need beyond the audits migration:
 * - findings.occurred_on: the date of the event a finding is about (null for a standing obligation),
 *   so a re-run only closes findings whose event lies inside the period it looked at;
 * - findings.pack: the rule pack, so a run of one pack leaves the other pack's findings alone;
 * - audits.branches_done / attempts / heartbeat_at: a background run records each finished branch
 *   and a heartbeat, so a run interrupted by a restart resumes where it stopped (or fails after
 *   repeated interruptions);
 * - indexes for the organisation-wide findings table (filter by rule, due date, branch and state;
 *   sort by last change) and for finding the runs to resume.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("findings", (t) => {
    t.string("occurred_on", 10);
    t.string("pack", 16).notNullable().defaultTo("us_federal");
    t.index(["organisation_id", "rule_id"], "findings_org_rule_idx");
    t.index(["organisation_id", "due_on"], "findings_org_due_idx");
    t.index(["organisation_id", "branch_id", "state"], "findings_org_branch_state_idx");
    t.index(["organisation_id", "updated_at"], "findings_org_updated_idx");
  });
  await knex.schema.alterTable("audits", (t) => {
    t.text("branches_done").notNullable().defaultTo("[]"); // JSON array of branch ids finished
    t.integer("attempts").notNullable().defaultTo(0);
    t.string("heartbeat_at", 32);
    t.index(["organisation_id", "state"], "audits_org_state_idx");
  });
  await knex.schema.alterTable("finding_events", (t) => {
    t.index(["organisation_id", "action", "at"], "finding_events_org_action_at_idx");
  });
  await knex.schema.alterTable("notifications", (t) => {
    t.index(["user_id", "kind", "created_at"], "notifications_user_kind_created_idx");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("notifications", (t) => {
    t.dropIndex(["user_id", "kind", "created_at"], "notifications_user_kind_created_idx");
  });
  await knex.schema.alterTable("finding_events", (t) => {
    t.dropIndex(["organisation_id", "action", "at"], "finding_events_org_action_at_idx");
  });
  await knex.schema.alterTable("audits", (t) => {
    t.dropIndex(["organisation_id", "state"], "audits_org_state_idx");
  });
  await knex.schema.alterTable("audits", (t) => {
    t.dropColumn("heartbeat_at");
    t.dropColumn("attempts");
    t.dropColumn("branches_done");
  });
  await knex.schema.alterTable("findings", (t) => {
    t.dropIndex(["organisation_id", "updated_at"], "findings_org_updated_idx");
    t.dropIndex(["organisation_id", "branch_id", "state"], "findings_org_branch_state_idx");
    t.dropIndex(["organisation_id", "due_on"], "findings_org_due_idx");
    t.dropIndex(["organisation_id", "rule_id"], "findings_org_rule_idx");
  });
  await knex.schema.alterTable("findings", (t) => {
    t.dropColumn("pack");
    t.dropColumn("occurred_on");
  });
}
