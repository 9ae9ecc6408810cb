import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import ExcelJS from "exceljs";
import { DEMO, contextAs, expect, mailTo, snap, test } from "./fixtures";
import { PLANTED_GAPS } from "./demo-data";
import { allFindings, TINY_PNG, todayIn, todayUtc, waitForAudit, type FindingRow } from "./audit-helpers";

/**
 * The compliance officer's main job, end to end on the demo data: run an audit of every branch, see
 * every planted gap, assign one, the branch manager proposes a fix with evidence, the officer accepts;
 * e-mails arrive; a record saved after the audit raises a finding at once; correcting the record
 * turns it into a proposed fix with the correction as evidence, which a re-run leaves for the
 * officer to review; the audit downloads as a spreadsheet that reads back.
 */

const SEVERITY_WORDS = { critical: "Critical", major: "Major", minor: "Minor" } as const;
const STATE_WORDS = {
  open: "Open",
  fix_proposed: "Fix proposed",
  closed: "Closed",
  waived: "Waived",
  no_longer_found: "No longer found",
} as const;

const matches = (gap: (typeof PLANTED_GAPS)[number]) => (f: FindingRow) =>
  gap.ruleIds.includes(f.ruleId) && f.branchName === gap.branch && (f.applianceTag === gap.record || f.recordLabel.includes(gap.record));

