import type { Knex } from "knex";

/** Service jobs and every movement of refrigerant: recovery, charge, shipments for reclaim, purchases, weighings, disposals. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("jobs", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("appliance_id").notNullable().references("id").inTable("appliances");
    t.integer("technician_id").notNullable().references("id").inTable("users");
    t.string("kind", 24).notNullable(); // recovery | charge | leak_repair | verification_test | disposal
    t.string("performed_on", 10).notNullable();
    t.string("refrigerant", 32);
    // Totals of this job's refrigerant movements, kept on the row so lists can sort by amount.
    t.integer("recovered_g").notNullable().defaultTo(0);
    t.integer("charged_g").notNullable().defaultTo(0);
    t.integer("equipment_id").references("id").inTable("recovery_equipment");
    t.integer("cylinder_id").references("id").inTable("cylinders");
    t.string("access_method", 32);
    t.boolean("temporary_access_removed");
    t.double("evacuation_value");
    t.string("evacuation_unit", 16);
    t.boolean("compressor_operating");
    t.string("verification_stage", 16); // initial | follow_up
    t.boolean("verification_passed");
    t.string("verification_method", 200);
    t.integer("related_job_id").references("id").inTable("jobs"); // e.g. the repair a verification test checks
    t.text("leak_location");
    t.text("repair_description");
    t.string("addition_exclusion", 16); // retrofit | installation | seasonal
    t.boolean("shutdown_needed");
    t.text("notes");
    t.string("source", 16).notNullable().defaultTo("field"); // field | office | import
    t.string("voided_at", 32);
    t.text("void_reason");
    t.integer("voided_by").references("id").inTable("users");
    t.integer("created_by").notNullable().references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.index(["organisation_id", "performed_on", "id"]);
    t.index(["branch_id", "performed_on", "id"]);
    t.index(["branch_id", "kind", "performed_on"]);
    t.index(["technician_id", "performed_on"]);
    t.index(["appliance_id", "performed_on"]);
    t.index(["cylinder_id"]);
    t.index(["equipment_id"]);
    t.index(["related_job_id"]);
  });

  await knex.schema.createTable("reclaim_shipments", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.string("shipped_on", 10).notNullable();
    t.string("reclaimer_name", 200).notNullable();
    t.text("reclaimer_address");
    t.string("reference", 100); // bill of lading / manifest number
    t.text("notes");
    t.integer("created_by").notNullable().references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.string("voided_at", 32);
    t.text("void_reason");
    t.index(["branch_id", "shipped_on"]);
    t.index(["organisation_id", "shipped_on"]);
  });

  await knex.schema.createTable("reclaim_shipment_lines", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("shipment_id").notNullable().references("id").inTable("reclaim_shipments");
    t.integer("cylinder_id").references("id").inTable("cylinders");
    t.string("refrigerant", 32).notNullable();
    t.integer("mass_g").notNullable();
    t.index(["shipment_id"]);
    t.index(["cylinder_id"]);
  });

  await knex.schema.createTable("purchases", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.string("purchased_on", 10).notNullable();
    t.string("supplier_name", 200).notNullable();
    t.string("refrigerant", 32).notNullable();
    t.integer("mass_g").notNullable();
    t.integer("container_count");
    t.string("invoice_reference", 100);
    t.integer("created_by").notNullable().references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.string("voided_at", 32);
    t.text("void_reason");
    t.index(["branch_id", "purchased_on"]);
    t.index(["branch_id", "refrigerant"]);
  });

  await knex.schema.createTable("refrigerant_movements", (t) => {
    // One row per quantity of refrigerant that moved. A cylinder's contents equal the sum of its movements:
    //   recovered_into_cylinder (+), charged_from_cylinder (−), shipped_for_reclaim (−), cylinder_adjustment (±).
    // charged_from_stock and purchased carry no cylinder (virgin refrigerant from the branch's stock).
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("job_id").references("id").inTable("jobs");
    t.integer("reclaim_shipment_id").references("id").inTable("reclaim_shipments");
    t.integer("purchase_id").references("id").inTable("purchases");
    t.integer("cylinder_id").references("id").inTable("cylinders");
    t.string("direction", 32).notNullable();
    t.string("refrigerant", 32).notNullable();
    t.integer("mass_g").notNullable(); // always positive; the direction gives the sign
    t.string("moved_on", 10).notNullable();
    t.string("created_at", 32).notNullable();
    t.string("voided_at", 32);
    t.index(["branch_id", "moved_on"]);
    t.index(["branch_id", "direction", "moved_on"]);
    t.index(["cylinder_id", "moved_on"]);
    t.index(["job_id"]);
    t.index(["reclaim_shipment_id"]);
    t.index(["purchase_id"]);
  });

  await knex.schema.createTable("cylinder_weighings", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("cylinder_id").notNullable().references("id").inTable("cylinders");
    t.integer("job_id").references("id").inTable("jobs");
    t.string("weighed_on", 10).notNullable();
    t.integer("gross_g").notNullable();
    t.integer("net_g").notNullable(); // gross minus tare
    t.string("refrigerant", 32);
    t.double("pressure_psig"); // for the pressure–temperature check for non-condensables
    t.double("temperature_c");
    t.integer("weighed_by").notNullable().references("id").inTable("users");
    t.text("notes");
    t.string("created_at", 32).notNullable();
    t.string("voided_at", 32);
    t.text("void_reason");
    t.index(["cylinder_id", "weighed_on"]);
    t.index(["branch_id", "weighed_on"]);
  });

  await knex.schema.createTable("disposal_records", (t) => {
    // The record kept for final disposal of an appliance of 5–50 lb (and any other appliance the branch disposes of).
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("appliance_id").notNullable().references("id").inTable("appliances");
    t.integer("job_id").references("id").inTable("jobs");
    t.string("disposed_on", 10).notNullable();
    t.string("disposal_path", 16).notNullable().defaultTo("on_site"); // on_site | shop
    t.text("appliance_location");
    t.string("recovered_on", 10);
    t.integer("recovered_by_user_id").references("id").inTable("users");
    t.string("recovered_by_name", 200);
    t.string("refrigerant", 32);
    t.integer("recovered_g");
    t.string("sent_to", 200); // scrap or disposal facility
    t.integer("created_by").notNullable().references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.string("voided_at", 32);
    t.text("void_reason");
    t.index(["branch_id", "disposed_on"]);
    t.index(["appliance_id"]);
  });

  await knex.schema.createTable("disposal_statements", (t) => {
    // Small appliances: the signed statement that the refrigerant was recovered before disposal.
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("appliance_id").notNullable().references("id").inTable("appliances");
    t.integer("job_id").references("id").inTable("jobs");
    t.string("recovered_by_name", 200).notNullable();
    t.text("recovered_by_address").notNullable();
    t.string("recovered_on", 10).notNullable();
    t.string("signed_by_name", 200);
    t.string("signed_on", 10);
    t.string("document_file_key", 300);
    t.string("document_mime", 100);
    t.integer("created_by").notNullable().references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.string("voided_at", 32);
    t.text("void_reason");
    t.index(["branch_id", "recovered_on"]);
    t.index(["appliance_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    "disposal_statements",
    "disposal_records",
    "cylinder_weighings",
    "refrigerant_movements",
    "purchases",
    "reclaim_shipment_lines",
    "reclaim_shipments",
    "jobs",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
