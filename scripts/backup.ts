/**
 * `pnpm backup [--out <folder>]`: a consistent online copy of the database (SQLite's backup API) and
 * every object in file storage, into `<folder>/coldtrail-backup-<date>` (default folder
 * `.coldtrail/backups`) with `manifest.json` and `SHA256SUMS`. Safe while the app runs.
 * Reads the app's settings: COLDTRAIL_DB, S3_ENDPOINT, S3_REGION, S3_BUCKET, S3_ACCESS_KEY_ID,
 * S3_SECRET_ACCESS_KEY (defaults: the local database and the local S3 fake).
 * On PostgreSQL it copies the objects only and reminds you to run pg_dump (see README).
 */
import path from "node:path";
import { storageFromEnv } from "./storage-env";

async function main(): Promise<void> {
  const { closeDb, getDb, isPostgres, repoRoot } = await import("../packages/db/src/index");
  const { takeBackup } = await import("../apps/web/src/lib/backup/backup");
  const args = process.argv.slice(2);
  const outAt = args.indexOf("--out");
  const outDir = path.resolve(outAt >= 0 && args[outAt + 1] ? args[outAt + 1]! : path.join(repoRoot(), ".coldtrail", "backups"));
  const started = performance.now();
  try {
    const db = getDb();
    const { dir, manifest } = await takeBackup({ db, storage: storageFromEnv(), outDir });
    const tables = manifest.database ? Object.values(manifest.database.tables).reduce((n, t) => n + t.rows, 0) : 0;
    console.log(`Backup written to ${dir}`);
    if (manifest.database)
      console.log(`  database: ${Object.keys(manifest.database.tables).length} tables, ${tables} rows, ${manifest.database.bytes} bytes`);
    console.log(`  objects: ${manifest.objects.length} from bucket ${manifest.bucket}`);
    console.log(
      `  ${((performance.now() - started) / 1000).toFixed(1)} s; check it any time with: (cd "${dir}" && sha256sum -c SHA256SUMS)`,
    );
    if (isPostgres(db)) console.log("  PostgreSQL: the database is not in this folder; back it up with pg_dump (see README).");
  } finally {
    await closeDb();
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
