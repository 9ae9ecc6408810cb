import fs from "node:fs";
import path from "node:path";
import knexFactory, { type Knex } from "knex";
import { migrationSource } from "./migration-source";
import { useImmediateTransactions } from "./durable/busy";

/**
 * Pragmas applied to every pooled better-sqlite3 connection (SQLite only; PostgreSQL always enforces
 * foreign keys, and its MVCC and row locks stand in for WAL and the busy timeout, so pgConfig needs no twin).
 * WAL lets readers work while one writer commits; synchronous=NORMAL is safe with WAL;
 * busy_timeout makes a second writer wait instead of failing at once.
 */
function afterCreate(busyTimeoutMs: number) {
  return (conn: { pragma: (sql: string) => unknown }, done: (err: Error | null, conn: unknown) => void) => {
    try {
      conn.pragma("foreign_keys = ON");
      conn.pragma("journal_mode = WAL");
      conn.pragma(`busy_timeout = ${Math.max(0, Math.floor(busyTimeoutMs))}`);
      conn.pragma("synchronous = NORMAL");
      done(null, conn);
    } catch (err) {
      done(err as Error, conn);
    }
  };
}

/** The Knex configuration for a SQLite file; shared by createDb and the knexfile. */
export function sqliteConfig(filename: string, opts: { busyTimeoutMs?: number } = {}): Knex.Config {
  return {
    client: "better-sqlite3",
    connection: { filename },
    useNullAsDefault: true,
    pool: { min: 1, max: 1, afterCreate: afterCreate(opts.busyTimeoutMs ?? 5000) },
    migrations: { migrationSource, tableName: "knex_migrations" },
  };
}

/** True for a PostgreSQL connection URL (`postgres://…` or `postgresql://…`). */
export function isPostgresUrl(target: string): boolean {
  return /^postgres(ql)?:\/\//i.test(target.trim());
}

/** True when `knex` talks to PostgreSQL (for the few dialect-specific steps, each with a SQLite twin). */
export function isPostgres(knex: Knex | Knex.Transaction): boolean {
  const client = knex.client.config.client;
  return client === "pg" || client === "postgres" || client === "postgresql";
}

/** The Knex configuration for a PostgreSQL URL: the same migration source and table as SQLite. */
export function pgConfig(url: string): Knex.Config {
  return {
    client: "pg",
    connection: url.trim(),
    pool: { min: 0, max: 10 },
    migrations: { migrationSource, tableName: "knex_migrations" },
  };
}

/**
 * Opens a database: a `postgres://` URL opens PostgreSQL, anything else is a SQLite file, opened
 * (or created) with its folder created when missing. Both run the same migrations and queries.
 * On SQLite every transaction begins IMMEDIATE, so a writer waits for the lock (`busyTimeoutMs`,
 * default 5 s) instead of failing (see durable/busy.ts).
 */
export function createDb(target: string, opts: { busyTimeoutMs?: number } = {}): Knex {
  if (isPostgresUrl(target)) return knexFactory(pgConfig(target));
  if (target !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(/*turbopackIgnore: true*/ target)), { recursive: true });
  return useImmediateTransactions(knexFactory(sqliteConfig(target, opts)));
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

/**
 * The database to open: env COLDTRAIL_DB (a SQLite file, or a `postgres://` URL returned as is),
 * or `<repo>/.coldtrail/coldtrail.sqlite`. Pass it to `createDb`, which picks the client.
 */
export function databaseFile(): string {
  const fromEnv = process.env.COLDTRAIL_DB;
  if (fromEnv && isPostgresUrl(fromEnv)) return fromEnv.trim();
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
