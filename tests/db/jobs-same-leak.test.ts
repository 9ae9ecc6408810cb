import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { chargeJobInput, type JobInput } from "@coldtrail/core";
import { createJob, getJob, type ScopeFn } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";
import { jobsFixture, writeCounts, type JobsFixture } from "./jobs-fixture";

let t: TestDb;
let f: JobsFixture;

beforeEach(async () => {
  t = await createTestDb();
  f = await jobsFixture(t.db);
});
afterEach(async () => {
  await t.destroy();
});

const actor = () => ({ userId: f.tech, organisationId: f.org });
const orgScope = (): ScopeFn => (qb) => qb.where("jobs.organisation_id", f.org);
const charge = (over: Record<string, unknown> = {}): JobInput =>
  chargeJobInput.parse({
    kind: "charge",
    applianceId: f.walkIn,
    performedOn: "2026-03-31",
    refrigerant: "R-22",
    chargedAmount: 12,
    chargedUnit: "lb",
    chargeSource: "stock",
    ...over,
  });
const create = (input: JobInput) => createJob(t.db, { actor: actor(), branchId: f.north, input, now: new Date("2026-04-03T12:00:00Z") });

describe("a charge marked as the same leak as an earlier charge", () => {
  it("is stored with the earlier job and summed with it into one leak rate", async () => {
    await create(charge({ performedOn: "2025-03-31", chargedAmount: 5 }));
    const first = await create(charge());
    const second = await create(charge({ performedOn: "2026-04-02", chargedAmount: 10, sameLeakAsJobId: String(first) }));
    expect((await t.db("jobs").where({ id: second }).first()).same_leak_as_job_id).toBe(first);
    const detail = await getJob(t.db, { scope: orgScope(), id: second });
    expect(detail?.sameLeakAsJobId).toBe(first);
    // 12 lb + 10 lb of 100 lb over the 365 days before the first: 22 % > 20 %.
    // Source: 82.152 leak rate ("multiple additions related to the same leak", from memory); 82.157(c)(2) 20 % [S3]
    expect(detail!.leakRate!.percent).toBeCloseTo(22, 1);
    expect(detail!.leakRate!.exceeds).toBe(true);
  });

  it("refuses a job on another appliance, naming the field, and writes nothing", async () => {
    const other = await create(charge({ applianceId: f.rooftop, refrigerant: "R-410A" }));
    const before = await writeCounts(t.db);
    await expect(create(charge({ sameLeakAsJobId: String(other) }))).rejects.toMatchObject({ field: "sameLeakAsJobId" });
    expect(await writeCounts(t.db)).toEqual(before);
  });

  it("refuses a later job", async () => {
    const later = await create(charge({ performedOn: "2026-04-02" }));
    await expect(create(charge({ performedOn: "2026-04-01", sameLeakAsJobId: String(later) }))).rejects.toMatchObject({
      field: "sameLeakAsJobId",
    });
  });
});
