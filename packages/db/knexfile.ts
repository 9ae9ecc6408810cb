import path from "node:path";
import { fileURLToPath } from "node:url";
import type { Knex } from "knex";
import { databaseFile, isPostgresUrl, pgConfig, sqliteConfig } from "./src/connection";

const here = path.dirname(fileURLToPath(import.meta.url));

/**
 * For the knex CLI run through tsx (`NODE_OPTIONS="--import tsx" knex --knexfile knexfile.ts …`).
 * The project's own CLI (src/cli.ts) uses the same migrations through a static migration source;
 * migration names are the file names in both cases, so the two agree on what has run.
 */
const target = databaseFile();
const base = isPostgresUrl(target) ? pgConfig(target) : sqliteConfig(target);
const config: Knex.Config = {
  ...base,
  migrations: {
    directory: path.join(here, "migrations"),
    loadExtensions: [".ts"],
    tableName: "knex_migrations",
  },
  seeds: { directory: path.join(here, "seeds"), loadExtensions: [".ts"] },
};

export default config;
