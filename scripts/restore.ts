/**
 * `pnpm restore <backup folder> --db <new database file> --bucket <new bucket> [--force]`: checks every
 * checksum of a backup made by `pnpm backup`, then restores it into a new SQLite file and a new bucket
 * (created when missing) of the storage in S3_ENDPOINT. It refuses to replace an existing database
 * file or a bucket that holds objects unless `--force` is given. Point COLDTRAIL_DB and S3_BUCKET at
 * the restored copies to serve them.
 */
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
  if (!dir || !dbFile || !bucket) {
    console.error("Usage: pnpm restore <backup folder> --db <new database file> --bucket <new bucket> [--force]");
    process.exitCode = 2;
    return;
  }
  const storage = { ...storageFromEnv(), bucket };
  const manifest = await restoreBackup({ dir: path.resolve(dir), dbFile: path.resolve(dbFile), storage, force: args.includes("--force") });
  console.log(`Restored the backup of ${manifest.createdAt}:`);
  if (manifest.database) console.log(`  database → ${path.resolve(dbFile)} (${Object.keys(manifest.database.tables).length} tables)`);
  console.log(`  ${manifest.objects.length} objects → bucket ${bucket}`);
  console.log(`Serve it with COLDTRAIL_DB=${path.resolve(dbFile)} S3_BUCKET=${bucket}.`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
