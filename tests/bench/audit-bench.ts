/**
 * Benchmark: an audit of one large synthetic branch. Adds a branch with BENCH_AUDIT_JOBS jobs
 * (default 100,000 — a million jobs over ten such branches), BENCH_AUDIT_APPLIANCES appliances and
 * their refrigerant movements to a copy of the demo database, then times reading the branch once,
 * the rules, storing the findings (first run and a re-run that reconciles them), the findings list,
 * and the spreadsheet export (streaming writer into a null sink). Prints figures; asserts nothing.
 * Run: `pnpm exec tsx tests/bench/audit-bench.ts` (or `pnpm bench`).
 */
import { Writable } from "node:stream";
import ExcelJS from "exceljs";
import { defineAbilityFor, findingListQuery, runAudit, DEFAULT_SETTINGS } from "@coldtrail/core";
import {
  auditBranchFindings,
  auditFindingExportRows,
  claimAudit,
  createAudit,
  jobExportRows,
  listFindings,
  loadActor,
  loadBranchRecords,
  scopeByAbility,
  type Knex,
} from "@coldtrail/db";
import { createSeededTestDb } from "@coldtrail/db/testing";

const JOBS = Number(process.env.BENCH_AUDIT_JOBS ?? 100_000);
const APPLIANCES = Number(process.env.BENCH_AUDIT_APPLIANCES ?? 5_000);
const CYLINDERS = 200;
const AT = "2026-11-30T12:00:00.000Z";
const PERIOD = { from: "2024-01-01", to: "2026-12-01" };

let seed = 7;
const rand = () => (seed = (seed * 1_103_515_245 + 12_345) % 2 ** 31) / 2 ** 31;
const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!;
const day = (i: number) => new Date(Date.UTC(2024, 0, 1) + i * 86_400_000).toISOString().slice(0, 10);

function mem(): string {
  return `${(process.memoryUsage().rss / 1024 / 1024).toFixed(0)} MiB`;
}

async function time<T>(label: string, fn: () => Promise<T>): Promise<T> {
  const t0 = performance.now();
  const result = await fn();
  console.log(`${label.padEnd(62)} ${(performance.now() - t0).toFixed(0).padStart(8)} ms   rss ${mem()}`);
  return result;
}

async function insertChunks(db: Knex, table: string, rows: Record<string, unknown>[], size = 400): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < rows.length; i += size) {
    const inserted = await db(table)
      .insert(rows.slice(i, i + size))
      .returning("id");
    for (const r of inserted) ids.push(Number(typeof r === "object" ? r.id : r));
  }
  return ids;
}

