import type { Knex } from "knex";

/**
 * Amounts as they were entered, beside the grams they are stored and computed in. Grams are exact
 * for the rules, but a pound or an ounce is not a whole number of grams, so converting back cannot
 * always give the typed figure (95 lb is 43,091 g, which is 94.9994 lb). The entered figure and its
 * unit are what the record is re-opened with for correction and what the technician wrote; they are
 * kept only while they still describe the stored grams (a change to the grams from elsewhere sets
 * them to null and the record falls back to the grams).
 *
 * `organisations.records_begin_on`: the first date a dated record (job, purchase, shipment, weighing,
 * disposal) may carry. Null means the default: 1 January three years before the organisation joined.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("organisations", (t) => {
    t.string("records_begin_on", 10);
  });
  await knex.schema.alterTable("jobs", (t) => {
    t.double("amount_entered");
    t.string("amount_unit", 4);
  });
  await knex.schema.alterTable("purchases", (t) => {
    t.double("amount_entered");
    t.string("amount_unit", 4);
  });
  await knex.schema.alterTable("disposal_records", (t) => {
    t.double("recovered_entered");
    t.string("recovered_unit", 4);
  });
  await knex.schema.alterTable("cylinder_weighings", (t) => {
    t.double("gross_entered");
    t.string("gross_unit", 4);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("cylinder_weighings", (t) => {
    t.dropColumn("gross_unit");
    t.dropColumn("gross_entered");
  });
  await knex.schema.alterTable("disposal_records", (t) => {
    t.dropColumn("recovered_unit");
    t.dropColumn("recovered_entered");
  });
  await knex.schema.alterTable("purchases", (t) => {
    t.dropColumn("amount_unit");
    t.dropColumn("amount_entered");
  });
  await knex.schema.alterTable("jobs", (t) => {
    t.dropColumn("amount_unit");
    t.dropColumn("amount_entered");
  });
  await knex.schema.alterTable("organisations", (t) => {
    t.dropColumn("records_begin_on");
  });
}
