import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import {
  CreateBucketCommand,
  GetObjectCommand,
  HeadBucketCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
  type S3ClientConfig,
} from "@aws-sdk/client-s3";
import { createDb, isPostgres, type Knex } from "@coldtrail/db";

/**
 * Backup and restore of a Coldtrail instance: the SQLite database and every object in file storage,
 * into one dated folder with a manifest and sha256 checksums (`pnpm backup`, `pnpm restore`).
 *
 * - The database is copied online with SQLite's backup API (better-sqlite3 `db.backup()`), so what is
 *   still in the write-ahead log is included and the copy is one consistent moment even while the app
 *   writes. (A plain file copy of a running database misses the WAL.)
 * - The database is copied FIRST, then the objects: the app stores a file before the row that names
 *   it, so every object the copied database refers to already exists when the objects are listed.
 *   Objects stored after that moment may be in the backup too; they are harmless extras.
 * - Restore verifies every checksum, then writes a NEW database file and a NEW bucket; it refuses to
 *   replace an existing file or a bucket holding objects unless `force` is given.
 * On PostgreSQL the database part is `pg_dump` (README); the objects part is the same.
 */

export interface ManifestObject {
  key: string;
  file: string;
  bytes: number;
  sha256: string;
  contentType: string | null;
}

export interface Manifest {
  format: "coldtrail-backup/1";
  createdAt: string;
  database: {
    kind: "sqlite";
    file: string;
    bytes: number;
    sha256: string;
    tables: Record<string, { rows: number; sha256: string }>;
  } | null;
  bucket: string;
  objects: ManifestObject[];
}

export interface StorageTarget {
  s3: S3ClientConfig;
  bucket: string;
}

export function s3Client(config: S3ClientConfig): S3Client {
  // s3rver (and some S3-compatible services) need path-style URLs and checksums only when required.
  return new S3Client({
    forcePathStyle: true,
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
    ...config,
  });
}

const sha256 = (bytes: Uint8Array | string) => createHash("sha256").update(bytes).digest("hex");