test.describe.serial("audits end to end", () => {
  let auditId: number;
  let findings: FindingRow[];
  let assigned: FindingRow;

  test("the officer runs an audit of every branch in the browser and sees every planted gap as a finding", async ({ browser }) => {
    const officer = await contextAs(browser, DEMO.officer);
    const page = await officer.newPage();
    await page.goto("/");
    await expect(page.getByRole("heading", { name: "Every branch at a glance" })).toBeVisible();

    await page.goto("/audits/new");
    await expect(page.getByRole("heading", { name: "New audit" })).toBeVisible();
    await expect(page.getByLabel(/^All branches \(\d+\)$/)).toBeChecked();
    await page.getByLabel("From", { exact: true }).fill("2024-12-01");
    await page.getByLabel("To", { exact: true }).fill(todayUtc());
    await expect(page.getByLabel(/US federal/)).toBeChecked();
    await snap(page, "audit-new");
    await page.getByRole("button", { name: "Start the audit" }).click();
    await expect(page).toHaveURL(/\/audits\/\d+$/);
    auditId = Number(new URL(page.url()).pathname.split("/").pop());
    await expect(page.getByRole("progressbar", { name: "Audit progress" })).toBeVisible();
    await snap(page, "audit-running");

    // The page can be left and reopened while the audit runs.
    await page.goto("/audits");
    await expect(page.getByTestId("audit-row").filter({ hasText: `Audit #${auditId}` })).toBeVisible();
    await page.goto(`/audits/${auditId}`);
    await expect(page.getByTestId("audit-state")).toHaveText("Finished", { timeout: 90_000 });
    await expect(page.getByTestId("audit-progress")).toHaveText("100 %");
    await expect(page.getByTestId("finding-row").first()).toBeVisible();
    await snap(page, "audit-finished");

    findings = await allFindings(officer.request, { auditId });
    for (const gap of PLANTED_GAPS) {
      expect(
        findings.filter(matches(gap)).length,
        `planted gap ${gap.gap}: ${gap.ruleIds.join("/")} on ${gap.record} in ${gap.branch}`,
      ).toBeGreaterThanOrEqual(1);
    }
    const audit = await waitForAudit(officer.request, auditId);
    expect(audit.summary!.totals.found).toBe(findings.length);

    // The findings table: filter by rule, group by branch.
    await page.goto("/findings?ruleId=CT-CERT-01&groupBy=branch&state=all");
    await expect(page.getByTestId("finding-group").first()).toBeVisible();
    await expect(
      page
        .getByTestId("finding-row")
        .filter({ hasText: "Caleb Runyon" })
        .or(page.getByTestId("finding-row").filter({ hasText: "COL-RTU-901" }))
        .first(),
    ).toBeVisible();
    const rules = await page.getByTestId("finding-row").evaluateAll((rows) => rows.map((r) => r.getAttribute("data-rule")));
    expect(new Set(rules)).toEqual(new Set(["CT-CERT-01"]));
    await snap(page, "findings-grouped-by-branch");
    await officer.close();
  });

  test("the officer assigns a finding; the branch manager proposes a fix with evidence; the officer accepts; the e-mails arrive", async ({
    browser,
    request,
  }) => {
    assigned = findings.find(matches(PLANTED_GAPS.find((g) => g.gap === "G11")!))!;
    expect(assigned.state).toBe("open");

    const officer = await contextAs(browser, DEMO.officer);
    const page = await officer.newPage();
    await page.goto("/findings?ruleId=CT-EVAC-01&branchId=" + assigned.branchId);
    const row = page.locator(`[data-testid="finding-row"][data-finding-id="${assigned.id}"]`);
    await expect(row).toBeVisible();
    await row.getByRole("checkbox", { name: `Select finding ${assigned.id}` }).check();
    await page.getByRole("combobox", { name: /^Assign to/ }).selectOption({ label: "Grant Oyelaran (branch manager)" });
    await snap(page, "findings-bulk-assign");
    await page.getByRole("button", { name: "Assign", exact: true }).click();
    await expect(page.getByRole("status")).toContainText("Assigned 1 finding to Grant Oyelaran");
    await expect(row).toContainText("Grant Oyelaran");

    await expect
      .poll(async () => (await mailTo(request, DEMO.managerColumbus)).filter((m) => m.subject.includes("CT-EVAC-01")).length, {
        timeout: 15_000,
      })
      .toBeGreaterThan(0);
    const assignedMail = (await mailTo(request, DEMO.managerColumbus)).filter((m) => m.subject.includes("CT-EVAC-01")).pop()!;
    expect(assignedMail.subject).toBe(`Finding assigned to you: CT-EVAC-01 ${assigned.title}`);
    expect(assignedMail.text).toContain("Teodora Vasquez-Lind assigned a finding to you");
    expect(assignedMail.text).toContain(`/findings/${assigned.id}`);
    expect(assignedMail.html).toContain(`/findings/${assigned.id}`);

    // The Columbus branch manager fixes it, with a photo as evidence.
    const manager = await contextAs(browser, DEMO.managerColumbus);
    const mpage = await manager.newPage();
    await mpage.goto(`/findings/${assigned.id}`);
    await expect(mpage.getByRole("heading", { name: new RegExp(assigned.title) })).toBeVisible();
    await expect(mpage.getByTestId("finding-detail")).toContainText("15 in Hg vacuum is required");
    await expect(mpage.getByTestId("finding-record-link")).toHaveAttribute("href", `/jobs/${assigned.recordId}`);
    await mpage
      .getByLabel("What was done to fix it")
      .fill("Recovered the condenser bundle again with COL-RE-01 down to 20 in Hg and logged the reading.");
    await mpage
      .getByLabel("Evidence (optional): a photo or PDF")
      .setInputFiles({ name: "gauge reading.png", mimeType: "image/png", buffer: TINY_PNG });
    await mpage.getByRole("button", { name: "Propose as fixed" }).click();
    await expect(mpage.getByRole("status")).toContainText("Fix proposed");
    await expect(mpage.getByTestId("finding-status")).toContainText("Fix proposed");
    await expect(mpage.getByTestId("evidence-list")).toContainText("gauge reading.png");
    await snap(mpage, "finding-fix-proposed-manager");

    await expect
      .poll(async () => (await mailTo(request, DEMO.officer)).filter((m) => m.subject.startsWith("Fix proposed: CT-EVAC-01")).length, {
        timeout: 15_000,
      })
      .toBeGreaterThan(0);
    const proposedMail = (await mailTo(request, DEMO.officer)).filter((m) => m.subject.startsWith("Fix proposed: CT-EVAC-01")).pop()!;
    expect(proposedMail.text).toContain("Grant Oyelaran proposed a fix");
    expect(proposedMail.text).toContain("down to 20 in Hg");

    // The evidence is a real stored file.
    const evidenceHref = await mpage.getByTestId("evidence-list").getByRole("link").first().getAttribute("href");
    const evidence = await manager.request.get(evidenceHref!);
    expect(evidence.status()).toBe(200);
    expect(evidence.headers()["content-type"]).toBe("image/png");
    expect(Buffer.from(await evidence.body()).equals(TINY_PNG)).toBe(true);

    // The officer accepts.
    await page.goto(`/findings/${assigned.id}`);
    await expect(page.getByText(/Grant Oyelaran proposed:/)).toBeVisible();
    await page.getByRole("button", { name: "Accept the fix" }).click();
    await expect(page.getByTestId("finding-status")).toContainText("Closed");
    await expect(page.getByTestId("finding-history")).toContainText("Fix accepted");
    await snap(page, "finding-closed-officer");
    const detail = (await (await officer.request.get(`/api/findings/${assigned.id}`)).json()) as {
      state: string;
      events: { action: string }[];
    };
    expect(detail.state).toBe("closed");
    expect(detail.events.map((e) => e.action)).toEqual(expect.arrayContaining(["opened", "assigned", "fix_proposed", "accepted"]));

    // The digest: the officer asks for today's, which lists overdue findings.
    const digest = await officer.request.post("/api/findings/digest");
    expect(digest.ok()).toBeTruthy();
    await expect
      .poll(async () => (await mailTo(request, DEMO.officer)).filter((m) => m.subject.startsWith("Coldtrail digest")).length, {
        timeout: 15_000,
      })
      .toBeGreaterThan(0);
    const digestMail = (await mailTo(request, DEMO.officer)).filter((m) => m.subject.startsWith("Coldtrail digest")).pop()!;
    expect(digestMail.text).toMatch(/OVERDUE since \d{4}-\d{2}-\d{2}/);
    expect(digestMail.html).toContain("Open your findings");

    // The Tucson manager may not see it.
    const other = await contextAs(browser, DEMO.managerTucson);
    expect((await other.request.get(`/api/findings/${assigned.id}`)).status()).toBe(404);
    await Promise.all([officer.close(), manager.close(), other.close()]);
  });

  test("a job saved after the audit raises its finding at once; correcting the record makes it a proposed fix that a re-run leaves for review", async ({
    browser,
  }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus);
    const { rows: appliances } = (await (await tech.request.get("/api/lookup/appliances?limit=50")).json()) as {
      rows: { id: number; tag: string; category: string; refrigerant: string; branchId: number }[];
    };
    const appliance = appliances.find((a) => a.category === "residential_split")!;
    const { rows: cylinders } = (await (await tech.request.get(`/api/lookup/cylinders?branchId=${appliance.branchId}`)).json()) as {
      rows: { id: number }[];
    };
    const { rows: equipment } = (await (await tech.request.get(`/api/lookup/equipment?branchId=${appliance.branchId}`)).json()) as {
      rows: { id: number }[];
    };
    const created = await tech.request.post("/api/jobs", {
      data: {
        kind: "recovery",
        applianceId: appliance.id,
        performedOn: todayIn("America/New_York"), // Columbus: the branch's date, inside the audited period
        refrigerant: appliance.refrigerant,
        recoveredAmount: 0.25,
        recoveredUnit: "lb",
        cylinderId: cylinders[0]!.id,
        equipmentId: equipment[0]!.id,
        evacuationValue: 15,
        evacuationUnit: "in_hg_vacuum",
        accessMethod: "piercing_pliers",
        temporaryAccessRemoved: false,
      },
    });
    expect(created.status(), await created.text()).toBe(201);
    const jobId = ((await created.json()) as { id: number }).id;

    // Continuous audit: the finding appears without a new run, and the technician it names sees it.
    let raised: FindingRow | undefined;
    await expect
      .poll(
        async () => {
          raised = (await allFindings(tech.request, { ruleId: "CT-ACCESS-01" })).find(
            (f) => f.recordType === "job" && f.recordId === jobId,
          );
          return raised?.state;
        },
        { timeout: 30_000 },
      )
      .toBe("open");
    expect(raised!.technicianName).toBe("Marcus Delacroix-Byrd");

    // The technician corrects the record: the clamp was taken off.
    const amended = await tech.request.patch(`/api/jobs/${jobId}`, {
      data: { reason: "The piercing pliers were removed before leaving the site", changes: { temporaryAccessRemoved: true } },
    });
    expect(amended.status(), await amended.text()).toBe(200);

    const officer = await contextAs(browser, DEMO.officer);
    const page = await officer.newPage();
    await page.goto(`/audits/${auditId}`);
    await page.getByRole("button", { name: "Run again" }).click();
    await expect(page).not.toHaveURL(new RegExp(`/audits/${auditId}$`));
    await expect(page.getByTestId("audit-state")).toHaveText("Finished", { timeout: 90_000 });
    const rerunId = Number(new URL(page.url()).pathname.split("/").pop());
    expect(rerunId).toBeGreaterThan(auditId);

    const after = (await (await officer.request.get(`/api/findings/${raised!.id}`)).json()) as {
      state: string;
      events: { action: string }[];
    };
    // The gap vanished because the technician corrected the job: a fix for the officer to review,
    // with the correction as its evidence, never closed on its own.
    expect(after.state).toBe("fix_proposed");
    expect(after.events.map((e) => e.action)).toContain("fix_proposed");
    expect(after.events.map((e) => e.action)).not.toContain("no_longer_found");
    // Findings that still hold kept their identity across the re-run.
    const rerunFindings = await allFindings(officer.request, { auditId: rerunId });
    const g01 = findings.find(matches(PLANTED_GAPS[0]!))!;
    expect(rerunFindings.map((f) => f.id)).toContain(g01.id);
    // The closed finding stays closed: people decided it.
    expect(rerunFindings.find((f) => f.id === assigned.id)?.state).toBe("closed");

    await page.goto(`/findings/${raised!.id}`);
    await expect(page.getByTestId("finding-status")).toContainText("Fix proposed");
    await expect(page.getByRole("heading", { name: "Corrections waiting for review" })).toBeVisible();
    await expect(page.getByTestId("amendment-evidence")).toContainText("The piercing pliers were removed before leaving the site");
    await expect(page.getByTestId("amendment-evidence")).toContainText("Marcus Delacroix-Byrd");
    await snap(page, "finding-fix-proposed-by-correction");
    auditId = rerunId;
    await Promise.all([tech.close(), officer.close()]);
  });

  test("the audit downloads as a spreadsheet that reads back: sheets, headers, one row per finding, values as in the database", async ({
    browser,
  }) => {
    const officer = await contextAs(browser, DEMO.officer);
    const page = await officer.newPage();
    await page.goto(`/audits/${auditId}`);
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("export-link").click()]);
    expect(download.suggestedFilename()).toBe(`coldtrail-audit-${auditId}.xlsx`);
    const file = join(mkdtempSync(join(tmpdir(), "coldtrail-export-")), "audit.xlsx");
    await download.saveAs(file);

    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(file);
    expect(wb.worksheets.map((w) => w.name)).toEqual([
      "Summary",
      "Findings",
      "Jobs",
      "Leak rates",
      "Cylinders",
      "Certifications",
      "Disposals",
    ]);

    // Row 1 says which date the sheet's figures are as of; the column headers are row 2.
    const header = (name: string) => (wb.getWorksheet(name)!.getRow(2).values as unknown[]).slice(1);
    for (const ws of wb.worksheets) expect(String(ws.getRow(1).getCell(1).value)).toMatch(/as of \d{4}-\d{2}-\d{2}/);
    expect(header("Findings")).toEqual([
      "Finding id",
      "Branch",
      "Rule id",
      "Title",
      "Severity",
      "Status",
      "Record",
      "What is wrong",
      "How to fix it",
      "Citation",
      "Due",
      "Assignee",
      "Last change (UTC)",
      "Date of the event",
      "Technician named",
    ]);
    expect(header("Jobs")).toEqual(
      expect.arrayContaining(["Job id", "Date", "Recovered (kg)", "Recovered (lb)", "Charged (kg)", "Evacuation reached"]),
    );
    expect(header("Leak rates")).toEqual(
      expect.arrayContaining([
        "Date of addition",
        "Full charge (kg)",
        "Days since last addition",
        "Leak rate (%)",
        "Threshold (%)",
        "Over the threshold",
      ]),
    );
    expect(header("Cylinders")).toEqual(expect.arrayContaining(["Serial", "Contents (kg)", "Maximum fill (lb)", "Requalification due"]));
    expect(header("Certifications")).toEqual(expect.arrayContaining(["Technician", "Types", "Verification"]));
    expect(header("Disposals")).toEqual(expect.arrayContaining(["Kind", "Appliance", "Recovered (kg)", "Signed by"]));

    const findingsSheet = wb.getWorksheet("Findings")!;
    expect(findingsSheet.views[0]).toMatchObject({ state: "frozen", ySplit: 2 });
    expect(findingsSheet.autoFilter).toBeTruthy();

    const fromDb = await allFindings(officer.request, { auditId });
    const byId = new Map(fromDb.map((f) => [f.id, f]));
    const rows: ExcelJS.Row[] = [];
    findingsSheet.eachRow((row, n) => {
      if (n > 2) rows.push(row);
    });
    expect(rows.length).toBe(fromDb.length);
    const seen = new Set<number>();
    for (const row of rows) {
      const id = Number(row.getCell(1).value);
      seen.add(id);
      const f = byId.get(id);
      expect(f, `finding ${id} of the sheet is in the audit`).toBeTruthy();
      expect(row.getCell(2).value).toBe(f!.branchName);
      expect(row.getCell(3).value).toBe(f!.ruleId);
      expect(row.getCell(4).value).toBe(f!.title);
      expect(row.getCell(5).value).toBe(SEVERITY_WORDS[f!.severity]);
      expect(row.getCell(6).value).toBe(STATE_WORDS[f!.state]);
      expect(row.getCell(7).value).toBe(f!.recordLabel);
      expect(row.getCell(8).value).toBe(f!.detail);
      const due = row.getCell(11).value;
      if (f!.dueOn) {
        expect(due).toBeInstanceOf(Date);
        expect((due as Date).toISOString().slice(0, 10)).toBe(f!.dueOn);
      }
      expect(row.getCell(12).value ?? "").toBe(f!.assigneeName ?? "");
      expect(row.getCell(13).value).toBeInstanceOf(Date);
    }
    expect(seen.size).toBe(fromDb.length);
    expect(rows.find((r) => Number(r.getCell(1).value) === assigned.id)?.getCell(12).value).toBe("Grant Oyelaran");

    const summary = wb.getWorksheet("Summary")!;
    const summaryText = JSON.stringify(summary.getSheetValues());
    expect(summaryText).toContain("Kestrelmoor Climate Services");
    expect(summaryText).toContain("Teodora Vasquez-Lind");
    expect(summaryText).toContain("Findings by branch");
    expect(summaryText).toContain("Findings by rule");
    const jobs = wb.getWorksheet("Jobs")!;
    expect(jobs.rowCount).toBeGreaterThan(1000);
    expect(jobs.getRow(3).getCell(2).value).toBeInstanceOf(Date);
    await officer.close();
  });

  test("dashboards: the organisation overview and a branch dashboard, readable without colour", async ({ browser }) => {
    const officer = await contextAs(browser, DEMO.officer);
    const page = await officer.newPage();
    await page.goto("/");
    for (const name of ["Columbus", "Tucson", "Denver", "Peoria"])
      await expect(page.getByTestId("overview-branch").filter({ hasText: name })).toHaveCount(1);
    await expect(page.getByTestId("severity-by-branch-chart")).toBeVisible();
    await expect(page.getByText("How record health is computed.")).toBeVisible();
    await expect(page.getByTestId("health-score").first()).toContainText(/\d+\.\d/);
    await snap(page, "overview-officer");

    await page.getByRole("link", { name: "Peoria" }).first().click();
    await expect(page.getByRole("heading", { name: "Peoria", level: 1 })).toBeVisible();
    await expect(page.getByTestId("findings-by-rule-chart")).toBeVisible();
    await expect(page.getByTestId("refrigerant-flows-chart")).toBeVisible();
    await expect(page.getByText("Refrigerant (lb)").first()).toBeVisible();
    await expect(page.getByTestId("cylinder-watchlist")).toContainText("PIA-C-906");
    await expect(page.getByTestId("coverage-table")).toContainText("Trevor Amadi");
    await snap(page, "branch-dashboard-peoria");

    // Tucson's leak watchlist holds the supermarket rack over its threshold; Denver shows kilograms.
    const branches = (await (await officer.request.get("/api/lookup/branches")).json()) as { rows: { id: number; name: string }[] };
    await page.goto(`/branches/${branches.rows.find((b) => b.name === "Tucson")!.id}`);
    await expect(page.getByTestId("leak-watchlist")).toContainText("TUC-RACK-908");
    await expect(page.getByTestId("leak-watchlist")).toContainText("Repair overdue since 2026-10-12");
    await snap(page, "branch-dashboard-tucson");
    await page.goto(`/branches/${branches.rows.find((b) => b.name === "Denver")!.id}`);
    await expect(page.getByText("Refrigerant (kg)").first()).toBeVisible();
    await officer.close();

    // The branch manager sees their own branch only; the inspector the granted one, without the leak watchlist.
    const manager = await contextAs(browser, DEMO.managerColumbus);
    const mpage = await manager.newPage();
    await mpage.goto("/");
    await expect(mpage.getByTestId("overview-branch")).toHaveCount(1);
    await expect(mpage.getByTestId("overview-branch")).toContainText("Columbus");
    await snap(mpage, "overview-manager-columbus");
    const inspector = await contextAs(browser, DEMO.inspector);
    const ipage = await inspector.newPage();
    await ipage.goto("/");
    await expect(ipage.getByTestId("overview-branch")).toHaveCount(1);
    await ipage.getByRole("link", { name: "Denver" }).first().click();
    await expect(ipage.getByText("Not shown: your access covers part of this branch's jobs only.")).toBeVisible();
    await snap(ipage, "branch-dashboard-inspector");
    await Promise.all([manager.close(), inspector.close()]);
  });
});
