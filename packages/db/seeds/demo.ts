import type { Knex } from "knex";
import { loadDemoData } from "../src/demo/load";

/** The demo seed: an invented company with two years of records and planted gaps (README "Demo data"). */
export async function seed(knex: Knex): Promise<void> {
  await loadDemoData(knex);
}
