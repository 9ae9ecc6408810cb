import type { APIRequestContext, Browser } from "@playwright/test";
import { DEMO, contextAs, expect, test } from "./fixtures";
import { allFindings, runAuditApi, todayUtc, type AuditRow, type FindingRow } from "./audit-helpers";

/**
 * Every audit, finding, saved-view and dashboard route, for each role against its own branch, another
 * branch and another organisation. The server decides; pages only mirror it.
 */

const OTHER_ORG_OWNER = "beatrix.holloway@quillfield-refrigeration.example";
const ANOTHER_OFFICER = "anand.krishnaswamy@kestrelmoor.example";

test.describe.serial("who may use the audit and finding routes", () => {
  let audit: AuditRow;
  let colFinding: FindingRow; // an open Columbus finding that names no technician of this test
  let denFinding: FindingRow;
  let techFinding: FindingRow; // a finding naming the Columbus technician
  let branches: { id: number; name: string }[];
  const ctx: Record<string, APIRequestContext> = {};

  async function as(browser: Browser, key: string, email: string) {
    ctx[key] = (await contextAs(browser, email)).request;
  }

  test.beforeAll(async ({ browser }) => {
    await as(browser, "officer", DEMO.officer);
    await as(browser, "managerCol", DEMO.managerColumbus);
    await as(browser, "managerTuc", DEMO.managerTucson);
    await as(browser, "tech", DEMO.technicianColumbus);
    await as(browser, "inspector", DEMO.inspector);
    await as(browser, "otherManager", DEMO.otherOrgManager);
    await as(browser, "otherOwner", OTHER_ORG_OWNER);
    await as(browser, "officer2", ANOTHER_OFFICER);
    branches = ((await (await ctx.officer!.get("/api/lookup/branches")).json()) as { rows: { id: number; name: string }[] }).rows;
    audit = await runAuditApi(ctx.officer!);
    const all = await allFindings(ctx.officer!, { auditId: audit.id });
    colFinding = all.find((f) => f.branchName === "Columbus" && f.state === "open" && f.ruleId === "CT-DISP-01")!;
    denFinding = all.find((f) => f.branchName === "Denver" && f.state === "open")!;
    const marcus = all.filter((f) => f.technicianName === "Marcus Delacroix-Byrd");
    techFinding = marcus[0]!;
    expect(colFinding && denFinding && techFinding).toBeTruthy();
  });

  test("nobody signed in gets 401 on every route", async ({ request }) => {
    for (const [method, path] of [
      ["get", "/api/audits"],
      ["post", "/api/audits"],
      ["get", `/api/audits/${audit.id}`],
      ["get", `/api/audits/${audit.id}/export`],
      ["post", `/api/audits/${audit.id}/rerun`],
      ["get", "/api/findings"],
      ["get", `/api/findings/${colFinding.id}`],
      ["post", "/api/findings/assign"],
      ["post", `/api/findings/${colFinding.id}/propose-fix`],
      ["post", `/api/findings/${colFinding.id}/accept`],
      ["post", `/api/findings/${colFinding.id}/reopen`],
      ["post", `/api/findings/${colFinding.id}/waive`],
      ["post", `/api/findings/${colFinding.id}/comments`],
      ["post", `/api/findings/${colFinding.id}/evidence`],
      ["get", "/api/saved-views"],
      ["get", "/api/dashboard/overview"],
      ["get", `/api/dashboard/branches/${colFinding.branchId}`],
    ] as const) {
      const res = method === "get" ? await request.get(path) : await request.post(path, { data: {} });
      expect(res.status(), `${method} ${path}`).toBe(401);
    }
  });

  test("audits: only the compliance officer runs them; others read what their branches allow; another organisation sees none", async () => {
    const body = { branchIds: branches.map((b) => b.id), periodFrom: "2026-01-01", periodTo: todayUtc(), packs: ["us_federal"] };
    for (const key of ["managerCol", "tech", "inspector", "otherManager"]) {
      expect((await ctx[key]!.post("/api/audits", { data: body })).status(), `${key} starts an audit`).toBe(403);
      expect((await ctx[key]!.post(`/api/audits/${audit.id}/rerun`)).status(), `${key} re-runs`).toBe(403);
    }
    // Bad input names the field and writes nothing.
    const before = ((await (await ctx.officer!.get("/api/audits?pageSize=1")).json()) as { total: number }).total;
    const bad = await ctx.officer!.post("/api/audits", { data: { ...body, periodFrom: todayUtc(), periodTo: "2026-01-01" } });
    expect(bad.status()).toBe(400);
    expect(((await bad.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.periodTo).toEqual([
      "The period must end on or after its first day",
    ]);
    const noPacks = await ctx.officer!.post("/api/audits", { data: { ...body, packs: [] } });
    expect(((await noPacks.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.packs).toEqual([
      "Choose at least one rule pack",
    ]);
    const after = ((await (await ctx.officer!.get("/api/audits?pageSize=1")).json()) as { total: number }).total;
    expect(after).toBe(before);

    // Reading: the Columbus manager sees the audit, summarised for Columbus only.
    const asManager = (await (await ctx.managerCol!.get(`/api/audits/${audit.id}`)).json()) as {
      summary: { branches: { branchName: string }[] };
      partial: boolean;
    };
    expect(asManager.summary.branches.map((b) => b.branchName)).toEqual(["Columbus"]);
    expect(asManager.partial).toBe(true);
    const asInspector = (await (await ctx.inspector!.get(`/api/audits/${audit.id}`)).json()) as {
      summary: { branches: { branchName: string }[] };
    };
    expect(asInspector.summary.branches.map((b) => b.branchName)).toEqual(["Denver"]);
    expect((await ctx.tech!.get(`/api/audits/${audit.id}`)).status()).toBe(403);
    expect((await ctx.otherManager!.get(`/api/audits/${audit.id}`)).status()).toBe(404);
    expect((await ctx.otherOwner!.get(`/api/audits/${audit.id}`)).status()).toBe(404);
    expect((await ctx.otherOwner!.post(`/api/audits/${audit.id}/rerun`)).status()).toBe(404);
    const otherList = (await (await ctx.otherManager!.get("/api/audits")).json()) as { rows: { id: number }[] };
    expect(otherList.rows.map((r) => r.id)).not.toContain(audit.id);

    // Export: a technician may not; another organisation finds nothing; the manager's workbook holds Columbus only.
    expect((await ctx.tech!.get(`/api/audits/${audit.id}/export`)).status()).toBe(403);
    expect((await ctx.otherOwner!.get(`/api/audits/${audit.id}/export`)).status()).toBe(404);
    const managerExport = await ctx.managerCol!.get(`/api/audits/${audit.id}/export`);
    expect(managerExport.status()).toBe(200);
    expect(managerExport.headers()["content-type"]).toContain("spreadsheetml");
    const { default: ExcelJS } = await import("exceljs");
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load((await managerExport.body()) as unknown as ArrayBuffer);
    const branchesInFindings = new Set<string>();
    wb.getWorksheet("Findings")!.eachRow((row, n) => {
      if (n > 1) branchesInFindings.add(String(row.getCell(2).value));
    });
    expect([...branchesInFindings]).toEqual(["Columbus"]);
    const jobBranches = new Set<string>();
    wb.getWorksheet("Jobs")!.eachRow((row, n) => {
      if (n > 1) jobBranches.add(String(row.getCell(3).value));
    });
    expect([...jobBranches]).toEqual(["Columbus"]);
  });

  test("findings lists: a manager sees their branch, a technician the findings naming them, the inspector the granted branch, another organisation nothing", async () => {
    const col = await allFindings(ctx.managerCol!);
    expect(col.length).toBeGreaterThan(0);
    expect(new Set(col.map((f) => f.branchName))).toEqual(new Set(["Columbus"]));
    const tech = await allFindings(ctx.tech!);
    expect(tech.length).toBeGreaterThan(0);
    expect(new Set(tech.map((f) => f.technicianName))).toEqual(new Set(["Marcus Delacroix-Byrd"]));
    // The inspector's grant covers Denver's records of 2025 (demo data); this audit's findings are about
    // 2026 events, so Denver has findings the inspector does not see: none outside the window is listed.
    const denverFindings = (await allFindings(ctx.officer!)).filter((f) => f.branchName === "Denver");
    expect(denverFindings.length).toBeGreaterThan(0);
    const insp = await allFindings(ctx.inspector!);
    expect(insp.every((f) => f.branchName === "Denver")).toBe(true);
    expect(insp).toEqual([]);
    expect(await allFindings(ctx.otherManager!)).toEqual([]);
    // Filtering by another branch never widens the list.
    expect(await allFindings(ctx.managerCol!, { branchId: denFinding.branchId })).toEqual([]);
  });

  test("one finding: readable only within the permission; 404 otherwise", async () => {
    expect((await ctx.officer!.get(`/api/findings/${colFinding.id}`)).status()).toBe(200);
    expect((await ctx.managerCol!.get(`/api/findings/${colFinding.id}`)).status()).toBe(200);
    expect((await ctx.managerTuc!.get(`/api/findings/${colFinding.id}`)).status()).toBe(404);
    expect((await ctx.inspector!.get(`/api/findings/${colFinding.id}`)).status()).toBe(404);
    // A Denver finding about a 2026 event lies outside the inspector's window (records of 2025): not found.
    expect((await ctx.inspector!.get(`/api/findings/${denFinding.id}`)).status()).toBe(404);
    expect((await ctx.tech!.get(`/api/findings/${techFinding.id}`)).status()).toBe(200);
    expect((await ctx.tech!.get(`/api/findings/${denFinding.id}`)).status()).toBe(404);
    expect((await ctx.otherManager!.get(`/api/findings/${colFinding.id}`)).status()).toBe(404);
    expect((await ctx.otherOwner!.get(`/api/findings/${colFinding.id}/evidence/1`)).status()).toBe(404);
    const asManager = (await (await ctx.managerCol!.get(`/api/findings/${colFinding.id}`)).json()) as { allowed: Record<string, boolean> };
    expect(asManager.allowed).toEqual({ assign: false, proposeFix: true, accept: false, reopen: false, waive: false, comment: true });
  });

  test("finding writes: each role only what it may, on its own branch; nothing changes on a refusal", async () => {
    const colManagerId = (await (await ctx.officer!.get(`/api/findings/assignees?branchIds=${colFinding.branchId}`)).json()) as {
      rows: { id: number; name: string }[];
    };
    const grant = colManagerId.rows.find((r) => r.name === "Grant Oyelaran")!;
    for (const key of ["managerCol", "managerTuc", "tech", "inspector"]) {
      expect(
        (await ctx[key]!.post("/api/findings/assign", { data: { findingIds: [colFinding.id], assigneeId: grant.id } })).status(),
        `${key} assigns`,
      ).toBe(403);
      expect((await ctx[key]!.get("/api/findings/assignees")).status(), `${key} lists assignees`).toBe(403);
      for (const action of ["accept", "reopen", "waive"]) {
        expect(
          (
            await ctx[key]!.post(`/api/findings/${colFinding.id}/${action}`, { data: { reason: "Because I say so, at length", note: "x" } })
          ).status(),
          `${key} ${action}`,
        ).toBe(403);
      }
    }
    expect(
      (await ctx.otherOwner!.post("/api/findings/assign", { data: { findingIds: [colFinding.id], assigneeId: grant.id } })).status(),
    ).toBe(404);
    expect((await ctx.officer!.post("/api/findings/assign", { data: { findingIds: [colFinding.id], assigneeId: 999999 } })).status()).toBe(
      400,
    );

    // Proposing a fix: the own branch's manager only.
    expect((await ctx.tech!.post(`/api/findings/${techFinding.id}/propose-fix`, { data: { note: "Fixed it myself" } })).status()).toBe(403);
    expect((await ctx.inspector!.post(`/api/findings/${denFinding.id}/propose-fix`, { data: { note: "Looks fixed" } })).status()).toBe(403);
    expect((await ctx.managerTuc!.post(`/api/findings/${colFinding.id}/propose-fix`, { data: { note: "Not my branch" } })).status()).toBe(
      404,
    );
    expect(
      (await ctx.otherManager!.post(`/api/findings/${colFinding.id}/propose-fix`, { data: { note: "Not my company" } })).status(),
    ).toBe(404);
    const short = await ctx.managerCol!.post(`/api/findings/${colFinding.id}/propose-fix`, { data: { note: "ok" } });
    expect(short.status()).toBe(400);
    expect(((await short.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.note?.[0]).toContain(
      "at least 5 characters",
    );
    const path = await ctx.managerCol!.post(`/api/findings/${colFinding.id}/evidence`, {
      multipart: { file: { name: "../../etc/passwd.png", mimeType: "image/png", buffer: Buffer.from("not really") } },
    });
    expect(path.status()).toBe(400);
    const fake = await ctx.managerCol!.post(`/api/findings/${colFinding.id}/evidence`, {
      multipart: { file: { name: "photo.png", mimeType: "image/png", buffer: Buffer.from("MZ this is a program, not a photo") } },
    });
    expect(fake.status()).toBe(400);
    expect(((await fake.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.file?.[0]).toContain(
      "Only photos",
    );
    const unchanged = (await (await ctx.officer!.get(`/api/findings/${colFinding.id}`)).json()) as { state: string; evidence: unknown[] };
    expect(unchanged.state).toBe("open");
    expect(unchanged.evidence).toEqual([]);

    // Waiving needs a reason; the officer's own words name the field.
    const noReason = await ctx.officer!.post(`/api/findings/${colFinding.id}/waive`, { data: { reason: "" } });
    expect(noReason.status()).toBe(400);
    expect(((await noReason.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.reason).toBeTruthy();
    // Accepting before a fix is proposed is refused in words.
    const early = await ctx.officer!.post(`/api/findings/${colFinding.id}/accept`, { data: {} });
    expect(early.status()).toBe(409);

    // Comments: inspectors only read; a technician comments on findings naming them only.
    expect((await ctx.inspector!.post(`/api/findings/${denFinding.id}/comments`, { data: { body: "Noted" } })).status()).toBe(403);
    expect(
      (await ctx.tech!.post(`/api/findings/${techFinding.id}/comments`, { data: { body: "I will fix this on Monday" } })).status(),
    ).toBe(201);
    expect((await ctx.tech!.post(`/api/findings/${colFinding.id}/comments`, { data: { body: "Hello" } })).status()).toBe(404);
  });

  test("saved views belong to one person; dashboards follow the branch permission", async () => {
    const saved = await ctx.officer!.post("/api/saved-views", {
      data: { name: "Overdue criticals", query: { state: "active", severity: "critical", due: "overdue", sort: "due", dir: "asc" } },
    });
    expect(saved.status()).toBe(201);
    const view = (await saved.json()) as { id: number };
    expect(
      ((await (await ctx.officer2!.get("/api/saved-views")).json()) as { rows: { id: number }[] }).rows.map((r) => r.id),
    ).not.toContain(view.id);
    expect((await ctx.officer2!.delete(`/api/saved-views/${view.id}`)).status()).toBe(404);
    expect((await ctx.otherManager!.delete(`/api/saved-views/${view.id}`)).status()).toBe(404);
    const badView = await ctx.officer!.post("/api/saved-views", { data: { name: "", query: {} } });
    expect(badView.status()).toBe(400);
    expect((await ctx.officer!.delete(`/api/saved-views/${view.id}`)).status()).toBe(200);

    const colId = colFinding.branchId;
    const denId = denFinding.branchId;
    expect((await ctx.officer!.get(`/api/dashboard/branches/${colId}`)).status()).toBe(200);
    expect((await ctx.managerCol!.get(`/api/dashboard/branches/${colId}`)).status()).toBe(200);
    expect((await ctx.managerTuc!.get(`/api/dashboard/branches/${colId}`)).status()).toBe(404);
    expect((await ctx.tech!.get(`/api/dashboard/branches/${colId}`)).status()).toBe(404);
    expect((await ctx.inspector!.get(`/api/dashboard/branches/${colId}`)).status()).toBe(404);
    const insp = (await (await ctx.inspector!.get(`/api/dashboard/branches/${denId}`)).json()) as {
      leakWatchlist: unknown;
      flows: { month: string; recoveredG: number }[];
    };
    expect(insp.leakWatchlist).toBeNull();
    // The inspector's window is calendar 2025: no refrigerant of a later month reaches them.
    expect(insp.flows.filter((f) => f.month > "2025-12").every((f) => f.recoveredG === 0)).toBe(true);
    expect((await ctx.otherManager!.get(`/api/dashboard/branches/${colId}`)).status()).toBe(404);
    const overview = (await (await ctx.managerCol!.get("/api/dashboard/overview")).json()) as { branches: { name: string }[] };
    expect(overview.branches.map((b) => b.name)).toEqual(["Columbus"]);
    const techOverview = (await (await ctx.tech!.get("/api/dashboard/overview")).json()) as { branches: unknown[] };
    expect(techOverview.branches).toEqual([]);
  });
});
