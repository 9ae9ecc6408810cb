import { afterAll, beforeAll, expect, it } from "vitest";
import { jobAmendmentInput, type JobInput } from "@coldtrail/core";
import { amendJob, amendRecord, createJob, listAmendments, voidJob, voidRecord, type Knex } from "@coldtrail/db";
import { PG_URL, describePg, destroyPair, same, seededPair, withBooleans, type Pair } from "./pg-helpers";

/**
 * Writes on both dialects from the same data leave the same rows behind: jobs with their movements
 * and cylinder contents, amendments and voids with their history, a refused write rolled back whole.
 * On PostgreSQL the history stays append-only, and two writers on one cylinder do not lose a change.
 */

const NOW = new Date("2026-12-01T15:00:00Z");
const AT = NOW.toISOString();
// Demo records of Columbus (branch 1): technician Marcus Delacroix-Byrd, residential split COL-RES-101,
// cylinder COL-C-005 (R-410A) and recovery unit COL-RE-01.
const TECH = { userId: 8, organisationId: 1 };
const BRANCH = 1;
const APPLIANCE = 17;
const CYLINDER = 5;
const EQUIPMENT = 1;

const JOB_BOOLEANS = ["temporary_access_removed", "compressor_operating", "verification_passed", "shutdown_needed"];

let pair: Pair;

beforeAll(async () => {
  if (!PG_URL) return;
  pair = await seededPair();
}, 180_000);
afterAll(async () => {
  await destroyPair(pair);
});

const recovery: JobInput = {
  kind: "recovery",
  applianceId: APPLIANCE,
  performedOn: "2026-11-20",
  refrigerant: "R-410A",
  recoveredAmount: 2,
  recoveredUnit: "kg",
  cylinderId: CYLINDER,
  equipmentId: EQUIPMENT,
  evacuationValue: 0,
  evacuationUnit: "psig",
  accessMethod: "service_valve",
  compressorOperating: false,
};
const charge = (kg: number): JobInput => ({
  kind: "charge",
  applianceId: APPLIANCE,
  performedOn: "2026-11-21",
  refrigerant: "R-410A",
  chargedAmount: kg,
  chargedUnit: "kg",
  chargeSource: "cylinder",
  cylinderId: CYLINDER,
});

const maxId = async (db: Knex, table: string) => Number((await db(table).max({ m: "id" }).first())?.m ?? 0);
const contents = async (db: Knex) => db("cylinders").where({ id: CYLINDER }).first("contents_g", "refrigerant", "updated_at");
/** A refused write's error as the API maps it. */
const refusal = (p: Promise<unknown>) =>
  p.then(
    () => null,
    (err: { code?: string; field?: string; message?: string }) => ({ code: err.code, field: err.field, message: err.message }),
  );

