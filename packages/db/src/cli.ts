import fs from "node:fs";
import { closeDb, createDb, databaseFile, isPostgresUrl } from "./connection";
import { loadDemoData } from "./demo/load";

function removeDatabaseFiles(file: string): void {
  for (const suffix of ["", "-wal", "-shm"]) fs.rmSync(`${file}${suffix}`, { force: true });
}

/** What the messages call the database: the file, or the PostgreSQL URL without its password. */
function describeTarget(target: string): string {
  return isPostgresUrl(target) ? target.replace(/\/\/([^:@/]+):[^@/]*@/, "//$1:***@") : target;
}

async function main(): Promise<void> {
  const command = process.argv[2];
  const target = databaseFile();
  const postgres = isPostgresUrl(target);
  const file = describeTarget(target);
  if (command !== "migrate" && command !== "seed" && command !== "reset" && command !== "setup") {
    // setup = migrate, then load the demo data only if the database holds no organisation yet.
    console.error("Usage: tsx src/cli.ts migrate|seed|reset|setup");
    process.exitCode = 2;
    return;
  }
  const started = performance.now();
  if (command === "reset" && !postgres) removeDatabaseFiles(target);
  const db = createDb(target);
  try {
    // PostgreSQL has no file to delete: a reset rolls every migration back (dropping the tables) instead.
    if (command === "reset" && postgres) await db.migrate.rollback(undefined, true);
    const [, applied] = (await db.migrate.latest()) as [number, string[]];
    console.log(applied.length ? `Migrated ${file}: ${applied.join(", ")}` : `${file} is up to date`);
    const empty = command === "setup" && !(await db("organisations").first("id"));
    if (command === "setup" && !empty) console.log("Demo data already loaded; keeping the database as it is");
    if (command === "seed" || command === "reset" || empty) {
      const { tables, facts } = await loadDemoData(db);
      const counts = ["users", "appliances", "jobs", "cylinders", "refrigerant_movements"]
        .map((t) => `${tables.rows(t).length} ${t}`)
        .join(", ");
      console.log(`Loaded the demo data: ${counts} (unrecorded Peoria shipment: ${facts.unrecordedShipmentG} g)`);
    }
    console.log(`Done in ${((performance.now() - started) / 1000).toFixed(2)} s`);
  } finally {
    await db.destroy();
    await closeDb();
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
