import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { randomBytes, randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import S3rver from "s3rver";
import { claimAudit, createAudit, createDb, runAuditBranches, type Knex } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";
import { bucketChecksums, putObject, restoreBackup, tableChecksums, takeBackup, verifyBackup } from "../../apps/web/src/lib/backup/backup";

/**
 * `pnpm backup` / `pnpm restore`: a backup taken while another connection keeps writing restores into
 * a fresh database and bucket equal to it table by table and object by object (sha256), holds only
 * whole transactions, and audits to the same findings as the original.
 */

let t: TestDb;
let s3rver: S3rver;
let tmp: string;
let storage: { bucket: string; s3: { endpoint: string; region: string; credentials: { accessKeyId: string; secretAccessKey: string } } };

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer().listen(0, "127.0.0.1", () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

beforeAll(async () => {
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), "coldtrail-backup-test-"));
  const port = await freePort();
  s3rver = new S3rver({
    port,
    address: "127.0.0.1",
    directory: path.join(tmp, "s3"),
    silent: true,
    configureBuckets: [{ name: "coldtrail-files", configs: [] }],
  });
  await s3rver.run();
  storage = {
    bucket: "coldtrail-files",
    s3: { endpoint: `http://127.0.0.1:${port}`, region: "us-east-1", credentials: { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" } },
  };
  t = await createSeededTestDb();
  for (let i = 0; i < 12; i += 1) {
    await putObject(storage, {
      key: `certifications/1/${randomUUID()}.${i % 2 ? "png" : "pdf"}`,
      bytes: randomBytes(2_000 + i * 500),
      contentType: i % 2 ? "image/png" : "application/pdf",
    });
  }
});

afterAll(async () => {
  await t.destroy();
  await s3rver.close();
  fs.rmSync(tmp, { recursive: true, force: true });
});

const findingsOf = async (db: Knex) =>
  (await db("findings").orderBy(["rule_id", "identity_key"]).select("rule_id", "identity_key", "state", "severity", "due_on")).map((r) => ({
    ...r,
  }));

async function auditOnce(db: Knex): Promise<void> {
  const now = new Date("2026-12-01T15:00:00Z");
  const branchIds = (await db("branches").where({ organisation_id: 1 }).orderBy("id").select("id")).map((b) => Number(b.id));
  const officer = await db("users").where({ email: "teodora.vasquez-lind@kestrelmoor.example" }).first("id");
  const id = await createAudit(db, {
    actor: { userId: Number(officer.id), organisationId: 1 },
    input: { branchIds, periodFrom: "2024-12-01", periodTo: "2026-12-01", packs: ["us_federal"] },
    now,
  });
  await claimAudit(db, { id, now });
  await runAuditBranches(db, { id, now: () => now });
}

describe("backup and restore", () => {
  it("a backup taken during writes restores equal, whole and auditable", async () => {
    // Another connection writes pairs of rows, each pair in one transaction, the whole time.
    const writer = createDb(t.file);
    let stop = false;
    let acknowledged = 0;
    const writing = (async () => {
      while (!stop) {
        const n = acknowledged;
        await writer.transaction(async (trx) => {
          for (const half of ["first", "second"])
            await trx("activity").insert({
              organisation_id: 1,
              actor_id: null,
              action: "backup.test",
              subject_type: "test",
              subject_id: n,
              at: new Date().toISOString(),
              summary: `${half} half of write ${n}`,
            });
        });
        acknowledged += 1;
        await new Promise((r) => setImmediate(r));
      }
    })();
    while (acknowledged < 20) await new Promise((r) => setTimeout(r, 5));
    const { dir, manifest } = await takeBackup({ db: t.db, storage, outDir: path.join(tmp, "backups") });
    const atBackup = acknowledged;
    while (acknowledged < atBackup + 20) await new Promise((r) => setTimeout(r, 5));
    stop = true;
    await writing;
    await writer.destroy();

    expect(manifest.objects).toHaveLength(12);
    expect(fs.readFileSync(path.join(dir, "SHA256SUMS"), "utf8").trim().split("\n")).toHaveLength(13);
    await expect(verifyBackup(dir)).resolves.toMatchObject({ format: "coldtrail-backup/1" });

    const restoredFile = path.join(tmp, "restored", "coldtrail.sqlite");
    const restoredStorage = { ...storage, bucket: "coldtrail-restored" };
    await restoreBackup({ dir, dbFile: restoredFile, storage: restoredStorage });
    const restored = createDb(restoredFile);
    try {
      // Every table and every object equal to the backup, by checksum.
      expect(await tableChecksums(restored)).toEqual(manifest.database!.tables);
      const objects = await bucketChecksums(restoredStorage);
      expect(objects).toEqual(Object.fromEntries(manifest.objects.map((o) => [o.key, o.sha256])));
      expect(objects).toEqual(await bucketChecksums(storage));

      // One consistent moment: whole transactions only, and none acknowledged before the backup missing.
      const rows = await restored("activity").where({ action: "backup.test" }).select("subject_id");
      const perWrite = new Map<number, number>();
      for (const r of rows) perWrite.set(Number(r.subject_id), (perWrite.get(Number(r.subject_id)) ?? 0) + 1);
      expect([...perWrite.values()].every((n) => n === 2)).toBe(true);
      expect(perWrite.size).toBeGreaterThanOrEqual(20);
      expect(perWrite.size).toBeLessThanOrEqual(acknowledged);
      expect([...perWrite.keys()].sort((a, b) => a - b)).toEqual(Array.from({ length: perWrite.size }, (_, i) => i));

      // The restored copy audits to the same findings as the original.
      await auditOnce(t.db);
      await auditOnce(restored);
      expect(await findingsOf(restored)).toEqual(await findingsOf(t.db));
    } finally {
      await restored.destroy();
    }

    // Restoring again over the same file and bucket is refused without --force, and allowed with it.
    await expect(restoreBackup({ dir, dbFile: restoredFile, storage: restoredStorage })).rejects.toThrow(/exists/);
    await expect(restoreBackup({ dir, dbFile: path.join(tmp, "another.sqlite"), storage: restoredStorage })).rejects.toThrow(
      /holds objects/,
    );
    await expect(restoreBackup({ dir, dbFile: restoredFile, storage: restoredStorage, force: true })).resolves.toBeDefined();
  });

  it("a damaged backup is refused before anything is restored", async () => {
    const { dir, manifest } = await takeBackup({
      db: t.db,
      storage,
      outDir: path.join(tmp, "backups-2"),
      now: new Date("2026-12-03T01:02:03Z"),
    });
    fs.appendFileSync(path.join(dir, manifest.objects[0]!.file), "x");
    const target = path.join(tmp, "never.sqlite");
    await expect(restoreBackup({ dir, dbFile: target, storage: { ...storage, bucket: "coldtrail-never" } })).rejects.toThrow(/checksum/);
    expect(fs.existsSync(target)).toBe(false);
  });
});
