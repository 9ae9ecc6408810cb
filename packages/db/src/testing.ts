import { randomUUID } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import knexFactory, { type Knex } from "knex";
import { createDb, pgConfig } from "./connection";
import { loadDemoData } from "./demo/load";

export interface TestDb {
  db: Knex;
  file: string;
  /** Closes the connection and deletes the file. */
  destroy: () => Promise<void>;
}

function tempFile(label: string): string {
  return path.join(os.tmpdir(), `coldtrail-${label}-${process.pid}-${randomUUID()}.sqlite`);
}

function removeFiles(file: string): void {
  for (const suffix of ["", "-wal", "-shm"]) fs.rmSync(`${file}${suffix}`, { force: true });
}

function handle(file: string): TestDb {
  const db = createDb(file);
  return {
    db,
    file,
    destroy: async () => {
      await db.destroy();
      removeFiles(file);
    },
  };
}

/** A fresh, migrated database in a temporary file. */
export async function createTestDb(): Promise<TestDb> {
  const t = handle(tempFile("test"));
  await t.db.migrate.latest();
  return t;
}

let seededTemplate: Promise<string> | undefined;

/** Migrates and seeds one template file per process; later calls copy it. */
function template(): Promise<string> {
  seededTemplate ??= (async () => {
    const file = tempFile("seeded-template");
    const db = createDb(file);
    try {
      await db.migrate.latest();
      await loadDemoData(db);
    } finally {
      await db.destroy(); // closing the last connection checkpoints the WAL into the main file
    }
    process.once("exit", () => removeFiles(file));
    return file;
  })();
  return seededTemplate;
}

/** A fresh copy of the migrated database holding the demo data. */
export async function createSeededTestDb(): Promise<TestDb> {
  const source = await template();
  const file = tempFile("seeded");
  fs.copyFileSync(source, file);
  return handle(file);
}

/**
 * A fresh, migrated PostgreSQL database for tests: its own schema (`coldtrail_test_…`) in the
 * database at `url`, so test files can run side by side; `seeded` also loads the demo data.
 * `file` holds the schema name; `destroy` drops the schema and closes the pool.
 */
export async function createPgTestDb(url: string, opts: { seeded?: boolean } = {}): Promise<TestDb> {
  const schema = `coldtrail_test_${process.pid}_${randomUUID().replace(/-/g, "").slice(0, 12)}`;
  const admin = knexFactory({ ...pgConfig(url), pool: { min: 0, max: 1 } });
  try {
    await admin.raw("CREATE SCHEMA ??", [schema]);
  } finally {
    await admin.destroy();
  }
  const db = knexFactory({ ...pgConfig(url), searchPath: [schema], pool: { min: 0, max: 4 } });
  const destroy = async () => {
    await db.destroy();
    const cleanup = knexFactory({ ...pgConfig(url), pool: { min: 0, max: 1 } });
    try {
      await cleanup.raw("DROP SCHEMA IF EXISTS ?? CASCADE", [schema]);
    } finally {
      await cleanup.destroy();
    }
  };
  try {
    await db.migrate.latest();
    if (opts.seeded) await loadDemoData(db);
  } catch (err) {
    await destroy();
    throw err;
  }
  return { db, file: schema, destroy };
}
