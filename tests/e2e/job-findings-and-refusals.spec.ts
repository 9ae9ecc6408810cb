import { devices, type APIRequestContext, type Page } from "@playwright/test";
import { checkCylinderFill } from "@coldtrail/core";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";
import { JOBS_DEMO } from "./demo-data";
import { runAuditApi, todayIn } from "./audit-helpers";

const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 }, defaultBrowserType: undefined };
delete (phone as { defaultBrowserType?: unknown }).defaultBrowserType;
const desktop = { viewport: { width: 1440, height: 900 } };

interface Branch {
  id: number;
  name: string;
  timeZone: string;
}
interface ApplianceOption {
  id: number;
  tag: string;
  category: string;
  refrigerant: string;
  branchId: number;
}
interface CylinderOption {
  id: number;
  serial: string;
  refrigerant: string | null;
  contentsG: number;
  waterCapacityG: number;
  tareG: number;
}

async function branchNamed(api: APIRequestContext, name: string): Promise<Branch> {
  const { rows } = (await (await api.get("/api/lookup/branches")).json()) as { rows: Branch[] };
  const b = rows.find((r) => r.name === name);
  expect(b, `branch ${name}`).toBeTruthy();
  return b!;
}

async function appliance(api: APIRequestContext, tag: string): Promise<ApplianceOption> {
  const { rows } = (await (await api.get(`/api/lookup/appliances?limit=5&q=${encodeURIComponent(tag)}`)).json()) as {
    rows: ApplianceOption[];
  };
  const found = rows.find((a) => a.tag === tag);
  expect(found, `appliance ${tag}`).toBeTruthy();
  return found!;
}

const noOverflow = async (page: Page) =>
  expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);

