import type { APIRequestContext, Browser } from "@playwright/test";
import { DEMO, contextAs, expect, test } from "./fixtures";

/**
 * The job routes, role by role: own branch / other branch / other organisation. Denied single
 * records answer 404 (no hint that they exist), denied writes 403, and lists leak no rows.
 */

interface JobRow {
  id: number;
  branchId: number;
  branchName: string;
  technicianId: number;
  technicianName: string;
  performedOn: string;
}
interface Page {
  rows: JobRow[];
  total: number;
}
interface Branch {
  id: number;
  name: string;
}

async function as(browser: Browser, email: string) {
  const ctx = await contextAs(browser, email);
  return { ctx, api: ctx.request };
}
async function list(api: APIRequestContext, qs = ""): Promise<Page> {
  const res = await api.get(`/api/jobs?pageSize=200${qs}`);
  expect(res.status()).toBe(200);
  return (await res.json()) as Page;
}
async function firstJob(api: APIRequestContext, qs: string): Promise<JobRow> {
  const page = await list(api, qs);
  expect(page.rows.length, `a job for ${qs}`).toBeGreaterThan(0);
  return page.rows[0]!;
}
async function createBody(api: APIRequestContext, branchId: number, applianceId?: number) {
  const cyl = (await (await api.get(`/api/lookup/cylinders?branchId=${branchId}`)).json()) as { rows: { id: number }[] };
  const eq = (await (await api.get(`/api/lookup/equipment?branchId=${branchId}`)).json()) as { rows: { id: number }[] };
  return {
    kind: "recovery",
    applianceId,
    performedOn: "2026-11-28",
    refrigerant: "R-410A",
    recoveredAmount: 1.5,
    recoveredUnit: "lb",
    cylinderId: cyl.rows[0]?.id ?? 1,
    equipmentId: eq.rows[0]?.id ?? 1,
    evacuationValue: 0,
    evacuationUnit: "psig",
    accessMethod: "service_valve",
  };
}

