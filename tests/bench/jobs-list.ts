/**
 * Benchmark: the jobs list at scale. Grows the demo data to BENCH_JOBS jobs (default 1,000,000)
 * by copying existing jobs, then times the queries the jobs page makes for each role.
 * Prints figures; asserts nothing. Run: `pnpm exec tsx tests/bench/jobs-list.ts`.
 */
import { defineAbilityFor, type JobListQuery } from "@coldtrail/core";
import { DEMO_SIGN_INS, listJobs, loadActor, scopeByAbility } from "@coldtrail/db";
import { createSeededTestDb } from "@coldtrail/db/testing";

const target = Number(process.env.BENCH_JOBS ?? 1_000_000);
const COLUMNS = [
  "organisation_id",
  "branch_id",
  "appliance_id",
  "technician_id",
  "kind",
  "performed_on",
  "refrigerant",
  "recovered_g",
  "charged_g",
  "equipment_id",
  "cylinder_id",
  "access_method",
  "temporary_access_removed",
  "evacuation_value",
  "evacuation_unit",
  "compressor_operating",
  "notes",
  "source",
  "created_by",
  "created_at",
  "updated_at",
];

async function time<T>(label: string, fn: () => Promise<T>, runs = 5): Promise<T> {
  let result!: T;
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    result = await fn();
    ms.push(performance.now() - t0);
  }
  ms.sort((a, b) => a - b);
  console.log(
    `${label.padEnd(58)} median ${ms[Math.floor(runs / 2)]!.toFixed(1).padStart(8)} ms   min ${ms[0]!.toFixed(1).padStart(8)} ms`,
  );
  return result;
}

async function main() {
  const t = await createSeededTestDb();
  const { db } = t;
  try {
    const grow0 = performance.now();
    for (;;) {
      const n = Number((await db("jobs").count({ n: "*" }).first())!.n);
      if (n >= target) break;
      const take = Math.min(n, target - n);
      const maxId = Number((await db("jobs").max({ m: "id" }).first())!.m);
      await db.transaction(async (trx) => {
        await trx
          .into(trx.raw(`jobs (${COLUMNS.join(", ")})`))
          .insert(trx("jobs").select(COLUMNS).where("id", "<=", maxId).orderBy("id").limit(take));
      });
    }
    await db.raw("ANALYZE");
    const total = Number((await db("jobs").count({ n: "*" }).first())!.n);
    console.log(`Grew the demo data to ${total.toLocaleString("en-US")} jobs in ${((performance.now() - grow0) / 1000).toFixed(1)} s\n`);

    const base: JobListQuery = { page: 1, pageSize: 25, sort: "performedOn", dir: "desc" };
    for (const [role, email] of Object.entries(DEMO_SIGN_INS)) {
      if (role.startsWith("other_org")) continue;
      const user = await db("users").where({ email }).first("id");
      const actor = (await loadActor(db, Number(user.id)))!;
      const ability = defineAbilityFor(actor, new Date("2026-12-01T12:00:00Z"));
      const scope = scopeByAbility(ability, "read", "Job", "jobs");
      const first = await time(`${role}: first page, newest first`, () => listJobs(db, { scope, query: base }));
      await time(`${role}: page 200, sorted by technician`, () =>
        listJobs(db, { scope, query: { ...base, page: 200, sort: "technician", dir: "asc" } }),
      );
      await time(`${role}: kind = charge, 2025 only`, () =>
        listJobs(db, { scope, query: { ...base, kind: "charge", from: "2025-01-01", to: "2025-12-31" } }),
      );
      await time(`${role}: search "rack"`, () => listJobs(db, { scope, query: { ...base, q: "rack" } }), 3);
      console.log(`${"".padEnd(4)}(${first.total.toLocaleString("en-US")} rows visible)\n`);
    }
  } finally {
    await t.destroy();
  }
}

main().catch((err) => {
  console.error(err);
  process.exitCode = 1;
});