test.describe("records that cannot be true, and what a saved job changed", () => {
  test("the saved job page lists the finding the job raised, with its state in words and a link", async ({ browser }) => {
    test.setTimeout(180_000);
    const officer = await contextAs(browser, DEMO.officer, desktop);
    const columbus = await branchNamed(officer.request, "Columbus");
    // Continuous audit re-checks branches that have been audited.
    await runAuditApi(officer.request, { branchIds: [columbus.id], periodFrom: "2026-01-01" });

    const tech = await contextAs(browser, DEMO.technicianColumbus, desktop);
    const rack = await appliance(tech.request, JOBS_DEMO.chargeAppliance);
    // A leak repair done through clamp-on piercing pliers left on the line: rule CT-ACCESS-01 names this job.
    const res = await tech.request.post("/api/jobs", {
      data: {
        kind: "leak_repair",
        applianceId: rack.id,
        performedOn: todayIn(columbus.timeZone),
        leakLocation: "Suction line near the case",
        repairDescription: "Replaced the flare nut",
        accessMethod: "piercing_pliers",
        temporaryAccessRemoved: false,
      },
    });
    expect(res.status()).toBe(201);
    const { id } = (await res.json()) as { id: number };

    const page = await tech.newPage();
    await page.goto(`/jobs/${id}?saved=1`);
    const section = page.getByTestId("job-findings");
    await expect(section.getByRole("heading", { name: "Findings from this job" })).toBeVisible();
    const raised = section.getByTestId("job-finding").filter({ hasText: "Temporary piercing access left in place" });
    await expect(raised).toBeVisible({ timeout: 45_000 });
    await expect(raised).toContainText("Raised by this job");
    await expect(raised.locator("[data-state]")).toHaveText("Open");
    await expect(raised.locator("[data-severity]")).toHaveText("Major");
    await snap(page, "job-findings-desktop");

    const phonePage = await (await contextAs(browser, DEMO.technicianColumbus, phone)).newPage();
    await phonePage.goto(`/jobs/${id}`);
    await expect(phonePage.getByTestId("job-finding").filter({ hasText: "Temporary piercing access left in place" })).toBeVisible();
    await noOverflow(phonePage);
    await snap(phonePage, "job-findings-phone");

    await raised.getByRole("link").click();
    await expect(page).toHaveURL(/\/findings\/\d+$/);
    await expect(page.getByText("Temporary piercing access left in place").first()).toBeVisible();

    // Another organisation cannot read the job or what it raised.
    const other = await contextAs(browser, DEMO.otherOrgManager);
    expect((await other.request.get(`/api/jobs/${id}/findings`)).status()).toBe(404);
    // Leave the demo data as it was: the job is voided (its finding then closes on the next re-check).
    expect((await tech.request.post(`/api/jobs/${id}/void`, { data: { reason: "Test record, not real work" } })).ok()).toBe(true);
    await Promise.all([officer.close(), tech.close(), other.close(), phonePage.context().close()]);
  });

  for (const [label, options] of [
    ["phone", phone],
    ["desktop", desktop],
  ] as const) {
    test(`the job form refuses impossible amounts and dates beside their fields (${label})`, async ({ browser }) => {
      const tech = await contextAs(browser, DEMO.technicianColumbus, options);
      const columbus = await branchNamed(tech.request, "Columbus");
      const rack = await appliance(tech.request, JOBS_DEMO.chargeAppliance);
      const page = await tech.newPage();
      await page.goto("/jobs/new");
      await page.getByRole("radio", { name: /^Charge \/ addition/ }).click();
      await page.getByLabel("Search by tag, description or site").fill(rack.tag);
      await page
        .getByRole("button", { name: new RegExp(rack.tag) })
        .first()
        .click();
      await page.getByRole("radio", { name: "New refrigerant from the branch's stock" }).check();
      const amount = page.getByLabel("Amount added", { exact: true });
      const date = page.getByLabel("Date of the work");

      // Less than half a gram: refused before sending.
      await amount.fill("0.0000001");
      await page.getByLabel("Unit of the amount added").selectOption("lb");
      await page.getByRole("button", { name: "Save charge" }).click();
      await expect(page.getByText(/too small to record/)).toBeVisible();
      await expect(amount).toHaveAttribute("aria-invalid", "true");

      // Tomorrow where the branch is: refused by the server, beside the date.
      await amount.fill("0.25");
      const tomorrow = new Date(Date.parse(`${todayIn(columbus.timeZone)}T12:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
      await date.fill(tomorrow);
      await page.getByRole("button", { name: "Save charge" }).click();
      await expect(page.getByText(/cannot be after today/).first()).toBeVisible();
      await expect(date).toHaveAttribute("aria-invalid", "true");
      await expect(page).toHaveURL(/\/jobs\/new/);
      await noOverflow(page);
      await snap(page, `job-form-refused-date-${label}`);
      await tech.close();
    });
  }

  test("a recovery past liquid-full is refused; past the safe fill it asks for the confirmation", async ({ browser }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    const { rows } = (await (await tech.request.get("/api/lookup/appliances?limit=50")).json()) as { rows: ApplianceOption[] };
    const split = rows.find((a) => a.category === "residential_split")!;
    const cylinders = (
      (await (await tech.request.get(`/api/lookup/cylinders?branchId=${split.branchId}`)).json()) as { rows: CylinderOption[] }
    ).rows;
    const cylinder = cylinders.find((c) => c.contentsG === 0);
    expect(cylinder, "an empty cylinder in Columbus").toBeTruthy();
    const fill = checkCylinderFill({
      contentsG: 0,
      waterCapacityG: cylinder!.waterCapacityG,
      tareG: cylinder!.tareG,
      refrigerant: split.refrigerant,
    });

    await page.goto("/jobs/new");
    await page.getByRole("radio", { name: /^Recovery/ }).click();
    await page.getByLabel("Search by tag, description or site").fill(split.tag);
    await page
      .getByRole("button", { name: new RegExp(split.tag) })
      .first()
      .click();
    await page.getByLabel("Unit of the amount recovered").selectOption("kg");
    await page
      .getByRole("group", { name: "Recovery cylinder" })
      .getByRole("radio", { name: new RegExp(cylinder!.serial) })
      .check();
    await page.getByRole("group", { name: "Recovery equipment" }).getByRole("radio").first().check();
    await page.getByLabel("Evacuation level reached", { exact: true }).fill("10");
    await page.getByLabel("Existing service valve").check();
    const amount = page.getByLabel("Amount recovered", { exact: true });

    await amount.fill(((fill.liquidFullG + 1000) / 1000).toFixed(3));
    await page.getByRole("button", { name: "Save recovery job" }).click();
    await expect(page.getByText(/cannot hold that/).first()).toBeVisible();
    await expect(amount).toHaveAttribute("aria-invalid", "true");
    await snap(page, "job-form-refused-overflow-phone");

    await amount.fill((Math.floor((fill.maxNetG + fill.liquidFullG) / 2) / 1000).toFixed(3));
    await page.getByRole("button", { name: "Save recovery job" }).click();
    const confirm = page.getByLabel(/I confirm the cylinder now holds more than its safe fill/);
    await expect(confirm).toBeVisible();
    await expect(page.getByText("Local codes and licensed practice take precedence").first()).toBeVisible();
    await noOverflow(page);
    await snap(page, "job-form-confirm-over-fill-phone");
    await confirm.check();
    await page.getByRole("button", { name: "Save recovery job" }).click();
    await expect(page).toHaveURL(/\/jobs\/\d+\?saved=1/);
    await expect(page.getByText(/entered as \d+(\.\d+)? kg/)).toBeVisible();
    // Leave the demo data as it was: the job is voided and the cylinder's contents go back.
    const saved = new URL(page.url()).pathname.split("/").pop();
    expect((await tech.request.post(`/api/jobs/${saved}/void`, { data: { reason: "Test record, not real work" } })).ok()).toBe(true);
    await tech.close();
  });
});
