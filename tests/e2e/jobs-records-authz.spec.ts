import type { APIRequestContext, Browser } from "@playwright/test";
import { DEMO, contextAs, expect, test } from "./fixtures";
import { JOBS_DEMO } from "./demo-data";

/**
 * The routes of job corrections, disposals, reclaim shipments and purchases, role by role: own
 * branch / other branch / other organisation. Denied single records answer 404 (or 403 when the
 * role may not do that at all), and lists leak no rows.
 */

interface Branch {
  id: number;
  name: string;
}
interface Row {
  id: number;
  branchId: number;
  branchName: string;
}

async function as(browser: Browser, email: string) {
  const ctx = await contextAs(browser, email);
  return { ctx, api: ctx.request };
}
async function listAll(api: APIRequestContext, path: string): Promise<{ status: number; rows: Row[]; total: number }> {
  const res = await api.get(`${path}${path.includes("?") ? "&" : "?"}pageSize=200`);
  if (res.status() !== 200) return { status: res.status(), rows: [], total: 0 };
  const body = (await res.json()) as { rows: Row[]; total: number };
  return { status: 200, rows: body.rows, total: body.total };
}

const LISTS = ["/api/disposals?type=record", "/api/disposals?type=statement", "/api/shipments", "/api/purchases"] as const;

