import { devices } from "@playwright/test";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";

const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 }, defaultBrowserType: undefined };
delete (phone as { defaultBrowserType?: unknown }).defaultBrowserType;

interface ApplianceOption {
  id: number;
  tag: string;
  category: string;
  branchId: number;
  branchName: string;
}

test.describe("a technician logs a recovery job on a phone", () => {
  test("the job is saved, listed for the technician and their branch manager, and hidden from another branch", async ({ browser }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();

    const before = (await (await tech.request.get("/api/jobs?pageSize=1")).json()) as { total: number };
    const { rows } = (await (await tech.request.get("/api/lookup/appliances?limit=50")).json()) as { rows: ApplianceOption[] };
    const appliance = rows.find((a) => a.category === "residential_split") ?? rows.find((a) => a.category !== "small_appliance");
    expect(appliance, "a residential split in the technician's branch").toBeTruthy();
    expect(
      rows.every((a) => a.branchName === "Columbus"),
      "the picker only offers the technician's branch",
    ).toBe(true);

    await page.goto("/jobs/new");
    await expect(page.getByRole("heading", { name: "Log a job" })).toBeVisible();
    await snap(page, "job-form-phone-kind-picker");
    await page.getByRole("radio", { name: /^Recovery/ }).click();
    await expect(page.getByRole("heading", { name: "Log a recovery job" })).toBeVisible();
    await expect(page.getByText("Refrigerant displaces oxygen")).toBeVisible();
    await expect(page.getByText("Local codes and licensed practice take precedence")).toBeVisible();
    await snap(page, "job-form-phone-empty");

    await page.getByLabel("Search by tag, description or site").fill(appliance!.tag);
    await page
      .getByRole("button", { name: new RegExp(appliance!.tag) })
      .first()
      .click();
    await expect(page.getByTestId("chosen-appliance")).toContainText(appliance!.tag);

    await page.getByLabel("Amount recovered", { exact: true }).fill("3.25");
    await page.getByLabel("Unit of the amount recovered").selectOption("lb");
    await page.getByRole("group", { name: "Recovery cylinder" }).getByRole("radio").first().check();
    await page.getByRole("group", { name: "Recovery equipment" }).getByRole("radio").first().check();
    await page.getByLabel("Evacuation level reached", { exact: true }).fill("10");
    await page.getByLabel("Existing service valve").check();
    await snap(page, "job-form-phone-filled");

    // The page must fit the phone: nothing wider than the viewport.
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);

    await page.getByRole("button", { name: "Save recovery job" }).click();
    await expect(page).toHaveURL(/\/jobs\/\d+\?saved=1/);
    await expect(page.getByRole("status").filter({ hasText: "Job saved" })).toBeVisible();
    const createdId = new URL(page.url()).pathname.split("/").pop();
    await expect(page.getByRole("heading", { level: 1 })).toContainText(`Recovered 3.25 lb`);

    const after = (await (await tech.request.get("/api/jobs?pageSize=1")).json()) as { total: number };
    expect(after.total).toBe(before.total + 1);

    await page.goto("/jobs");
    await page.getByLabel("Search appliance").fill(appliance!.tag);
    // Other tests may log jobs on the same appliance (dated in UTC, ours in the branch's zone): find ours by its link.
    const row = page.getByTestId("job-row").filter({ has: page.locator(`a[href="/jobs/${createdId}"]`) });
    await expect(row).toBeVisible();
    await expect(row).toContainText("3.25 lb");
    await snap(page, "jobs-list-phone-after-save");

    const detail = (await (await tech.request.get(`/api/jobs/${createdId}`)).json()) as Record<string, unknown>;
    expect(detail).toMatchObject({
      kind: "recovery",
      applianceTag: appliance!.tag,
      technicianName: "Marcus Delacroix-Byrd",
      evacuationValue: 10,
    });

    // The Columbus branch manager sees it.
    const manager = await contextAs(browser, DEMO.managerColumbus);
    const mpage = await manager.newPage();
    await mpage.goto("/jobs");
    await mpage.getByLabel("Search appliance").fill(appliance!.tag);
    await expect(mpage.getByTestId("job-row").filter({ hasText: "Marcus Delacroix-Byrd" }).first()).toBeVisible();
    await snap(mpage, "jobs-list-columbus-manager");
    expect((await manager.request.get(`/api/jobs/${createdId}`)).status()).toBe(200);

    // The Tucson branch manager does not.
    const other = await contextAs(browser, DEMO.managerTucson);
    const opage = await other.newPage();
    await opage.goto("/jobs");
    await opage.getByLabel("Search appliance").fill(appliance!.tag);
    await expect(opage.getByText("No jobs match these filters.")).toBeVisible();
    await snap(opage, "jobs-list-tucson-manager");
    expect((await other.request.get(`/api/jobs/${createdId}`)).status()).toBe(404);

    await Promise.all([tech.close(), manager.close(), other.close()]);
  });

  test("an invalid entry shows the field's error and writes nothing", async ({ browser }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    const before = (await (await tech.request.get("/api/jobs?pageSize=1")).json()) as { total: number };

    await page.goto("/jobs/new?kind=recovery");
    await page.getByRole("button", { name: "Save recovery job" }).click();
    await expect(page.getByText("Choose the appliance", { exact: true })).toBeVisible();
    await expect(page.getByText("Enter the amount recovered", { exact: true })).toBeVisible();
    await expect(page.getByLabel("Amount recovered", { exact: true })).toHaveAttribute("aria-invalid", "true");
    await expect(page.getByRole("alert").filter({ hasText: "Some fields need attention" })).toBeVisible();
    await snap(page, "job-form-phone-errors");

    // The server refuses the same mistakes on its own, naming the field.
    const { rows } = (await (await tech.request.get("/api/lookup/appliances?limit=1")).json()) as { rows: ApplianceOption[] };
    const res = await tech.request.post("/api/jobs", {
      data: {
        kind: "recovery",
        applianceId: rows[0]!.id,
        performedOn: "2026-11-20",
        refrigerant: "R-410A",
        recoveredAmount: -2,
        recoveredUnit: "lb",
        cylinderId: 1,
        equipmentId: 1,
        evacuationValue: 0,
        evacuationUnit: "psig",
        accessMethod: "bolt_on_line_tap",
      },
    });
    expect(res.status()).toBe(400);
    const body = (await res.json()) as { error: { fieldErrors: Record<string, string[]> } };
    expect(body.error.fieldErrors.recoveredAmount?.[0]).toContain("cannot be negative");

    const after = (await (await tech.request.get("/api/jobs?pageSize=1")).json()) as { total: number };
    expect(after.total).toBe(before.total);
    await tech.close();
  });
});
