import { afterAll, beforeAll, expect, it } from "vitest";
import type { JobInput } from "@coldtrail/core";
import {
  claimAudit,
  createAudit,
  createJob,
  latestActivityId,
  listFindingsOfRecord,
  reevaluateBranch,
  runAuditBranches,
} from "@coldtrail/db";
import { jobsFixture } from "../db/jobs-fixture";
import { PG_URL, describePg, destroyPair, emptyPair, same, type Pair } from "./pg-helpers";

/**
 * The findings a job raised (from the re-check after its write), read the same way on both dialects:
 * the join on an activity range and the DISTINCT with its order run on PostgreSQL as on SQLite.
 */

const NOW = new Date("2026-06-01T12:00:00Z");
let pair: Pair;
const ids: { job: number; org: number }[] = [];

beforeAll(async () => {
  if (!PG_URL) return;
  pair = await emptyPair();
  for (const db of [pair.sqlite.db, pair.pg.db]) {
    const f = await jobsFixture(db);
    const actor = { userId: f.manager, organisationId: f.org };
    const auditId = await createAudit(db, {
      actor,
      input: { branchIds: [f.north], periodFrom: "2026-01-01", periodTo: "2026-05-31", packs: ["us_federal"] },
      now: NOW,
    });
    await claimAudit(db, { id: auditId, now: NOW });
    await runAuditBranches(db, { id: auditId, now: () => NOW });
    const input: JobInput = {
      kind: "charge",
      applianceId: f.walkIn,
      performedOn: "2026-05-20",
      refrigerant: "R-22",
      chargedAmount: 40,
      chargedUnit: "lb",
      chargeSource: "stock",
    };
    const before = await latestActivityId(db);
    const job = await createJob(db, { actor, branchId: f.north, input, now: NOW });
    await reevaluateBranch(db, { organisationId: f.org, branchId: f.north, now: NOW, afterActivityId: before });
    ids.push({ job, org: f.org });
  }
}, 180_000);
afterAll(async () => {
  await destroyPair(pair);
});

describePg("the findings a job raised", () => {
  it("are the same on both dialects, and there is at least one", async () => {
    expect(ids[0]).toEqual(ids[1]);
    const { job, org } = ids[0]!;
    const rows = await same(pair, (db) =>
      listFindingsOfRecord(db, {
        scope: (qb) => qb.whereRaw("1 = 1"),
        organisationId: org,
        recordType: "job",
        recordId: job,
        subjectTypes: ["job", "Job"],
      }).then((r) => r.map((x) => ({ ...x, effects: x.effects.map((e) => e.effect) }))),
    );
    expect(rows.some((r) => r.effects.includes("raised"))).toBe(true);
  });
});
