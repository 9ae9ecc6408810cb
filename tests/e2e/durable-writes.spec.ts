import { DEMO, contextAs, expect, snap, test } from "./fixtures";

/**
 * Durable writes in the running app: a job posted twice with one Idempotency-Key (a retry after a lost
 * answer) is saved once and the retry gets the first answer; the background work page is the owner's.
 */

test("a job posted twice with one key is saved once; the retry gets the first answer", async ({ browser }) => {
  const tech = await contextAs(browser, DEMO.technicianColumbus);
  const owner = await contextAs(browser, DEMO.owner);
  const branches = (await (await tech.request.get("/api/lookup/branches")).json()) as { rows: { id: number; name: string }[] };
  const columbus = branches.rows.find((b) => b.name === "Columbus")!.id;
  const appliance = (
    (await (await tech.request.get(`/api/lookup/appliances?limit=50&branchId=${columbus}`)).json()) as {
      rows: { id: number; category: string }[];
    }
  ).rows.find((a) => a.category !== "small_appliance")!.id;
  const cyl = (await (await tech.request.get(`/api/lookup/cylinders?branchId=${columbus}`)).json()) as { rows: { id: number }[] };
  const eq = (await (await tech.request.get(`/api/lookup/equipment?branchId=${columbus}`)).json()) as { rows: { id: number }[] };
  const body = {
    kind: "recovery",
    applianceId: appliance,
    performedOn: "2026-11-28",
    refrigerant: "R-410A",
    recoveredAmount: 1.5,
    recoveredUnit: "lb",
    cylinderId: cyl.rows[0]!.id,
    equipmentId: eq.rows[0]!.id,
    evacuationValue: 0,
    evacuationUnit: "psig",
    accessMethod: "service_valve",
  };
  const total = async () => ((await (await owner.request.get("/api/jobs?pageSize=1")).json()) as { total: number }).total;
  const before = await total();
  const headers = { "Idempotency-Key": `e2e-${Date.now()}-job-form` };
  const first = await tech.request.post("/api/jobs", { data: body, headers });
  expect(first.status()).toBe(201);
  const retry = await tech.request.post("/api/jobs", { data: body, headers });
  expect(retry.status()).toBe(201);
  expect(retry.headers()["idempotency-replayed"]).toBe("true");
  const { id } = (await first.json()) as { id: number };
  expect(((await retry.json()) as { id: number }).id).toBe(id);
  expect(await total()).toBe(before + 1);
  const changed = await tech.request.post("/api/jobs", { data: { ...body, performedOn: "2026-11-27" }, headers });
  expect(changed.status()).toBe(422);
  expect(await total()).toBe(before + 1);
  // Only proves the write path: voided so it never counts in an audit of the demo data.
  expect((await owner.request.post(`/api/jobs/${id}/void`, { data: { reason: "Idempotency test entry, not real work" } })).status()).toBe(
    200,
  );
  await Promise.all([tech.close(), owner.close()]);
});

test("the owner sees the background work; the compliance officer may not", async ({ browser }) => {
  const owner = await contextAs(browser, DEMO.owner);
  const page = await owner.newPage();
  await page.goto("/admin/background");
  await expect(page.getByRole("heading", { level: 1, name: "Background work" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "E-mail not delivered yet" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Failed" })).toBeVisible();
  await expect(page.getByRole("definition").first()).toBeVisible();
  await snap(page, "admin-background-owner");

  const officer = await contextAs(browser, DEMO.officer);
  const officerPage = await officer.newPage();
  await officerPage.goto("/admin/background");
  await expect(officerPage.getByText("Not available to you")).toBeVisible();
  expect((await officer.request.post("/api/admin/background/1/retry")).status()).toBe(403);
  await Promise.all([owner.close(), officer.close()]);
});
