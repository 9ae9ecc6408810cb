import { afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { createRequire } from "node:module";
import { realpathSync } from "node:fs";
import { fileURLToPath } from "node:url";
import ExcelJS from "exceljs";
import { resolveSettings, type JobInput } from "@coldtrail/core";
import {
  claimAudit,
  createAudit,
  createJob,
  getAuditRun,
  latestActivityId,
  listFindingsOfRecord,
  reevaluateBranch,
  runAuditBranches,
  voidJob,
  type ScopeFn,
} from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";
import { jobsFixture, type JobsFixture } from "./jobs-fixture";

const web = (p: string) => fileURLToPath(new URL(`../../apps/web/src/${p}`, import.meta.url));
const webRequire = createRequire(new URL("../../apps/web/package.json", import.meta.url));

let t: TestDb;
let f: JobsFixture;
beforeAll(() => {
  vi.doMock(realpathSync(webRequire.resolve("server-only")), () => ({}));
});
beforeEach(async () => {
  t = await createTestDb();
  f = await jobsFixture(t.db);
});
afterEach(async () => {
  await t.destroy();
});

const all: ScopeFn = (qb) => qb.whereRaw("1 = 1");
const none: ScopeFn = (qb) => qb.whereRaw("1 = 0");
const actor = () => ({ userId: f.manager, organisationId: f.org });

describe("the findings a job raised or closed", () => {
  it("lists the finding the re-check after the job opened, and the same finding closed when the job is voided", async () => {
    const NOW = new Date("2026-06-01T12:00:00Z");
    const auditId = await createAudit(t.db, {
      actor: actor(),
      input: { branchIds: [f.north], periodFrom: "2026-01-01", periodTo: "2026-05-31", packs: ["us_federal"] },
      now: NOW,
    });
    await claimAudit(t.db, { id: auditId, now: NOW });
    await runAuditBranches(t.db, { id: auditId, now: () => NOW });
    const found = async () =>
      Number((await t.db("findings").where({ organisation_id: f.org, state: "open" }).count({ n: "*" }).first())!.n);
    const openBefore = await found();

    // 40 lb added to a 100 lb R-22 walk-in: 40 % a year, over the 20 % of commercial refrigeration.
    // Source: 40 CFR 82.157(d)(1)(ii) (20 % for commercial refrigeration)
    const input: JobInput = {
      kind: "charge",
      applianceId: f.walkIn,
      performedOn: "2026-05-20",
      refrigerant: "R-22",
      chargedAmount: 40,
      chargedUnit: "lb",
      chargeSource: "stock",
    };
    const before = await latestActivityId(t.db);
    const jobId = await createJob(t.db, { actor: actor(), branchId: f.north, input, now: NOW });
    await reevaluateBranch(t.db, { organisationId: f.org, branchId: f.north, now: NOW, afterActivityId: before });
    expect(await found()).toBeGreaterThan(openBefore);

    const listed = await listFindingsOfRecord(t.db, {
      scope: all,
      organisationId: f.org,
      recordType: "job",
      recordId: jobId,
      subjectTypes: ["job", "Job"],
    });
    expect(listed.length).toBeGreaterThan(0);
    const raised = listed.filter((r) => r.effects.some((e) => e.effect === "raised"));
    expect(raised.length).toBeGreaterThan(0);
    expect(raised.every((r) => r.state === "open")).toBe(true);
    // Every finding listed is one the re-check opened (or is about the job itself), none from the audit before it.
    const openedByAudit = await t.db("finding_events").whereNull("cause_to_activity_id").where({ action: "opened" }).pluck("finding_id");
    for (const r of raised) expect(openedByAudit.map(Number)).not.toContain(r.id);

    // Another job's page does not list them.
    const other = await createJob(t.db, {
      actor: actor(),
      branchId: f.north,
      input: { kind: "leak_repair", applianceId: f.rooftop, performedOn: "2026-05-21", leakLocation: "Coil", repairDescription: "Brazed" },
      now: NOW,
    });
    const otherList = await listFindingsOfRecord(t.db, {
      scope: all,
      organisationId: f.org,
      recordType: "job",
      recordId: other,
      subjectTypes: ["job", "Job"],
    });
    for (const r of raised) expect(otherList.map((o) => o.id)).not.toContain(r.id);

    // Voiding the job closes what it raised; the job's page says so.
    const beforeVoid = await latestActivityId(t.db);
    await voidJob(t.db, { actor: actor(), id: jobId, reason: "Entered on the wrong appliance", now: NOW });
    await reevaluateBranch(t.db, { organisationId: f.org, branchId: f.north, now: NOW, afterActivityId: beforeVoid });
    const after = await listFindingsOfRecord(t.db, {
      scope: all,
      organisationId: f.org,
      recordType: "job",
      recordId: jobId,
      subjectTypes: ["job", "Job"],
    });
    const closed = after.filter((r) => raised.some((x) => x.id === r.id));
    expect(closed.every((r) => r.effects.at(-1)?.effect === "closed" && r.state === "no_longer_found")).toBe(true);

    // Someone who may not read these findings sees none of them.
    expect(
      await listFindingsOfRecord(t.db, {
        scope: none,
        organisationId: f.org,
        recordType: "job",
        recordId: jobId,
        subjectTypes: ["job", "Job"],
      }),
    ).toEqual([]);
  });
});

describe("the audit export", () => {
  it("says the date each sheet is as of, shows the period end's cylinder contents, uses the product's state words and never writes a formula", async () => {
    const { auditWorkbookResponse } = (await import(
      web("lib/server/audit-export.ts")
    )) as typeof import("../../apps/web/src/lib/server/audit-export");
    // 10 lb into cylinder C-0142 during 2025, 5 lb more in 2026 (after the audit period).
    const rec = (performedOn: string, lb: number): JobInput => ({
      kind: "recovery",
      applianceId: f.rooftop,
      performedOn,
      refrigerant: "R-410A",
      recoveredAmount: lb,
      recoveredUnit: "lb",
      cylinderId: f.northCylinder,
      equipmentId: f.northEquipment,
      evacuationValue: 0,
      evacuationUnit: "in_hg_vacuum",
      accessMethod: "service_valve",
    });
    await createJob(t.db, { actor: actor(), branchId: f.north, input: rec("2025-06-10", 10) });
    await createJob(t.db, { actor: actor(), branchId: f.north, input: rec("2026-02-01", 5) });
    // Text typed by people that a spreadsheet would otherwise run.
    await t.db("appliances").where({ id: f.rooftop }).update({ description: "=2+3" });

    const NOW = new Date("2026-03-01T12:00:00Z");
    const auditId = await createAudit(t.db, {
      actor: actor(),
      input: { branchIds: [f.north], periodFrom: "2025-01-01", periodTo: "2025-12-31", packs: ["us_federal"] },
      now: NOW,
    });
    await claimAudit(t.db, { id: auditId, now: NOW });
    await runAuditBranches(t.db, { id: auditId, now: () => NOW });
    const finding = await t.db("audit_findings").where({ audit_id: auditId }).first("finding_id");
    expect(finding).toBeTruthy();
    await t.db("findings").where({ id: finding.finding_id }).update({
      title: '=HYPERLINK("http://example.invalid","open")',
      detail: "+1 555 0100",
      fix: "-check the scale",
      citation: "@SUM(A1:A2)",
      state: "fix_proposed",
    });
    await t.db("certifications").where({ user_id: f.tech }).update({ state: "verified" });

    const audit = (await getAuditRun(t.db, { organisationId: f.org, id: auditId }))!;
    const res = auditWorkbookResponse(t.db, {
      audit,
      organisationName: "Fixture Cooling",
      branchNames: new Map([[f.north, "NORTH"]]),
      exportedBy: "Fixture Manager",
      settings: resolveSettings(),
      branchIds: { jobs: [f.north], leak: [f.north], cylinders: [f.north], certifications: [f.north], disposals: [f.north] },
      scopes: { findings: all, jobs: all, cylinders: all, disposals: all },
      jobVisible: () => true,
    });
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(Buffer.from(await res.arrayBuffer()) as unknown as ExcelJS.Buffer);

    for (const ws of wb.worksheets) {
      expect(String(ws.getRow(1).getCell(1).value), ws.name).toMatch(/as of \d{4}-\d{2}-\d{2}/);
      expect(ws.views[0], ws.name).toMatchObject({ state: "frozen", ySplit: 2 });
    }
    const cylinders = wb.getWorksheet("Cylinders")!;
    expect(String(cylinders.getRow(1).getCell(1).value)).toContain("as of 2025-12-31");
    const headers = (cylinders.getRow(2).values as unknown[]).slice(1) as string[];
    const col = (name: string) => headers.indexOf(name) + 1;
    const rowOf = (serial: string) => {
      let found: ExcelJS.Row | undefined;
      cylinders.eachRow((row, n) => {
        if (n > 2 && row.getCell(col("Serial")).value === serial) found = row;
      });
      return found!;
    };
    // 10 lb = 4,535.9 g → 4,536 g at the period end; today it holds 15 lb (6,804 g).
    expect(rowOf("C-0142").getCell(col("Contents (kg)")).value).toBe(4.536);
    expect(rowOf("C-0142").getCell(col("Contents (lb)")).value).toBe(10);
    expect(rowOf("C-0142").getCell(col("Refrigerant")).value).toBe("R-410A");
    expect(rowOf("C-0200").getCell(col("Contents (kg)")).value).toBe(5); // opening balance, no movement since
    expect(rowOf("C-0142").getCell(col("Status")).value).toBe("In service");
    expect(wb.getWorksheet("Certifications")!.getRow(3).getCell(6).value).toBe("Verified");

    const findings = wb.getWorksheet("Findings")!;
    const fRow = findings.getRow(3);
    expect(fRow.getCell(4).value).toBe(`'=HYPERLINK("http://example.invalid","open")`);
    expect(fRow.getCell(6).value).toBe("Fix proposed");
    expect(fRow.getCell(8).value).toBe("'+1 555 0100");
    expect(fRow.getCell(9).value).toBe("'-check the scale");
    expect(fRow.getCell(10).value).toBe("'@SUM(A1:A2)");
    // No cell anywhere is a formula, and no text cell starts with a formula character.
    for (const ws of wb.worksheets)
      ws.eachRow((row) =>
        row.eachCell((cell) => {
          expect(cell.type, `${ws.name}!${cell.address}`).not.toBe(ExcelJS.ValueType.Formula);
          if (typeof cell.value === "string") expect(cell.value, `${ws.name}!${cell.address}`).not.toMatch(/^[=+\-@\t\r]/);
        }),
      );
    const jobs = wb.getWorksheet("Jobs")!;
    expect(jobs.getRow(3).getCell(6).value).toBe("'=2+3");

    // Re-saved as CSV and read back, the values still start with the apostrophe: nothing can run.
    const csv = new ExcelJS.Workbook();
    const copy = csv.addWorksheet("Findings");
    findings.eachRow((row) => copy.addRow((row.values as unknown[]).slice(1)));
    const text = (await csv.csv.writeBuffer()).toString();
    const back = new ExcelJS.Workbook();
    const { Readable } = await import("node:stream");
    const reread = await back.csv.read(Readable.from([text]));
    reread.eachRow((row) =>
      row.eachCell((cell) => {
        if (typeof cell.value === "string") expect(cell.value).not.toMatch(/^[=+\-@]/);
      }),
    );
    expect(JSON.stringify(reread.getSheetValues())).toContain(`'=HYPERLINK`);
  });
});
