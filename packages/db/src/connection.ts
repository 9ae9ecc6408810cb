import fs from "node:fs";
import path from "node:path";
import knexFactory, { type Knex } from "knex";
import { migrationSource } from "./migration-source";

/**
 * Pragmas applied to every pooled better-sqlite3 connection.
 * WAL lets readers work while one writer commits; synchronous=NORMAL is safe with WAL;
 * busy_timeout makes a second writer wait instead of failing at once.
 */
function afterCreate(conn: { pragma: (sql: string) => unknown }, done: (err: Error | null, conn: unknown) => void) {
  try {
    conn.pragma("foreign_keys = ON");
    conn.pragma("journal_mode = WAL");
    conn.pragma("busy_timeout = 5000");
    conn.pragma("synchronous = NORMAL");
    done(null, conn);
  } catch (err) {
    done(err as Error, conn);
  }
}

/** The Knex configuration for a SQLite file; shared by createDb and the knexfile. */
export function sqliteConfig(filename: string): Knex.Config {
  return {
    client: "better-sqlite3",
    connection: { filename },
    useNullAsDefault: true,
    pool: { min: 1, max: 1, afterCreate },
    migrations: { migrationSource, tableName: "knex_migrations" },
  };
}

/** Opens (or creates) a SQLite database file. The folder is created when missing. */
export function createDb(filename: string): Knex {
  if (filename !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(/*turbopackIgnore: true*/ filename)), { recursive: true });
  return knexFactory(sqliteConfig(filename));
}

/** The repository root: the nearest folder upwards holding pnpm-workspace.yaml. */
export function repoRoot(start: string = process.cwd()): string {
  let dir = path.resolve(/*turbopackIgnore: true*/ start);
  for (;;) {
    if (fs.existsSync(path.join(/*turbopackIgnore: true*/ dir, "pnpm-workspace.yaml"))) return dir;
    const parent = path.dirname(dir);
    if (parent === dir) return path.resolve(/*turbopackIgnore: true*/ start);
    dir = parent;
  }
}

/** The database file: env COLDTRAIL_DB, or `<repo>/.coldtrail/coldtrail.sqlite`. */
export function databaseFile(): string {
  const fromEnv = process.env.COLDTRAIL_DB;
  if (fromEnv && fromEnv.trim() !== "") return path.resolve(/*turbopackIgnore: true*/ fromEnv);
  return path.join(/*turbopackIgnore: true*/ repoRoot(), ".coldtrail", "coldtrail.sqlite");
}

const globalForDb = globalThis as unknown as { __coldtrailDb?: Knex };

/** The process-wide database handle. Kept on globalThis so Next.js hot reload does not open a new pool each time. */
export function getDb(): Knex {
  if (!globalForDb.__coldtrailDb) globalForDb.__coldtrailDb = createDb(databaseFile());
  return globalForDb.__coldtrailDb;
}

/** Closes the process-wide handle (scripts and tests). */
export async function closeDb(): Promise<void> {
  const db = globalForDb.__coldtrailDb;
  globalForDb.__coldtrailDb = undefined;
  if (db) await db.destroy();
}
