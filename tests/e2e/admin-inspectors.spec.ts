import type { APIRequestContext, BrowserContext } from "@playwright/test";
import { DEMO, contextAs, expect, mailTo, snap, test } from "./fixtures";

/**
 * The compliance officer gives a new inspector read access to Peoria's records of the first half of
 * 2025; the inspector accepts the e-mailed invitation and reads exactly that. After the officer
 * withdraws the access, the same API requests and pages are refused. (Expiry: tests/authz/admin-scope.test.ts.)
 */

test.describe.configure({ mode: "serial" });

const stamp = Date.now().toString(36);
const inspector = { name: "Orla Brennick", email: `orla.brennick.${stamp}@cold-review.example`, password: "granite-manifold-63" };
const WINDOW = { from: "2025-01-01", to: "2025-06-30" };
const inDays = (n: number) => new Date(Date.now() + n * 24 * 3600 * 1000).toISOString().slice(0, 10);

interface JobRow {
  id: number;
  branchName: string;
  performedOn: string;
}

let inspectorContext: BrowserContext;
let peoriaInWindow: JobRow;
let peoriaOutsideWindow: JobRow;
let tucsonInWindow: JobRow;
let grantId = 0;

async function jobs(api: APIRequestContext, qs: string): Promise<{ status: number; rows: JobRow[]; total: number }> {
  const res = await api.get(`/api/jobs?pageSize=200${qs}`);
  if (res.status() !== 200) return { status: res.status(), rows: [], total: 0 };
  const body = (await res.json()) as { rows: JobRow[]; total: number };
  return { status: 200, ...body };
}

test("the officer gives a new inspector access to Peoria, records of 2025-01-01 to 2025-06-30", async ({ browser, request }) => {
  const owner = await contextAs(browser, DEMO.owner);
  const branches = (await (await owner.request.get("/api/lookup/branches")).json()) as { rows: { id: number; name: string }[] };
  const id = (name: string) => branches.rows.find((b) => b.name === name)!.id;
  peoriaInWindow = (await jobs(owner.request, `&branchId=${id("Peoria")}&from=${WINDOW.from}&to=${WINDOW.to}`)).rows[0]!;
  peoriaOutsideWindow = (await jobs(owner.request, `&branchId=${id("Peoria")}&from=2026-01-01`)).rows[0]!;
  tucsonInWindow = (await jobs(owner.request, `&branchId=${id("Tucson")}&from=${WINDOW.from}&to=${WINDOW.to}`)).rows[0]!;
  expect(peoriaInWindow && peoriaOutsideWindow && tucsonInWindow).toBeTruthy();
  await owner.close();

  const officer = await contextAs(browser, DEMO.officer);
  const page = await officer.newPage();
  await page.goto("/admin/inspectors");
  await expect(page.getByRole("heading", { name: "Inspector access" })).toBeVisible();
  await expect(page.getByTestId("grant-row").filter({ hasText: "Harold Penwick" }).first()).toBeVisible();
  await page.getByRole("link", { name: "Give an inspector access" }).click();
  await page.getByLabel("Inspector's full name").fill(inspector.name);
  await page.getByLabel("Inspector's e-mail address").fill(inspector.email);
  await page.getByRole("checkbox", { name: "Peoria" }).check();
  await page.getByLabel("From").fill(WINDOW.from);
  await page.getByLabel("To", { exact: true }).fill(WINDOW.to);
  await page.getByLabel("Access ends after").fill(inDays(30));
  await page.getByLabel("Note (optional)").fill("Insurer review of the first half of 2025");
  await snap(page, "admin-grant-form");
  await page.getByRole("button", { name: "Give access and e-mail the inspector" }).click();
  await expect(page).toHaveURL(/\/admin\/inspectors\?granted=invited/);
  const row = page.getByTestId("grant-row").filter({ hasText: inspector.email });
  await expect(row).toHaveCount(1);
  await expect(row).toContainText("Open");
  await expect(row).toContainText("Peoria");
  await expect(row).toContainText(`${WINDOW.from} – ${WINDOW.to}`);
  await expect(row).toContainText("Invitation sent");
  await snap(page, "admin-grants-open");
  const listed = (await (await page.request.get("/api/admin/inspector-grants?state=active&pageSize=200")).json()) as {
    rows: { id: number; inspectorEmail: string }[];
  };
  grantId = listed.rows.find((g) => g.inspectorEmail === inspector.email)!.id;
  await officer.close();

  let mails = await mailTo(request, inspector.email);
  await expect.poll(async () => (mails = await mailTo(request, inspector.email)).length).toBe(1);
  expect(mails[0]!.text).toContain(`Peoria — records dated ${WINDOW.from} to ${WINDOW.to}`);
  const link = mails[0]!.text.match(/https?:\/\/\S+\/invitation\/[A-Za-z0-9_-]{20,}/)![0];

  inspectorContext = await browser.newContext();
  const invitePage = await inspectorContext.newPage();
  await invitePage.goto(link);
  await expect(invitePage.getByText("as Inspector")).toBeVisible();
  await invitePage.getByLabel("New password").fill(inspector.password);
  await invitePage.getByLabel("The same password again").fill(inspector.password);
  await invitePage.getByRole("button", { name: "Save my password and sign in" }).click();
  await expect(invitePage.getByRole("heading", { name: "Hello, Orla" })).toBeVisible();
});