async function grow(db: Knex): Promise<number> {
  const [branch] = await db("branches")
    .insert({ organisation_id: 1, name: "Benchmark", code: "BEN", time_zone: "America/Chicago", mass_unit: "lb_oz", created_at: AT })
    .returning("id");
  const branchId = Number(branch.id ?? branch);
  const techs = (await db("memberships").where({ organisation_id: 1, role: "technician" }).select("user_id"))
    .map((r) => Number(r.user_id))
    .slice(0, 12);
  for (const t of techs)
    await db("memberships")
      .insert({ organisation_id: 1, user_id: t, branch_id: branchId, role: "technician", created_at: AT })
      .onConflict(["user_id", "branch_id", "role"])
      .ignore();
  const [site] = await db("sites")
    .insert({ organisation_id: 1, branch_id: branchId, name: "Benchmark site", address: "1 Bench Way", created_at: AT })
    .returning("id");
  const siteId = Number(site.id ?? site);
  const refrigerants = ["R-410A", "R-22", "R-404A", "R-134a", "R-454B"];
  const appliances = await insertChunks(
    db,
    "appliances",
    Array.from({ length: APPLIANCES }, (_, i) => {
      const big = i % 20 === 0;
      return {
        organisation_id: 1,
        branch_id: branchId,
        site_id: siteId,
        tag: `BEN-${i}`,
        description: big ? "Rack" : "Split system",
        category: big ? "commercial_refrigeration" : "residential_split",
        refrigerant: refrigerants[i % refrigerants.length],
        full_charge_g: big ? 200_000 : 3_000,
        created_at: AT,
        updated_at: AT,
      };
    }),
  );
  const cylinders = await insertChunks(
    db,
    "cylinders",
    Array.from({ length: CYLINDERS }, (_, i) => ({
      organisation_id: 1,
      branch_id: branchId,
      serial: `BEN-C-${i}`,
      water_capacity_g: 108_862,
      tare_g: 21_772,
      last_requalified_on: "2023-06-01",
      created_at: AT,
      updated_at: AT,
    })),
  );
  const [equipment] = await db("recovery_equipment")
    .insert({
      organisation_id: 1,
      branch_id: branchId,
      serial: "BEN-RE-1",
      manufactured_on: "2020-01-01",
      certification_state: "certified",
      created_at: AT,
      updated_at: AT,
    })
    .returning("id");
  const equipmentId = Number(equipment.id ?? equipment);

  const jobs: Record<string, unknown>[] = [];
  const plan: { kind: string; grams: number; cylinder: number | null; refrigerant: string; on: string }[] = [];
  for (let i = 0; i < JOBS; i++) {
    const a = Math.floor(rand() * APPLIANCES);
    const refrigerant = refrigerants[a % refrigerants.length]!;
    const recovery = rand() < 0.3;
    const on = day(Math.floor((i / JOBS) * 1060));
    const cylinder = recovery ? cylinders[(refrigerants.indexOf(refrigerant) * 40 + Math.floor(rand() * 40)) % CYLINDERS]! : null;
    const grams = recovery ? 500 + Math.floor(rand() * 2000) : 100 + Math.floor(rand() * 400);
    plan.push({ kind: recovery ? "recovery" : "charge", grams, cylinder, refrigerant, on });
    jobs.push({
      organisation_id: 1,
      branch_id: branchId,
      appliance_id: appliances[a],
      technician_id: pick(techs),
      kind: recovery ? "recovery" : "charge",
      performed_on: on,
      refrigerant,
      recovered_g: recovery ? grams : 0,
      charged_g: recovery ? 0 : grams,
      equipment_id: recovery ? equipmentId : null,
      cylinder_id: cylinder,
      access_method: recovery ? (rand() < 0.01 ? "piercing_pliers" : "service_valve") : "service_valve",
      temporary_access_removed: recovery ? true : null,
      evacuation_value: recovery ? 15 + Math.floor(rand() * 10) : null,
      evacuation_unit: recovery ? "in_hg_vacuum" : null,
      source: "import",
      created_by: techs[0],
      created_at: AT,
      updated_at: AT,
    });
  }
  const jobIds = await db.transaction((trx) => insertChunks(trx as unknown as Knex, "jobs", jobs, 300));
  const movements = plan.map((p, i) => ({
    organisation_id: 1,
    branch_id: branchId,
    job_id: jobIds[i],
    cylinder_id: p.cylinder,
    direction: p.kind === "recovery" ? "recovered_into_cylinder" : "charged_from_stock",
    refrigerant: p.refrigerant,
    mass_g: p.grams,
    moved_on: p.on,
    created_at: AT,
  }));
  await db.transaction((trx) => insertChunks(trx as unknown as Knex, "refrigerant_movements", movements, 400));
  return branchId;
}

class NullSink extends Writable {
  bytes = 0;
  override _write(chunk: Buffer, _enc: BufferEncoding, done: () => void) {
    this.bytes += chunk.length;
    done();
  }
}