async function fileSha256(file: string): Promise<string> {
  const hash = createHash("sha256");
  for await (const chunk of fs.createReadStream(file)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

/** Every user table of a SQLite database with its row count and a checksum of its rows (in rowid order). */
export async function tableChecksums(db: Knex): Promise<Record<string, { rows: number; sha256: string }>> {
  const tables = (
    await db("sqlite_master").where({ type: "table" }).whereNot("name", "like", "sqlite_%").orderBy("name").select("name")
  ).map((r) => String(r.name));
  const out: Record<string, { rows: number; sha256: string }> = {};
  for (const table of tables) {
    // SQLite only (backups of SQLite files): rowid is the physical row order of an ordinary table.
    const rows = await db.raw(`SELECT * FROM "${table.replace(/"/g, '""')}" ORDER BY rowid`);
    const hash = createHash("sha256");
    for (const row of rows as unknown[]) hash.update(`${JSON.stringify(row)}\n`);
    out[table] = { rows: (rows as unknown[]).length, sha256: hash.digest("hex") };
  }
  return out;
}

/** The dated folder name of a backup taken at `at`: coldtrail-backup-2026-12-03T09-15-00Z. */
export function backupFolderName(at: Date): string {
  return `coldtrail-backup-${at.toISOString().slice(0, 19).replace(/:/g, "-")}Z`;
}

async function bodyBytes(body: unknown): Promise<Uint8Array> {
  const b = body as { transformToByteArray?: () => Promise<Uint8Array> };
  if (b?.transformToByteArray) return b.transformToByteArray();
  const chunks: Buffer[] = [];
  for await (const c of body as AsyncIterable<Buffer>) chunks.push(Buffer.from(c));
  return Buffer.concat(chunks);
}

async function listKeys(s3: S3Client, bucket: string): Promise<string[]> {
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const page = await s3.send(new ListObjectsV2Command({ Bucket: bucket, ContinuationToken: token }));
    for (const o of page.Contents ?? []) if (o.Key) keys.push(o.Key);
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return keys.sort();
}

/** A key as a safe relative file path inside the backup (no "..", no absolute paths). */
function objectFile(key: string, index: number): string {
  const safe = key
    .split("/")
    .filter((p) => p !== "" && p !== "." && p !== "..")
    .map((p) => p.replace(/[^A-Za-z0-9._-]/g, "_"))
    .join("/");
  return path.posix.join("objects", safe || `object-${index}`);
}

/**
 * Takes a backup of `db` (a SQLite handle; on PostgreSQL only the objects, see README) and of every
 * object of `storage.bucket`, into `<outDir>/<dated folder>`. Returns the folder and its manifest.
 */
export async function takeBackup(opts: {
  db: Knex;
  storage: StorageTarget;
  outDir: string;
  now?: Date;
}): Promise<{ dir: string; manifest: Manifest }> {
  const at = opts.now ?? new Date();
  const dir = path.join(opts.outDir, backupFolderName(at));
  if (fs.existsSync(dir)) throw new Error(`${dir} already exists`);
  fs.mkdirSync(path.join(dir, "objects"), { recursive: true });

  let database: Manifest["database"] = null;
  if (!isPostgres(opts.db)) {
    const file = path.join(dir, "database.sqlite");
    // The pooled better-sqlite3 connection: its backup() copies a consistent snapshot, WAL included.
    const conn = (await opts.db.client.acquireConnection()) as { backup: (f: string, o?: { progress?: () => number }) => Promise<unknown> };
    try {
      // All pages in one step: the copy is one moment even while other connections write.
      await conn.backup(file, { progress: () => 1_000_000_000 });
    } finally {
      await opts.db.client.releaseConnection(conn);
    }
    const copy = createDb(file);
    try {
      await copy.raw("PRAGMA wal_checkpoint(TRUNCATE)");
      database = { kind: "sqlite", file: "database.sqlite", bytes: 0, sha256: "", tables: await tableChecksums(copy) };
    } finally {
      await copy.destroy();
    }
    for (const suffix of ["-wal", "-shm"]) fs.rmSync(`${file}${suffix}`, { force: true });
    database.bytes = fs.statSync(file).size;
    database.sha256 = await fileSha256(file);
  }

  const s3 = s3Client(opts.storage.s3);
  const objects: ManifestObject[] = [];
  const keys = await listKeys(s3, opts.storage.bucket);
  for (const [i, key] of keys.entries()) {
    const got = await s3.send(new GetObjectCommand({ Bucket: opts.storage.bucket, Key: key }));
    const bytes = await bodyBytes(got.Body);
    const file = objectFile(key, i);
    fs.mkdirSync(path.dirname(path.join(dir, file)), { recursive: true });
    fs.writeFileSync(path.join(dir, file), bytes);
    objects.push({ key, file, bytes: bytes.byteLength, sha256: sha256(bytes), contentType: got.ContentType ?? null });
  }
  s3.destroy();

  const manifest: Manifest = { format: "coldtrail-backup/1", createdAt: at.toISOString(), database, bucket: opts.storage.bucket, objects };
  fs.writeFileSync(path.join(dir, "manifest.json"), `${JSON.stringify(manifest, null, 2)}\n`);
  // The usual `sha256sum -c` format, so a backup can be checked without Coldtrail.
  const sums = [...(database ? [`${database.sha256}  ${database.file}`] : []), ...objects.map((o) => `${o.sha256}  ${o.file}`)];
  fs.writeFileSync(path.join(dir, "SHA256SUMS"), `${sums.join("\n")}\n`);
  return { dir, manifest };
}

/** Reads a backup's manifest and checks every file against its checksum. Throws on the first mismatch. */
export async function verifyBackup(dir: string): Promise<Manifest> {
  const manifest = JSON.parse(fs.readFileSync(path.join(dir, "manifest.json"), "utf8")) as Manifest;
  if (manifest.format !== "coldtrail-backup/1") throw new Error("Not a Coldtrail backup (manifest format)");
  const check = async (file: string, expected: string) => {
    const full = path.resolve(dir, file);
    if (!full.startsWith(path.resolve(dir) + path.sep)) throw new Error(`${file} points outside the backup`);
    if ((await fileSha256(full)) !== expected) throw new Error(`${file} does not match its checksum; the backup is damaged`);
  };
  if (manifest.database) await check(manifest.database.file, manifest.database.sha256);
  for (const o of manifest.objects) await check(o.file, o.sha256);
  return manifest;
}

async function bucketHasObjects(s3: S3Client, bucket: string): Promise<boolean | null> {
  try {
    await s3.send(new HeadBucketCommand({ Bucket: bucket }));
  } catch {
    return null; // no such bucket
  }
  return (await listKeys(s3, bucket)).length > 0;
}

/**
 * Restores a verified backup into a NEW SQLite file `dbFile` and bucket `storage.bucket` (created when
 * missing). Refuses an existing database file or a bucket holding objects unless `force`.
 */
export async function restoreBackup(opts: {
  dir: string;
  dbFile: string | null;
  storage: StorageTarget;
  force?: boolean;
}): Promise<Manifest> {
  const manifest = await verifyBackup(opts.dir);
  const s3 = s3Client(opts.storage.s3);
  try {
    if (manifest.database && opts.dbFile && fs.existsSync(opts.dbFile) && !opts.force)
      throw new Error(`${opts.dbFile} exists; restore into a new file, or pass --force to replace it`);
    const holds = await bucketHasObjects(s3, opts.storage.bucket);
    if (holds && !opts.force) throw new Error(`Bucket ${opts.storage.bucket} holds objects; restore into a new bucket, or pass --force`);

    if (manifest.database && opts.dbFile) {
      fs.mkdirSync(path.dirname(path.resolve(opts.dbFile)), { recursive: true });
      for (const suffix of ["", "-wal", "-shm"]) fs.rmSync(`${opts.dbFile}${suffix}`, { force: true });
      fs.copyFileSync(path.join(opts.dir, manifest.database.file), opts.dbFile);
    }
    if (holds === null) await s3.send(new CreateBucketCommand({ Bucket: opts.storage.bucket }));
    for (const o of manifest.objects) {
      await s3.send(
        new PutObjectCommand({
          Bucket: opts.storage.bucket,
          Key: o.key,
          Body: fs.readFileSync(path.join(opts.dir, o.file)),
          ...(o.contentType ? { ContentType: o.contentType } : {}),
        }),
      );
    }
  } finally {
    s3.destroy();
  }
  return manifest;
}

/** Stores one object (restores, tests and tools). */
export async function putObject(storage: StorageTarget, obj: { key: string; bytes: Uint8Array; contentType?: string }): Promise<void> {
  const s3 = s3Client(storage.s3);
  try {
    await s3.send(
      new PutObjectCommand({
        Bucket: storage.bucket,
        Key: obj.key,
        Body: obj.bytes,
        ...(obj.contentType ? { ContentType: obj.contentType } : {}),
      }),
    );
  } finally {
    s3.destroy();
  }
}

/** Checksums of every object in a bucket, by key (to compare a restore with its backup). */
export async function bucketChecksums(storage: StorageTarget): Promise<Record<string, string>> {
  const s3 = s3Client(storage.s3);
  try {
    const out: Record<string, string> = {};
    for (const key of await listKeys(s3, storage.bucket)) {
      const got = await s3.send(new GetObjectCommand({ Bucket: storage.bucket, Key: key }));
      out[key] = sha256(await bodyBytes(got.Body));
    }
    return out;
  } finally {
    s3.destroy();
  }
}