test.describe("record routes: who may read and write what", () => {
  let branches: Record<string, number>;
  let ids: {
    colShipment: number;
    tucShipment: number;
    otherOrgShipment: number | null;
    colPurchase: number;
    tucPurchase: number;
    colRecord: number;
    tucRecord: number;
  };

  test.beforeAll(async ({ browser }) => {
    const owner = await as(browser, DEMO.owner);
    branches = Object.fromEntries(
      ((await (await owner.api.get("/api/lookup/branches")).json()) as { rows: Branch[] }).rows.map((b) => [b.name, b.id]),
    );
    const first = async (path: string, branch: string) => {
      const { rows } = await listAll(owner.api, `${path}${path.includes("?") ? "&" : "?"}branchId=${branches[branch]}`);
      expect(rows.length, `${path} in ${branch}`).toBeGreaterThan(0);
      return rows[0]!.id;
    };
    const other = await as(browser, DEMO.otherOrgManager);
    const otherShipments = await listAll(other.api, "/api/shipments");
    ids = {
      colShipment: await first("/api/shipments", "Columbus"),
      tucShipment: await first("/api/shipments", "Tucson"),
      otherOrgShipment: otherShipments.rows[0]?.id ?? null,
      colPurchase: await first("/api/purchases", "Columbus"),
      tucPurchase: await first("/api/purchases", "Tucson"),
      colRecord: await first("/api/disposals?type=record", "Columbus"),
      tucRecord: await first("/api/disposals?type=record", "Tucson"),
    };
    await Promise.all([owner.ctx.close(), other.ctx.close()]);
  });

  const cases: Array<{
    who: keyof typeof DEMO;
    lists: Record<(typeof LISTS)[number], "own_branch" | "org" | "granted" | "other_org" | 403>;
  }> = [
    {
      who: "technicianColumbus",
      lists: {
        "/api/disposals?type=record": "own_branch",
        "/api/disposals?type=statement": "own_branch",
        "/api/shipments": 403,
        "/api/purchases": 403,
      },
    },
    {
      who: "managerColumbus",
      lists: {
        "/api/disposals?type=record": "own_branch",
        "/api/disposals?type=statement": "own_branch",
        "/api/shipments": "own_branch",
        "/api/purchases": "own_branch",
      },
    },
    {
      who: "officer",
      lists: {
        "/api/disposals?type=record": "org",
        "/api/disposals?type=statement": "org",
        "/api/shipments": "org",
        "/api/purchases": "org",
      },
    },
    {
      who: "inspector",
      lists: {
        "/api/disposals?type=record": "granted",
        "/api/disposals?type=statement": "granted",
        "/api/shipments": "granted",
        "/api/purchases": "granted",
      },
    },
    {
      who: "otherOrgManager",
      lists: {
        "/api/disposals?type=record": "other_org",
        "/api/disposals?type=statement": "other_org",
        "/api/shipments": "other_org",
        "/api/purchases": "other_org",
      },
    },
  ];

  for (const c of cases) {
    test(`${c.who}: record lists hold only what the role may read`, async ({ browser }) => {
      const { ctx, api } = await as(browser, DEMO[c.who] as string);
      for (const path of LISTS) {
        const expected = c.lists[path];
        const page = await listAll(api, path);
        if (expected === 403) {
          expect(page.status, `${c.who} ${path}`).toBe(403);
          continue;
        }
        expect(page.status).toBe(200);
        const names = new Set(page.rows.map((r) => r.branchName));
        if (expected === "own_branch")
          expect(
            [...names].every((n) => n === "Columbus"),
            `${c.who} ${path}: ${[...names].join(", ")}`,
          ).toBe(true);
        if (expected === "granted")
          expect(
            [...names].every((n) => n === DEMO.inspectorGrant.branch),
            `${c.who} ${path}`,
          ).toBe(true);
        if (expected === "other_org")
          expect(
            [...names].every((n) => !(n in branches)),
            `${c.who} ${path}`,
          ).toBe(true);
        if (expected === "org") expect([...names].every((n) => n in branches)).toBe(true);
        // Asking for another branch by filter cannot widen the list.
        if (expected === "own_branch" || expected === "granted" || expected === "other_org") {
          expect(
            (await listAll(api, `${path}${path.includes("?") ? "&" : "?"}branchId=${branches.Tucson}`)).total,
            `${c.who} ${path} Tucson filter`,
          ).toBe(0);
        }
      }
      await ctx.close();
    });
  }

  const reads: Array<{ who: keyof typeof DEMO; allowed: (keyof typeof ids)[]; denied: (keyof typeof ids)[] }> = [
    {
      who: "managerColumbus",
      allowed: ["colShipment", "colPurchase", "colRecord"],
      denied: ["tucShipment", "tucPurchase", "tucRecord", "otherOrgShipment"],
    },
    {
      who: "officer",
      allowed: ["colShipment", "tucShipment", "colPurchase", "tucPurchase", "colRecord", "tucRecord"],
      denied: ["otherOrgShipment"],
    },
    { who: "technicianColumbus", allowed: ["colRecord"], denied: ["tucRecord"] },
    { who: "otherOrgManager", allowed: [], denied: ["colShipment", "tucShipment", "colPurchase", "colRecord"] },
  ];
  const url = (k: keyof typeof ids, id: number) =>
    k.endsWith("Shipment") ? `/api/shipments/${id}` : k.endsWith("Purchase") ? `/api/purchases/${id}` : `/api/disposals/records/${id}`;

  for (const c of reads) {
    test(`${c.who}: single records answer only where the role reads`, async ({ browser }) => {
      const { ctx, api } = await as(browser, DEMO[c.who] as string);
      for (const k of c.allowed) expect((await api.get(url(k, ids[k]!))).status(), `${c.who} reads ${k}`).toBe(200);
      for (const k of c.denied) {
        if (ids[k] === null) continue;
        expect([403, 404], `${c.who} must not read ${k}`).toContain((await api.get(url(k, ids[k]))).status());
      }
      await ctx.close();
    });
  }

  test("purchases and shipments: only managers of the branch (and the owner) write; a test write is voided again", async ({ browser }) => {
    const body = (branchId: number) => ({
      branchId,
      purchasedOn: "2026-11-20",
      supplierName: "Invented Gas Supply",
      refrigerant: "R-410A",
      amount: 1,
      unit: "lb",
    });
    const tech = await as(browser, DEMO.technicianColumbus);
    expect((await tech.api.post("/api/purchases", { data: body(branches.Columbus!) })).status()).toBe(403);
    expect(
      (
        await tech.api.post("/api/shipments", {
          data: { branchId: branches.Columbus, shippedOn: "2026-11-20", reclaimerName: "X", cylinderIds: [1] },
        })
      ).status(),
    ).toBe(403);
    const officer = await as(browser, DEMO.officer);
    expect((await officer.api.post("/api/purchases", { data: body(branches.Columbus!) })).status()).toBe(403);
    const inspector = await as(browser, DEMO.inspector);
    expect((await inspector.api.post("/api/purchases", { data: body(branches.Denver!) })).status()).toBe(403);
    const manager = await as(browser, DEMO.managerColumbus);
    expect((await manager.api.post("/api/purchases", { data: body(branches.Tucson!) })).status()).toBe(403);
    const other = await as(browser, DEMO.otherOrgManager);
    expect((await other.api.post("/api/purchases", { data: body(branches.Columbus!) })).status()).toBe(403);

    const created = await manager.api.post("/api/purchases", { data: body(branches.Columbus!) });
    expect(created.status()).toBe(201);
    const { id } = (await created.json()) as { id: number };
    expect((await manager.api.patch(`/api/purchases/${id}`, { data: { reason: "", changes: { supplierName: "Y" } } })).status()).toBe(400);
    expect(
      (
        await manager.api.patch(`/api/purchases/${id}`, {
          data: { reason: "Invoice shows the full supplier name", changes: { supplierName: "Invented Gas Supply Co" } },
        })
      ).status(),
    ).toBe(200);
    expect((await other.api.post(`/api/purchases/${id}/void`, { data: { reason: "not mine" } })).status()).toBe(404);
    expect((await manager.api.post(`/api/purchases/${id}/void`, { data: { reason: "Test entry, voided" } })).status()).toBe(200);
    const voided = (await (await manager.api.get(`/api/purchases/${id}`)).json()) as { voidedAt: string | null; amendments: unknown[] };
    expect(voided.voidedAt).toBeTruthy();
    expect(voided.amendments).toHaveLength(1);
    expect((await listAll(manager.api, "/api/purchases")).rows.some((r) => r.id === id)).toBe(false);
    await Promise.all([tech.ctx.close(), officer.ctx.close(), inspector.ctx.close(), manager.ctx.close(), other.ctx.close()]);
  });

  test("job corrections and voids: the job's technician and the branch manager, nobody else", async ({ browser }) => {
    const tech = await as(browser, DEMO.technicianColumbus);
    const rack = (
      (await (await tech.api.get(`/api/lookup/appliances?limit=5&q=${JOBS_DEMO.chargeAppliance}`)).json()) as {
        rows: { id: number; tag: string }[];
      }
    ).rows.find((a) => a.tag === JOBS_DEMO.chargeAppliance)!;
    const created = await tech.api.post("/api/jobs", {
      data: {
        kind: "leak_repair",
        applianceId: rack.id,
        performedOn: "2026-11-29",
        leakLocation: "Suction line clamp",
        repairDescription: "Replaced the clamp insulator",
      },
    });
    expect(created.status(), await created.text()).toBe(201);
    const { id } = (await created.json()) as { id: number };
    const amend = (api: APIRequestContext, reason = "Clearer wording") =>
      api.patch(`/api/jobs/${id}`, { data: { reason, changes: { leakLocation: `Suction line clamp (${reason})` } } });

    expect((await amend(tech.api, "Technician's own correction")).status()).toBe(200);
    const manager = await as(browser, DEMO.managerColumbus);
    expect((await amend(manager.api, "Manager's correction")).status()).toBe(200);
    const tucson = await as(browser, DEMO.managerTucson);
    expect((await amend(tucson.api)).status()).toBe(404);
    const officer = await as(browser, DEMO.officer);
    expect((await amend(officer.api)).status()).toBe(403);
    const inspector = await as(browser, DEMO.inspector);
    expect((await amend(inspector.api)).status()).toBe(403);
    const other = await as(browser, DEMO.otherOrgManager);
    expect((await amend(other.api)).status()).toBe(404);

    // A colleague's job is not the technician's to correct (nor to see).
    const colleague = (await listAll(manager.api, `/api/jobs?branchId=${branches.Columbus}`)).rows.find(
      (r) => (r as unknown as { technicianName: string }).technicianName !== "Marcus Delacroix-Byrd",
    )!;
    expect((await tech.api.patch(`/api/jobs/${colleague.id}`, { data: { reason: "Not mine", changes: { notes: "x" } } })).status()).toBe(
      404,
    );
    expect((await tech.api.post(`/api/jobs/${colleague.id}/void`, { data: { reason: "Not mine" } })).status()).toBe(404);

    const detail = (await (await tech.api.get(`/api/jobs/${id}`)).json()) as { amendments: { reason: string; actorName: string }[] };
    expect(detail.amendments.map((a) => a.actorName)).toEqual(["Marcus Delacroix-Byrd", "Grant Oyelaran"]);

    expect((await officer.api.post(`/api/jobs/${id}/void`, { data: { reason: "Officer cannot" } })).status()).toBe(403);
    expect((await tech.api.post(`/api/jobs/${id}/void`, { data: { reason: "" } })).status()).toBe(400);
    expect((await tech.api.post(`/api/jobs/${id}/void`, { data: { reason: "Logged twice by mistake" } })).status()).toBe(200);
    expect((await listAll(tech.api, "/api/jobs?kind=leak_repair")).rows.some((r) => r.id === id)).toBe(false);
    expect((await listAll(tech.api, "/api/jobs?kind=leak_repair&voided=only")).rows.some((r) => r.id === id)).toBe(true);
    await Promise.all([
      tech.ctx.close(),
      manager.ctx.close(),
      tucson.ctx.close(),
      officer.ctx.close(),
      inspector.ctx.close(),
      other.ctx.close(),
    ]);
  });
});
