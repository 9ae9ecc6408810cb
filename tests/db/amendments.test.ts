import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { amendRecord, listAmendments, voidRecord, DomainError, type Knex } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

let t: TestDb;
let job: { id: number; organisation_id: number; notes: string | null; technician_id: number };

beforeEach(async () => {
  t = await createSeededTestDb();
  job = await t.db("jobs").whereNull("voided_at").orderBy("id").first("id", "organisation_id", "notes", "technician_id");
});
afterEach(async () => {
  await t.destroy();
});

const amend = (db: Knex, changes: Record<string, unknown>, reason = "Technician's ticket said 4 in Hg") =>
  db.transaction((trx) =>
    amendRecord(trx, {
      table: "jobs",
      subjectType: "Job",
      id: job.id,
      organisationId: job.organisation_id,
      actorId: job.technician_id,
      reason,
      changes,
      summary: "Corrected the evacuation level",
    }),
  );

describe("regulated records are corrected by amendment", () => {
  it("keeps the previous and next values, who and why, and logs the activity", async () => {
    const before = await t.db("jobs").where({ id: job.id }).first("evacuation_value");
    await amend(t.db, { evacuation_value: 4, notes: job.notes });
    const after = await t.db("jobs").where({ id: job.id }).first("evacuation_value");
    expect(after.evacuation_value).toBe(4);

    const history = await listAmendments(t.db, { organisationId: job.organisation_id, subjectType: "Job", subjectId: job.id });
    expect(history).toHaveLength(1);
    expect(history[0]!.previous).toEqual({ evacuation_value: before.evacuation_value ?? null });
    expect(history[0]!.next).toEqual({ evacuation_value: 4 });
    expect(history[0]!.reason).toBe("Technician's ticket said 4 in Hg");
    const activity = await t.db("activity").where({ subject_type: "Job", subject_id: job.id, action: "job.amended" });
    expect(activity).toHaveLength(1);
  });

  it("refuses a correction without a reason and writes nothing", async () => {
    const count = Number((await t.db("amendments").count({ n: "*" }).first())!.n);
    await expect(amend(t.db, { evacuation_value: 7 }, " ")).rejects.toMatchObject({ code: "invalid", field: "reason" });
    expect(Number((await t.db("amendments").count({ n: "*" }).first())!.n)).toBe(count);
    expect((await t.db("jobs").where({ id: job.id }).first("evacuation_value")).evacuation_value).not.toBe(7);
  });

  it("history rows cannot be changed or deleted", async () => {
    await amend(t.db, { evacuation_value: 5 });
    await expect(t.db("amendments").update({ reason: "x" })).rejects.toThrow(/append-only/);
    await expect(t.db("activity").del()).rejects.toThrow(/append-only/);
  });

  it("a voided record keeps its row, cannot be voided twice or amended", async () => {
    await t.db.transaction((trx) =>
      voidRecord(trx, {
        table: "jobs",
        subjectType: "Job",
        id: job.id,
        organisationId: job.organisation_id,
        actorId: job.technician_id,
        reason: "Entered on the wrong appliance",
        summary: "Voided a job",
      }),
    );
    const row = await t.db("jobs").where({ id: job.id }).first("voided_at", "void_reason");
    expect(row.voided_at).toBeTruthy();
    expect(row.void_reason).toBe("Entered on the wrong appliance");
    await expect(
      t.db.transaction((trx) =>
        voidRecord(trx, {
          table: "jobs",
          subjectType: "Job",
          id: job.id,
          organisationId: job.organisation_id,
          actorId: job.technician_id,
          reason: "again",
          summary: "Voided",
        }),
      ),
    ).rejects.toBeInstanceOf(DomainError);
    await expect(amend(t.db, { evacuation_value: 9 })).rejects.toMatchObject({ code: "conflict" });
  });
});
