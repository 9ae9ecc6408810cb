import type { Knex } from "knex";

/** Per-branch registers: customers, sites, appliances, recovery equipment, cylinders; technicians' certifications. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("customers", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.string("name", 200).notNullable();
    t.string("contact_name", 200);
    t.string("phone", 40);
    t.string("email", 320);
    t.text("address");
    t.string("created_at", 32).notNullable();
    t.string("archived_at", 32);
    t.index(["branch_id", "name"]);
    t.index(["organisation_id", "name"]);
  });

  await knex.schema.createTable("sites", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("customer_id").references("id").inTable("customers"); // null = the branch's own shop
    t.string("name", 200).notNullable();
    t.text("address");
    t.string("created_at", 32).notNullable();
    t.string("archived_at", 32);
    t.index(["branch_id", "name"]);
    t.index(["customer_id"]);
  });

  await knex.schema.createTable("appliances", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("site_id").notNullable().references("id").inTable("sites");
    t.string("tag", 64).notNullable();
    t.string("description", 300).notNullable();
    t.string("category", 40).notNullable();
    t.string("refrigerant", 32).notNullable();
    t.integer("full_charge_g").notNullable();
    t.string("full_charge_method", 32).notNullable().defaultTo("nameplate");
    t.string("make_model", 200); // free text
    t.string("serial_number", 100);
    t.string("manufactured_on", 10);
    t.boolean("factory_sealed").notNullable().defaultTo(false);
    t.boolean("hermetically_sealed").notNullable().defaultTo(false);
    t.boolean("has_leak_detection").notNullable().defaultTo(false);
    t.boolean("industrial_shutdown_needed").notNullable().defaultTo(false);
    t.boolean("awaiting_disposal_at_shop").notNullable().defaultTo(false);
    t.string("status", 16).notNullable().defaultTo("in_service"); // in_service | retired | disposed
    t.string("installed_on", 10);
    t.string("retired_on", 10);
    t.string("disposed_on", 10);
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.unique(["organisation_id", "tag"]);
    t.index(["branch_id", "status", "tag"]);
    t.index(["organisation_id", "category"]);
    t.index(["site_id"]);
    t.index(["branch_id", "refrigerant"]);
  });

  await knex.schema.createTable("appliance_plans", (t) => {
    // Retrofit or retirement plans for appliances that could not be repaired in time.
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("appliance_id").notNullable().references("id").inTable("appliances");
    t.string("kind", 16).notNullable(); // retrofit | retire
    t.string("prepared_on", 10).notNullable();
    t.string("due_on", 10);
    t.string("completed_on", 10);
    t.string("document_file_key", 300);
    t.text("notes");
    t.integer("created_by").references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.index(["appliance_id"]);
    t.index(["branch_id", "due_on"]);
  });

  await knex.schema.createTable("recovery_equipment", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.string("serial", 64).notNullable();
    t.string("make_model", 200); // free text
    t.string("manufactured_on", 10);
    t.string("certification_state", 16).notNullable().defaultTo("unknown"); // certified | not_certified | unknown
    t.string("certified_by", 200); // approved testing organisation
    t.string("evidence_file_key", 300);
    t.boolean("small_appliance_only").notNullable().defaultTo(false);
    t.boolean("system_dependent").notNullable().defaultTo(false);
    t.string("status", 16).notNullable().defaultTo("in_service"); // in_service | retired
    t.boolean("unregistered").notNullable().defaultTo(false); // placeholder for a unit a job named but the register lacks
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.unique(["organisation_id", "serial"]);
    t.index(["branch_id", "status", "serial"]);
  });

  await knex.schema.createTable("cylinders", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.string("serial", 64).notNullable();
    t.string("specification", 64); // e.g. DOT-4BA400
    t.string("purpose", 16).notNullable().defaultTo("recovery"); // recovery | charging
    t.integer("water_capacity_g").notNullable();
    t.integer("tare_g").notNullable();
    t.string("manufactured_on", 10);
    t.string("last_requalified_on", 10);
    t.string("refrigerant", 32); // null when empty
    t.integer("contents_g").notNullable().defaultTo(0);
    t.string("status", 16).notNullable().defaultTo("in_service"); // in_service | at_reclaimer | retired
    t.boolean("unregistered").notNullable().defaultTo(false);
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.unique(["organisation_id", "serial"]);
    t.index(["branch_id", "status", "serial"]);
    t.index(["branch_id", "last_requalified_on"]);
  });

  await knex.schema.createTable("certifications", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("user_id").notNullable().references("id").inTable("users");
    t.string("certifying_organisation", 200).notNullable();
    t.string("certificate_number", 100).notNullable();
    t.string("issued_on", 10);
    t.string("card_file_key", 300);
    t.string("card_mime", 100);
    t.string("card_thumbnail_key", 300);
    t.string("state", 16).notNullable().defaultTo("pending"); // pending | verified | rejected
    t.integer("verified_by").references("id").inTable("users");
    t.string("verified_at", 32);
    t.text("rejection_reason");
    t.string("uploaded_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.string("voided_at", 32);
    t.text("void_reason");
    t.index(["organisation_id", "state", "uploaded_at"]);
    t.index(["user_id"]);
  });

  await knex.schema.createTable("certification_types", (t) => {
    t.integer("certification_id").notNullable().references("id").inTable("certifications");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.string("type", 16).notNullable(); // type_i | type_ii | type_iii | universal
    t.primary(["certification_id", "type"]);
    t.index(["organisation_id", "type"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    "certification_types",
    "certifications",
    "cylinders",
    "recovery_equipment",
    "appliance_plans",
    "appliances",
    "sites",
    "customers",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
