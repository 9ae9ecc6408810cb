/**
 * `pnpm restore <backup folder> --db <new database file> --bucket <new bucket> [--force]`: checks every
 * checksum of a backup made by `pnpm backup`, then restores it into a new SQLite file and a new bucket
 * (created when missing) of the storage in S3_ENDPOINT. It refuses to replace an existing database
 * file or a bucket that holds objects unless `--force` is given. Point COLDTRAIL_DB and S3_BUCKET at
 * the restored copies to serve them.
 */
import fs from "node:fs";
import path from "node:path";
import { storageFromEnv } from "./storage-env";

function arg(args: string[], name: string): string | undefined {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
}

async function main(): Promise<void> {
  const { restoreBackup } = await import("../apps/web/src/lib/backup/backup");
  const args = process.argv.slice(2);
  const dir = args.find((a, i) => !a.startsWith("--") && (i === 0 || !args[i - 1]!.startsWith("--")));
  const dbFile = arg(args, "--db");
  const bucket = arg(args, "--bucket");
  const hasDatabase = Boolean(dir && fs.existsSync(path.join(dir, "database.sqlite")));
  if (!dir || !bucket || (hasDatabase && !dbFile)) {
    console.error("Usage: pnpm restore <backup folder> --db <new database file> --bucket <new bucket> [--force]");
    console.error("(--db is not needed for a backup taken on PostgreSQL, which holds the bucket only)");
    process.exitCode = 2;
    return;
  }
  const storage = { ...storageFromEnv(), bucket };
  const target = dbFile ? path.resolve(dbFile) : null;
  const manifest = await restoreBackup({ dir: path.resolve(dir), dbFile: target, storage, force: args.includes("--force") });
  console.log(`Restored the backup of ${manifest.createdAt}:`);
  if (manifest.database && target) console.log(`  database → ${target} (${Object.keys(manifest.database.tables).length} tables)`);
  console.log(`  ${manifest.objects.length} objects → bucket ${bucket}`);
  console.log(`Serve it with ${target ? `COLDTRAIL_DB=${target} ` : ""}S3_BUCKET=${bucket}.`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
