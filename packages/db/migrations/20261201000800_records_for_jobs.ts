import type { Knex } from "knex";

/**
 * What the disposal records and the record lists of jobs, disposals, shipments and purchases need:
 * - disposal_records.company_name: 40 CFR 82.155(c) asks for the company name on each record;
 * - disposal_statements.contract_reference: a contract stating the refrigerant is removed before
 *   delivery may stand in for the signed statement (82.155(b));
 * - organisation-wide list indexes (owner, compliance officer) ordered by date, and the
 *   per-appliance lookups of the instant feedback.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("disposal_records", (t) => {
    t.string("company_name", 200);
    t.index(["organisation_id", "disposed_on"], "disposal_records_org_disposed_idx");
    t.index(["job_id"], "disposal_records_job_idx");
  });
  await knex.schema.alterTable("disposal_statements", (t) => {
    t.string("contract_reference", 200);
    t.index(["organisation_id", "recovered_on"], "disposal_statements_org_recovered_idx");
    t.index(["job_id"], "disposal_statements_job_idx");
  });
  await knex.schema.alterTable("purchases", (t) => {
    t.index(["organisation_id", "purchased_on"], "purchases_org_purchased_idx");
  });
  await knex.schema.alterTable("refrigerant_movements", (t) => {
    t.index(["organisation_id", "direction", "moved_on"], "movements_org_direction_moved_idx");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("refrigerant_movements", (t) => {
    t.dropIndex(["organisation_id", "direction", "moved_on"], "movements_org_direction_moved_idx");
  });
  await knex.schema.alterTable("purchases", (t) => {
    t.dropIndex(["organisation_id", "purchased_on"], "purchases_org_purchased_idx");
  });
  await knex.schema.alterTable("disposal_statements", (t) => {
    t.dropIndex(["job_id"], "disposal_statements_job_idx");
    t.dropIndex(["organisation_id", "recovered_on"], "disposal_statements_org_recovered_idx");
  });
  await knex.schema.alterTable("disposal_statements", (t) => {
    t.dropColumn("contract_reference");
  });
  await knex.schema.alterTable("disposal_records", (t) => {
    t.dropIndex(["job_id"], "disposal_records_job_idx");
    t.dropIndex(["organisation_id", "disposed_on"], "disposal_records_org_disposed_idx");
  });
  await knex.schema.alterTable("disposal_records", (t) => {
    t.dropColumn("company_name");
  });
}
