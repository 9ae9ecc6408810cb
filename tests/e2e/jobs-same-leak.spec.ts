import { devices, type APIRequestContext } from "@playwright/test";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";
import { JOBS_DEMO } from "./demo-data";

const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 }, defaultBrowserType: undefined };
delete (phone as { defaultBrowserType?: unknown }).defaultBrowserType;

async function applianceId(api: APIRequestContext, tag: string): Promise<number> {
  const { rows } = (await (await api.get(`/api/lookup/appliances?limit=5&q=${encodeURIComponent(tag)}`)).json()) as {
    rows: { id: number; tag: string }[];
  };
  const found = rows.find((a) => a.tag === tag);
  expect(found, `appliance ${tag} in the technician's picker`).toBeTruthy();
  return found!.id;
}

test("a technician marks a charge as the same leak as an earlier charge on a phone", async ({ browser }) => {
  const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
  const page = await tech.newPage();
  const rackId = await applianceId(tech.request, JOBS_DEMO.chargeAppliance);
  const earlier = (await (await tech.request.get(`/api/jobs?kind=charge&applianceId=${rackId}&pageSize=10`)).json()) as {
    rows: { id: number; performedOn: string }[];
  };
  expect(earlier.rows.length).toBeGreaterThan(0);
  // The oldest of the listed charges, so the summed event spans two dates.
  const previous = earlier.rows[earlier.rows.length - 1]!;

  await page.goto("/jobs/new");
  await page.getByRole("radio", { name: /^Charge \/ addition/ }).click();
  await page.getByLabel("Search by tag, description or site").fill(JOBS_DEMO.chargeAppliance);
  await page
    .getByRole("button", { name: new RegExp(JOBS_DEMO.chargeAppliance) })
    .first()
    .click();
  await page.getByLabel("Amount added", { exact: true }).fill("0.25");
  await page.getByLabel("Unit of the amount added").selectOption("lb");
  await page.getByRole("radio", { name: "New refrigerant from the branch's stock" }).check();
  const sameLeak = page.getByLabel("Same leak as an earlier addition?");
  await expect(sameLeak.locator("option", { hasText: `job #${previous.id}` })).toHaveCount(1);
  await sameLeak.selectOption(String(previous.id));
  await expect(page.getByTestId("draft-leak-rate")).toBeVisible();
  expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
  await sameLeak.scrollIntoViewIfNeeded();
  await snap(page, "job-charge-same-leak-phone");
  await page
    .getByText("Same leak as an earlier addition?")
    .locator("..")
    .screenshot({ path: test.info().outputPath("same-leak-control.png") });

  await page.getByRole("button", { name: "Save charge" }).click();
  await expect(page).toHaveURL(/\/jobs\/\d+\?saved=1/);
  await expect(page.getByText(`Charge job #${previous.id}`)).toBeVisible();
  const id = new URL(page.url()).pathname.split("/").pop();
  const detail = (await (await tech.request.get(`/api/jobs/${id}`)).json()) as { sameLeakAsJobId: number | null };
  expect(detail.sameLeakAsJobId).toBe(previous.id);

  // The appliance's leak-rate table shows one event for both additions, dated at the later one.
  await page.goto(`/appliances/${rackId}`);
  const event = page.getByTestId("leak-event").filter({ hasText: `same leak since ${previous.performedOn}` });
  await expect(event).toHaveCount(1);
  await event.scrollIntoViewIfNeeded();
  await snap(page, "appliance-leak-table-same-leak-phone");
});