async function main() {
  console.log(
    `Audit benchmark: one branch of ${JOBS.toLocaleString("en-US")} jobs and ${APPLIANCES.toLocaleString("en-US")} appliances (Node ${process.version})`,
  );
  const t = await createSeededTestDb();
  try {
    const branchId = await time(`Generate the branch (${JOBS.toLocaleString("en-US")} jobs + movements)`, () => grow(t.db));
    const loaded = await time("Read the branch once (loadBranchRecords)", () =>
      loadBranchRecords(t.db, { organisationId: 1, branchId, period: PERIOD, asOf: "2026-12-01T12:00:00Z" }),
    );
    const findings = await time("Run the rules (runAudit, US federal)", async () =>
      runAudit(loaded.records, { packs: ["us_federal"], period: PERIOD, asOf: "2026-12-01T12:00:00Z", settings: DEFAULT_SETTINGS }),
    );
    console.log(`  ${findings.length.toLocaleString("en-US")} findings from ${loaded.records.jobs.length.toLocaleString("en-US")} jobs`);

    const officer = Number((await t.db("users").where({ email: "teodora.vasquez-lind@kestrelmoor.example" }).first("id")).id);
    const auditId = await createAudit(t.db, {
      actor: { userId: officer, organisationId: 1 },
      input: { branchIds: [branchId], periodFrom: PERIOD.from, periodTo: PERIOD.to, packs: ["us_federal"] },
    });
    await claimAudit(t.db, { id: auditId });
    const now = new Date("2026-12-01T12:00:00Z");
    const first = await time("Audit the branch and store its findings (first run)", () =>
      auditBranchFindings(t.db, {
        organisationId: 1,
        branchId,
        period: PERIOD,
        packs: ["us_federal"],
        settings: DEFAULT_SETTINGS,
        auditId,
        now,
      }),
    );
    console.log(`  ${first.created.toLocaleString("en-US")} new findings`);
    await time("Audit again: reconcile with the stored findings", () =>
      auditBranchFindings(t.db, {
        organisationId: 1,
        branchId,
        period: PERIOD,
        packs: ["us_federal"],
        settings: DEFAULT_SETTINGS,
        auditId,
        now,
      }),
    );

    const actor = (await loadActor(t.db, officer))!;
    const scope = scopeByAbility(defineAbilityFor(actor, now), "read", "Finding", "findings");
    await time("Findings list: first page, sorted by due date", () =>
      listFindings(t.db, { organisationId: 1, scope, query: findingListQuery.parse({ pageSize: 50 }), today: "2026-12-01" }),
    );
    await time("Findings list: grouped by rule, filtered by severity", () =>
      listFindings(t.db, {
        organisationId: 1,
        scope,
        query: findingListQuery.parse({ pageSize: 50, groupBy: "rule", severity: "major", state: "all" }),
        today: "2026-12-01",
      }),
    );

    const sink = new NullSink();
    const rssBefore = process.memoryUsage().rss;
    let peak = rssBefore;
    const watch = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 50);
    const t0 = performance.now();
    const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: sink, useStyles: true, useSharedStrings: false });
    const fs = wb.addWorksheet("Findings", { views: [{ state: "frozen", ySplit: 1 }] });
    fs.columns = [
      { header: "Finding id", key: "id" },
      { header: "Rule id", key: "rule" },
      { header: "What is wrong", key: "detail" },
      { header: "Due", key: "due" },
    ];
    let rows = 0;
    for await (const f of auditFindingExportRows(t.db, { organisationId: 1, auditId, scope })) {
      fs.addRow({ id: f.id, rule: f.ruleId, detail: f.detail, due: f.dueOn ? new Date(f.dueOn) : null }).commit();
      rows++;
    }
    fs.commit();
    const js = wb.addWorksheet("Jobs", { views: [{ state: "frozen", ySplit: 1 }] });
    js.columns = [
      { header: "Job id", key: "id" },
      { header: "Date", key: "date" },
      { header: "Appliance", key: "appliance" },
      { header: "Refrigerant", key: "refrigerant" },
      { header: "Recovered (kg)", key: "rec" },
      { header: "Charged (kg)", key: "chg" },
    ];
    for await (const j of jobExportRows(t.db, {
      organisationId: 1,
      branchIds: [branchId],
      from: PERIOD.from,
      to: PERIOD.to,
      scope: scopeByAbility(defineAbilityFor(actor, now), "read", "Job", "jobs"),
    })) {
      js.addRow({
        id: j.id,
        date: new Date(j.performedOn),
        appliance: j.applianceTag,
        refrigerant: j.refrigerant,
        rec: j.recoveredG / 1000,
        chg: j.chargedG / 1000,
      }).commit();
      rows++;
    }
    js.commit();
    await wb.commit();
    clearInterval(watch);
    const ms = performance.now() - t0;
    console.log(
      `${"Export: findings + jobs sheets, streamed".padEnd(62)} ${ms.toFixed(0).padStart(8)} ms   ${rows.toLocaleString("en-US")} rows, ${Math.round(rows / (ms / 1000)).toLocaleString("en-US")} rows/s, ${(sink.bytes / 1024 / 1024).toFixed(1)} MiB, peak rss ${(peak / 1024 / 1024).toFixed(0)} MiB`,
    );
  } finally {
    await t.destroy();
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exitCode = 1;
});