test("the inspector reads only Peoria's records dated in the window", async () => {
  const api = inspectorContext.request;
  const seen = await jobs(api, "");
  expect(seen.status).toBe(200);
  expect(seen.total).toBeGreaterThan(0);
  expect(new Set(seen.rows.map((r) => r.branchName))).toEqual(new Set(["Peoria"]));
  expect(seen.rows.every((r) => r.performedOn >= WINDOW.from && r.performedOn <= WINDOW.to)).toBe(true);

  expect((await api.get(`/api/jobs/${peoriaInWindow.id}`)).status()).toBe(200);
  expect((await api.get(`/api/jobs/${peoriaOutsideWindow.id}`)).status()).toBe(404);
  expect((await api.get(`/api/jobs/${tucsonInWindow.id}`)).status()).toBe(404);
  expect((await api.get("/api/admin/people")).status()).toBe(403);
  expect((await api.get("/api/admin/inspector-grants")).status()).toBe(403);
  const branches = (await (await api.get("/api/lookup/branches")).json()) as { rows: { name: string }[] };
  expect(branches.rows.map((b) => b.name)).toEqual(["Peoria"]);

  const page = await inspectorContext.newPage();
  await page.goto("/jobs");
  await expect(page.getByTestId("job-row").first()).toBeVisible();
  await expect(page.getByTestId("job-row").filter({ hasText: "Tucson" })).toHaveCount(0);
  await snap(page, "inspector-jobs-granted");
  await page.goto(`/jobs/${peoriaInWindow.id}`);
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  await page.close();
});

test("a second access for the same inspector is a notice, not a new invitation", async ({ browser, request }) => {
  const officer = await contextAs(browser, DEMO.officer);
  const branches = (await (await officer.request.get("/api/lookup/branches")).json()) as { rows: { id: number; name: string }[] };
  const res = await officer.request.post("/api/admin/inspector-grants", {
    data: {
      email: inspector.email,
      name: inspector.name,
      branchIds: [branches.rows.find((b) => b.name === "Columbus")!.id],
      recordsFrom: "2025-01-01",
      recordsTo: "2025-01-31",
      expiresOn: inDays(10),
    },
  });
  expect(res.status()).toBe(201);
  const body = (await res.json()) as { id: number; kind: string; mailSent: boolean };
  expect(body).toMatchObject({ kind: "notified", mailSent: true });
  let mails = await mailTo(request, inspector.email);
  await expect.poll(async () => (mails = await mailTo(request, inspector.email)).length).toBe(2);
  expect(mails[1]!.subject).toContain("New read access");
  expect(mails[1]!.text).not.toContain("/invitation/");
  // Withdraw this second access straight away: the next test is about the first one.
  expect((await officer.request.post(`/api/admin/inspector-grants/${body.id}/revoke`)).status()).toBe(200);
  await officer.close();
});

test("after the officer withdraws the access, the same requests and pages are refused", async ({ browser }) => {
  const officer = await contextAs(browser, DEMO.officer);
  const page = await officer.newPage();
  await page.goto("/admin/inspectors");
  const row = page.getByTestId("grant-row").filter({ hasText: inspector.email }).filter({ hasText: "Peoria" });
  await row.getByRole("button", { name: "Withdraw…" }).click();
  await row.getByRole("button", { name: "Withdraw now" }).click();
  await expect(row).toContainText("Withdrawn");
  await expect(row).toContainText("Teodora Vasquez-Lind");
  await snap(page, "admin-grants-withdrawn");
  expect((await page.request.post(`/api/admin/inspector-grants/${grantId}/revoke`)).status()).toBe(409);
  await officer.close();

  const api = inspectorContext.request;
  expect((await api.get("/api/jobs?pageSize=200")).status()).toBe(403);
  expect((await api.get(`/api/jobs/${peoriaInWindow.id}`)).status()).toBe(403);
  const branches = (await (await api.get("/api/lookup/branches")).json()) as { rows?: unknown[] };
  expect(branches.rows ?? []).toHaveLength(0);

  const inspectorPage = await inspectorContext.newPage();
  await inspectorPage.goto("/");
  await expect(inspectorPage.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Jobs" })).toHaveCount(0);
  await inspectorPage.goto("/jobs");
  await expect(inspectorPage.getByRole("alert").filter({ hasText: "do not have permission" })).toBeVisible();
  await expect(inspectorPage.getByTestId("job-row")).toHaveCount(0);
  await snap(inspectorPage, "inspector-jobs-withdrawn");
  await inspectorPage.goto(`/jobs/${peoriaInWindow.id}`);
  await expect(inspectorPage.getByRole("alert").filter({ hasText: "could not be loaded" })).toBeVisible();
  await snap(inspectorPage, "inspector-job-withdrawn");
  await inspectorContext.close();
});