describePg("writes", () => {
  it("jobs, corrections and voids leave the same rows on both dialects", async () => {
    const writeAll = async (db: Knex) => {
      const before = {
        activity: await maxId(db, "activity"),
        movements: await maxId(db, "refrigerant_movements"),
        amendments: await maxId(db, "amendments"),
      };
      const start = await contents(db);
      const recovered = await createJob(db, { actor: TECH, branchId: BRANCH, input: recovery, now: NOW });
      const charged = await createJob(db, { actor: TECH, branchId: BRANCH, input: charge(1), now: NOW });
      const afterJobs = await contents(db);
      const amendment = await amendJob(db, {
        actor: TECH,
        id: recovered,
        input: jobAmendmentInput.parse({
          reason: "Scale ticket says 2.5 kg",
          changes: { amount: 2.5, amountUnit: "kg", compressorOperating: true },
        }),
        now: NOW,
      });
      // The same boolean again changes nothing, on either dialect.
      const noChange = await refusal(
        amendJob(db, {
          actor: TECH,
          id: recovered,
          input: jobAmendmentInput.parse({ reason: "Again", changes: { compressorOperating: true } }),
          now: NOW,
        }),
      );
      await voidJob(db, { actor: TECH, id: charged, reason: "Entered on the wrong unit", now: NOW });
      const afterVoid = await contents(db);
      // A draw larger than the cylinder holds is refused and writes nothing.
      const counts = async () => ({
        jobs: await maxId(db, "jobs"),
        activity: await maxId(db, "activity"),
        movements: await maxId(db, "refrigerant_movements"),
      });
      const beforeRefusal = await counts();
      const tooMuch = await refusal(createJob(db, { actor: TECH, branchId: BRANCH, input: charge(500), now: NOW }));
      const afterRefusal = await counts();
      const afterRefusalContents = await contents(db);
      // The generic amendment and void on another regulated record.
      const purchase = await db("purchases").where({ branch_id: BRANCH }).orderBy("id").first("id", "organisation_id");
      await db.transaction((trx) =>
        amendRecord(trx, {
          table: "purchases",
          subjectType: "Purchase",
          id: purchase.id,
          organisationId: 1,
          actorId: TECH.userId,
          reason: "Invoice number mistyped",
          changes: { invoice_reference: "INV-CORRECTED" },
          summary: "Corrected the invoice",
          at: AT,
        }),
      );
      await db.transaction((trx) =>
        voidRecord(trx, {
          table: "purchases",
          subjectType: "Purchase",
          id: purchase.id,
          organisationId: 1,
          actorId: TECH.userId,
          reason: "Duplicate entry",
          summary: "Voided a purchase",
          at: AT,
        }),
      );
      return {
        ids: { recovered, charged, amendment },
        start,
        afterJobs,
        afterVoid,
        noChange,
        tooMuch,
        refusalWroteNothing:
          JSON.stringify(beforeRefusal) === JSON.stringify(afterRefusal) && afterRefusalContents.contents_g === afterVoid.contents_g,
        jobs: withBooleans(await db("jobs").whereIn("id", [recovered, charged]).orderBy("id").select("*"), JOB_BOOLEANS),
        movements: await db("refrigerant_movements").where("id", ">", before.movements).orderBy("id").select("*"),
        amendments: {
          job: await listAmendments(db, { organisationId: 1, subjectType: "Job", subjectId: recovered }),
          purchase: await listAmendments(db, { organisationId: 1, subjectType: "Purchase", subjectId: purchase.id }),
        },
        purchase: await db("purchases").where({ id: purchase.id }).first("invoice_reference", "voided_at", "void_reason"),
        activity: await db("activity")
          .where("id", ">", before.activity)
          .orderBy("id")
          .select("actor_id", "branch_id", "action", "subject_type", "subject_id", "at", "summary", "data"),
      };
    };
    const r = await same(pair, writeAll, "writes");
    // What the rows say (both dialects agree, so one side is enough).
    expect(r.afterJobs.contents_g).toBe(r.start.contents_g + 2000 - 1000);
    expect(r.afterVoid.contents_g).toBe(r.start.contents_g + 2500);
    expect(r.noChange).toMatchObject({ code: "invalid", field: "reason" });
    expect(r.tooMuch).toMatchObject({ code: "conflict", field: "chargedAmount" });
    expect(r.refusalWroteNothing).toBe(true);
    expect(r.amendments.job).toHaveLength(1);
    expect(r.amendments.job[0]).toMatchObject({
      previous: { recovered_g: 2000, compressor_operating: false },
      next: { recovered_g: 2500, compressor_operating: true },
    });
    expect(r.purchase).toMatchObject({ invoice_reference: "INV-CORRECTED", void_reason: "Duplicate entry" });
    expect(r.activity.map((a) => a.action)).toEqual(
      expect.arrayContaining([
        "job.recovery.created",
        "job.charge.created",
        "job.amended",
        "job.voided",
        "purchase.amended",
        "purchase.voided",
      ]),
    );
  });

  it("refuses UPDATE and DELETE of the history the writes appended (PostgreSQL triggers)", async () => {
    const db = pair.pg.db;
    const amendment = await db("amendments").orderBy("id", "desc").first("id", "reason");
    const activity = await db("activity").orderBy("id", "desc").first("id", "summary");
    expect(amendment).toBeTruthy();
    await expect(db("amendments").where({ id: amendment.id }).update({ reason: "Nothing to see" })).rejects.toThrow(
      /amendments is append-only/,
    );
    await expect(db("amendments").where({ id: amendment.id }).del()).rejects.toThrow(/amendments is append-only/);
    await expect(db("activity").where({ id: activity.id }).update({ summary: "Rewritten" })).rejects.toThrow(/activity is append-only/);
    await expect(db("activity").where("id", "<=", activity.id).del()).rejects.toThrow(/activity is append-only/);
    // Inside a transaction the refusal rolls the whole write back.
    const before = await maxId(db, "jobs");
    await expect(
      db.transaction(async (trx) => {
        await createJob(trx, { actor: TECH, branchId: BRANCH, input: { ...recovery, recoveredAmount: 0.1 }, now: NOW });
        await trx("activity").where({ id: activity.id }).del();
      }),
    ).rejects.toThrow(/append-only/);
    expect(await maxId(db, "jobs")).toBe(before);
    expect((await db("amendments").where({ id: amendment.id }).first("reason")).reason).toBe(amendment.reason);
    expect((await db("activity").where({ id: activity.id }).first("summary")).summary).toBe(activity.summary);
  });

  it("two writers on one cylinder: the second waits for the first and counts from its result (PostgreSQL)", async () => {
    const db = pair.pg.db;
    const start = Number((await contents(db)).contents_g);
    const other = await db.transaction();
    try {
      // Another writer changes the cylinder and keeps its transaction open.
      const [{ pid }] = (await other.raw("select pg_backend_pid() as pid")).rows;
      await other("cylinders")
        .where({ id: CYLINDER })
        .update({ contents_g: start + 3000 });
      const job = createJob(db, { actor: TECH, branchId: BRANCH, input: charge(1), now: NOW });
      // Wait until the job's transaction is blocked behind the other writer, then let that one commit.
      let waiting = 0;
      for (let i = 0; i < 400 && waiting === 0; i++) {
        waiting = Number(
          (await db.raw("select count(*) as n from pg_stat_activity where ? = any(pg_blocking_pids(pid))", [pid])).rows[0].n,
        );
        if (waiting === 0) await new Promise((r) => setTimeout(r, 25));
      }
      expect(waiting, "the job's transaction waits for the other writer").toBe(1);
      await other.commit();
      await job;
    } finally {
      if (!other.isCompleted()) await other.rollback();
    }
    expect(Number((await contents(db)).contents_g)).toBe(start + 3000 - 1000);
  });
});
