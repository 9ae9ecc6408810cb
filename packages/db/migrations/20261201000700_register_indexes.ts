import type { Knex } from "knex";

/**
 * Indexes for the organisation-wide register lists (owner, compliance officer): filter by status or
 * refrigerant across every branch, ordered by tag or serial. Branch-level lists use the indexes of
 * the registers migration.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("appliances", (t) => {
    t.index(["organisation_id", "status", "tag"], "appliances_org_status_tag_idx");
    t.index(["organisation_id", "refrigerant"], "appliances_org_refrigerant_idx");
  });
  await knex.schema.alterTable("cylinders", (t) => {
    t.index(["organisation_id", "status", "serial"], "cylinders_org_status_serial_idx");
    t.index(["organisation_id", "last_requalified_on"], "cylinders_org_requalified_idx");
  });
  await knex.schema.alterTable("recovery_equipment", (t) => {
    t.index(["organisation_id", "status", "serial"], "recovery_equipment_org_status_serial_idx");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("recovery_equipment", (t) => {
    t.dropIndex(["organisation_id", "status", "serial"], "recovery_equipment_org_status_serial_idx");
  });
  await knex.schema.alterTable("cylinders", (t) => {
    t.dropIndex(["organisation_id", "last_requalified_on"], "cylinders_org_requalified_idx");
    t.dropIndex(["organisation_id", "status", "serial"], "cylinders_org_status_serial_idx");
  });
  await knex.schema.alterTable("appliances", (t) => {
    t.dropIndex(["organisation_id", "refrigerant"], "appliances_org_refrigerant_idx");
    t.dropIndex(["organisation_id", "status", "tag"], "appliances_org_status_tag_idx");
  });
}
