import type { Knex } from "knex";
import * as m0100 from "../migrations/20261201000100_organisations_and_people";
import * as m0200 from "../migrations/20261201000200_registers";
import * as m0300 from "../migrations/20261201000300_jobs_and_refrigerant";
import * as m0400 from "../migrations/20261201000400_audits_and_findings";
import * as m0500 from "../migrations/20261201000500_history";
import * as m0700 from "../migrations/20261201000700_register_indexes";
import * as m0800 from "../migrations/20261201000800_records_for_jobs";
import * as m0900 from "../migrations/20261201000900_cards_and_imports";
import * as m1000 from "../migrations/20261201001000_findings_workflow";
import * as m300100 from "../migrations/20261203000100_branch_places_and_person_findings";
import * as m300200 from "../migrations/20261203000200_same_leak_additions";
import * as m300300 from "../migrations/20261203000300_entered_amounts_and_records_start";
import * as m300310 from "../migrations/20261203000310_finding_event_causes";
import * as s0500 from "../migrations/20261203000500_sessions_and_throttling";

interface Migration {
  up: (knex: Knex) => Promise<void>;
  down: (knex: Knex) => Promise<void>;
}

/**
 * Every migration, in order, imported statically so that tsx, vitest and Next.js all run the same
 * code without a TypeScript loader for knex's directory scan. Names are the file names (with .ts),
 * exactly what knex's directory source records, so both ways agree on what has run.
 * Add a new migration file here as well.
 */
const MIGRATIONS: ReadonlyArray<readonly [string, Migration]> = [
  ["20261201000100_organisations_and_people.ts", m0100],
  ["20261201000200_registers.ts", m0200],
  ["20261201000300_jobs_and_refrigerant.ts", m0300],
  ["20261201000400_audits_and_findings.ts", m0400],
  ["20261201000500_history.ts", m0500],
  ["20261201000700_register_indexes.ts", m0700],
  ["20261201000800_records_for_jobs.ts", m0800],
  ["20261201000900_cards_and_imports.ts", m0900],
  ["20261201001000_findings_workflow.ts", m1000],
  ["20261203000100_branch_places_and_person_findings.ts", m300100],
  ["20261203000200_same_leak_additions.ts", m300200],
  ["20261203000300_entered_amounts_and_records_start.ts", m300300],
  ["20261203000310_finding_event_causes.ts", m300310],
  ["20261203000500_sessions_and_throttling.ts", s0500],
];

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => MIGRATIONS.map(([name]) => name),
  getMigrationName: (name) => name,
  getMigration: async (name) => {
    const found = MIGRATIONS.find(([n]) => n === name);
    if (!found) throw new Error(`Unknown migration ${name}`);
    return found[1];
  },
};

export const MIGRATION_NAMES: readonly string[] = MIGRATIONS.map(([name]) => name);
