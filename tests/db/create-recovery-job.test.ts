import { afterEach, beforeEach, describe, expect, it } from "vitest";
import type { RecoveryJobInput } from "@coldtrail/core";
import { createRecoveryJob, DomainError, RecordConflictError, RecordNotFoundError, getJob } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";
import { smallFixture } from "./fixture";

let t: TestDb;
let f: Awaited<ReturnType<typeof smallFixture>>;

beforeEach(async () => {
  t = await createTestDb();
  f = await smallFixture(t.db);
});
afterEach(async () => {
  await t.destroy();
});

function input(over: Partial<RecoveryJobInput> = {}): RecoveryJobInput {
  return {
    kind: "recovery",
    applianceId: f.northAppliance,
    performedOn: "2026-03-14",
    refrigerant: "R-410A",
    recoveredAmount: 12.4,
    recoveredUnit: "lb",
    cylinderId: f.northCylinder,
    equipmentId: f.northEquipment,
    evacuationValue: 15,
    evacuationUnit: "in_hg_vacuum",
    accessMethod: "service_valve",
    ...over,
  };
}

async function counts() {
  const n = async (table: string) => Number((await t.db(table).count({ n: "*" }).first())?.n);
  return { jobs: await n("jobs"), movements: await n("refrigerant_movements"), activity: await n("activity") };
}

describe("createRecoveryJob", () => {
  it("writes the job, the movement into the cylinder, the cylinder's contents and an activity row", async () => {
    const id = await createRecoveryJob(t.db, {
      actor: { userId: f.tech, organisationId: f.org },
      branchId: f.north,
      input: input(),
      now: new Date("2026-03-14T18:30:00.000Z"),
    });

    const job = await t.db("jobs").where({ id }).first();
    expect(job).toMatchObject({
      branch_id: f.north,
      technician_id: f.tech,
      kind: "recovery",
      recovered_g: 5625, // 12.4 lb × 453.59237 g = 5624.5 g
      charged_g: 0,
      cylinder_id: f.northCylinder,
      equipment_id: f.northEquipment,
      evacuation_value: 15,
      evacuation_unit: "in_hg_vacuum",
      created_by: f.tech,
      created_at: "2026-03-14T18:30:00.000Z",
    });

    const movements = await t.db("refrigerant_movements").where({ job_id: id });
    expect(movements).toHaveLength(1);
    expect(movements[0]).toMatchObject({
      direction: "recovered_into_cylinder",
      cylinder_id: f.northCylinder,
      refrigerant: "R-410A",
      mass_g: 5625,
    });

    const cylinder = await t.db("cylinders").where({ id: f.northCylinder }).first();
    expect(cylinder).toMatchObject({ contents_g: 5625, refrigerant: "R-410A" });

    const activity = await t.db("activity").where({ subject_type: "job", subject_id: id });
    expect(activity).toHaveLength(1);
    expect(activity[0]).toMatchObject({ actor_id: f.tech, branch_id: f.north, action: "job.recovery.created" });
    expect(activity[0].summary).toBe("Recovered 12.40 lb R-410A from RTU-07 into cylinder C-0142");

    const detail = await getJob(t.db, { scope: (qb) => qb.where("jobs.organisation_id", f.org), id });
    expect(detail?.movements.map((m) => m.massG)).toEqual([5625]);
    expect(detail?.cylinderSerial).toBe("C-0142");
  });

  it("adds to a cylinder's contents, keeps its refrigerant, and does not refuse a different refrigerant", async () => {
    await createRecoveryJob(t.db, {
      actor: { userId: f.tech, organisationId: f.org },
      branchId: f.north,
      input: input({ cylinderId: f.northR22Cylinder, recoveredAmount: 2, recoveredUnit: "kg" }),
    });
    const cylinder = await t.db("cylinders").where({ id: f.northR22Cylinder }).first();
    expect(cylinder).toMatchObject({ contents_g: 3000, refrigerant: "R-22" });
    const kinds = await t.db("refrigerant_movements").where({ cylinder_id: f.northR22Cylinder }).pluck("refrigerant");
    expect(kinds).toEqual(["R-410A"]);
  });

  it("refuses a cylinder of another branch, names the field, and writes nothing", async () => {
    const before = await counts();
    const err = await createRecoveryJob(t.db, {
      actor: { userId: f.tech, organisationId: f.org },
      branchId: f.north,
      input: input({ cylinderId: f.southCylinder }),
    }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(RecordConflictError);
    expect(err).toBeInstanceOf(DomainError);
    expect((err as DomainError).code).toBe("conflict");
    expect((err as DomainError).field).toBe("cylinderId");
    expect(await counts()).toEqual(before);
    expect((await t.db("cylinders").where({ id: f.southCylinder }).first()).contents_g).toBe(0);
  });

  it("refuses equipment of another branch by field", async () => {
    await expect(
      createRecoveryJob(t.db, {
        actor: { userId: f.tech, organisationId: f.org },
        branchId: f.north,
        input: input({ equipmentId: f.southEquipment }),
      }),
    ).rejects.toMatchObject({ code: "conflict", field: "equipmentId" });
  });

  it("treats another organisation's appliance as not found", async () => {
    const before = await counts();
    const err = await createRecoveryJob(t.db, {
      actor: { userId: f.tech, organisationId: f.org },
      branchId: f.north,
      input: input({ applianceId: f.awayAppliance }),
    }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(RecordNotFoundError);
    expect((err as DomainError).field).toBe("applianceId");
    expect(await counts()).toEqual(before);
  });

  it("treats another organisation's branch as not found", async () => {
    await expect(
      createRecoveryJob(t.db, { actor: { userId: f.tech, organisationId: f.org }, branchId: f.away, input: input() }),
    ).rejects.toMatchObject({ code: "not_found", field: "branchId" });
  });

  it("refuses an appliance of another branch of the same organisation as a conflict", async () => {
    await expect(
      createRecoveryJob(t.db, {
        actor: { userId: f.tech, organisationId: f.org },
        branchId: f.north,
        input: input({ applianceId: f.southAppliance }),
      }),
    ).rejects.toMatchObject({ code: "conflict", field: "applianceId" });
  });

  it("writes the summary in the branch's unit", async () => {
    const id = await createRecoveryJob(t.db, {
      actor: { userId: f.tech, organisationId: f.org },
      branchId: f.south,
      input: input({
        applianceId: f.southAppliance,
        cylinderId: f.southCylinder,
        equipmentId: f.southEquipment,
        recoveredAmount: 5.62,
        recoveredUnit: "kg",
      }),
    });
    const row = await t.db("activity").where({ subject_type: "job", subject_id: id }).first();
    expect(row.summary).toBe("Recovered 5.62 kg R-410A from RTU-S1 into cylinder C-0300");
  });
});