test.describe("job routes: who may read and write what", () => {
  let branches: Record<string, number>;
  let columbusJob: JobRow;
  let columbusJobOfAnotherTech: JobRow;
  let tucsonJob: JobRow;
  let denver2025Job: JobRow;
  let denver2026Job: JobRow;
  let otherOrgJob: JobRow;
  let appliances: { columbus: number; tucson: number; otherOrg: number };

  test.beforeAll(async ({ browser }) => {
    const owner = await as(browser, DEMO.owner);
    const b = (await (await owner.api.get("/api/lookup/branches")).json()) as { rows: Branch[] };
    branches = Object.fromEntries(b.rows.map((r) => [r.name, r.id]));
    expect(Object.keys(branches)).toEqual(expect.arrayContaining(["Columbus", "Tucson", "Denver"]));

    const tech = await as(browser, DEMO.technicianColumbus);
    columbusJob = await firstJob(tech.api, "");
    const columbusAll = await list(owner.api, `&branchId=${branches.Columbus}`);
    columbusJobOfAnotherTech = columbusAll.rows.find((r) => r.technicianId !== columbusJob.technicianId)!;
    tucsonJob = await firstJob(owner.api, `&branchId=${branches.Tucson}`);
    denver2025Job = await firstJob(owner.api, `&branchId=${branches.Denver}&from=2025-03-01&to=2025-10-31`);
    denver2026Job = await firstJob(owner.api, `&branchId=${branches.Denver}&from=2026-02-01`);

    const other = await as(browser, DEMO.otherOrgManager);
    otherOrgJob = await firstJob(other.api, "");

    const look = async (api: APIRequestContext, branchId?: number) =>
      (
        (await (await api.get(`/api/lookup/appliances?limit=50${branchId ? `&branchId=${branchId}` : ""}`)).json()) as {
          rows: { id: number; category: string }[];
        }
      ).rows.find((a) => a.category !== "small_appliance")!.id;
    appliances = {
      columbus: await look(owner.api, branches.Columbus),
      tucson: await look(owner.api, branches.Tucson),
      otherOrg: await look(other.api),
    };
    await Promise.all([owner.ctx.close(), tech.ctx.close(), other.ctx.close()]);
  });

  const readCases: Array<{ who: keyof typeof DEMO; allowed: string[]; denied: string[] }> = [
    {
      who: "technicianColumbus",
      allowed: ["columbusJob"],
      denied: ["columbusJobOfAnotherTech", "tucsonJob", "denver2025Job", "otherOrgJob"],
    },
    { who: "managerColumbus", allowed: ["columbusJob", "columbusJobOfAnotherTech"], denied: ["tucsonJob", "denver2025Job", "otherOrgJob"] },
    { who: "officer", allowed: ["columbusJob", "tucsonJob", "denver2025Job", "denver2026Job"], denied: ["otherOrgJob"] },
    { who: "owner", allowed: ["columbusJob", "tucsonJob", "denver2025Job", "denver2026Job"], denied: ["otherOrgJob"] },
    { who: "inspector", allowed: ["denver2025Job"], denied: ["denver2026Job", "columbusJob", "tucsonJob", "otherOrgJob"] },
    { who: "otherOrgManager", allowed: ["otherOrgJob"], denied: ["columbusJob", "tucsonJob", "denver2025Job"] },
  ];

  for (const c of readCases) {
    test(`${c.who} reads only the jobs their role allows`, async ({ browser }) => {
      const jobs: Record<string, JobRow> = { columbusJob, columbusJobOfAnotherTech, tucsonJob, denver2025Job, denver2026Job, otherOrgJob };
      const { ctx, api } = await as(browser, DEMO[c.who] as string);
      for (const name of c.allowed) expect((await api.get(`/api/jobs/${jobs[name]!.id}`)).status(), `${c.who} reads ${name}`).toBe(200);
      for (const name of c.denied)
        expect((await api.get(`/api/jobs/${jobs[name]!.id}`)).status(), `${c.who} must not read ${name}`).toBe(404);

      // The list leaks nothing: every row is one this person may read.
      const page = await list(api);
      expect(page.total).toBeGreaterThan(0);
      const ids = new Set(page.rows.map((r) => r.id));
      for (const name of c.denied) expect(ids.has(jobs[name]!.id), `${name} not listed for ${c.who}`).toBe(false);
      for (const row of page.rows) {
        if (c.who === "technicianColumbus") expect(row.technicianId).toBe(columbusJob.technicianId);
        if (c.who === "managerColumbus") expect(row.branchName).toBe("Columbus");
        if (c.who === "inspector") {
          expect(row.branchName).toBe(DEMO.inspectorGrant.branch);
          expect(row.performedOn >= DEMO.inspectorGrant.from && row.performedOn <= DEMO.inspectorGrant.to).toBe(true);
        }
      }
      // Asking for another branch by filter cannot widen the list.
      if (c.who === "managerColumbus" || c.who === "technicianColumbus" || c.who === "inspector") {
        expect((await list(api, `&branchId=${branches.Tucson}`)).total).toBe(0);
      }
      await ctx.close();
    });
  }

  const writeCases: Array<{ who: keyof typeof DEMO; own: number; otherBranch: number; otherOrg: number }> = [
    { who: "technicianColumbus", own: 201, otherBranch: 403, otherOrg: 400 },
    { who: "managerColumbus", own: 201, otherBranch: 403, otherOrg: 400 },
    { who: "officer", own: 403, otherBranch: 403, otherOrg: 403 },
    { who: "owner", own: 201, otherBranch: 201, otherOrg: 400 },
    { who: "inspector", own: 403, otherBranch: 403, otherOrg: 403 },
  ];

  for (const c of writeCases) {
    test(`${c.who} may log jobs only where their role allows`, async ({ browser }) => {
      const { ctx, api } = await as(browser, DEMO[c.who] as string);
      const owner = await as(browser, DEMO.owner);
      const before = (await list(owner.api, "&pageSize=1")).total;

      const post = async (applianceId: number, branchId: number) =>
        api.post("/api/jobs", {
          data: await createBody(
            c.who === "technicianColumbus" || c.who === "managerColumbus" ? (branchId === branches.Columbus ? api : owner.api) : owner.api,
            branchId,
            applianceId,
          ),
        });

      const createdIds: number[] = [];
      const own = await post(appliances.columbus, branches.Columbus);
      expect(own.status(), `${c.who} logs a Columbus job`).toBe(c.own);
      if (own.status() === 201) createdIds.push(((await own.json()) as { id: number }).id);
      const other = await post(appliances.tucson, branches.Tucson);
      expect(other.status(), `${c.who} logs a Tucson job`).toBe(c.otherBranch);
      if (other.status() === 201) createdIds.push(((await other.json()) as { id: number }).id);
      const foreign = await post(appliances.otherOrg, branches.Columbus);
      expect(foreign.status(), `${c.who} logs a job on another organisation's appliance`).toBe(c.otherOrg);

      expect((await list(owner.api, "&pageSize=1")).total).toBe(before + createdIds.length);
      // These entries only prove who may write: void them so they never count in an audit of the demo data.
      for (const id of createdIds) {
        expect((await owner.api.post(`/api/jobs/${id}/void`, { data: { reason: "Permission test entry, not real work" } })).status()).toBe(
          200,
        );
      }
      expect((await list(owner.api, "&pageSize=1")).total).toBe(before);
      await Promise.all([ctx.close(), owner.ctx.close()]);
    });
  }
});
