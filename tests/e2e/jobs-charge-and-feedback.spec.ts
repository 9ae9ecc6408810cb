import { devices, type APIRequestContext, type Page } from "@playwright/test";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";
import { JOBS_DEMO } from "./demo-data";

const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 }, defaultBrowserType: undefined };
delete (phone as { defaultBrowserType?: unknown }).defaultBrowserType;

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
  lastRequalifiedOn: string | null;
}
interface EquipmentOption {
  id: number;
  serial: string;
  manufacturedOn: string | null;
  certificationState: string;
  smallApplianceOnly: boolean;
  systemDependent: boolean;
}

async function appliance(api: APIRequestContext, tag: string): Promise<ApplianceOption> {
  const { rows } = (await (await api.get(`/api/lookup/appliances?limit=5&q=${encodeURIComponent(tag)}`)).json()) as {
    rows: ApplianceOption[];
  };
  const found = rows.find((a) => a.tag === tag);
  expect(found, `appliance ${tag} in the technician's picker`).toBeTruthy();
  return found!;
}

const noOverflow = async (page: Page) =>
  expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);

test.describe("jobs of every kind on a phone", () => {
  test("a technician logs a charge on a phone and sees the leak rate the rules calculate", async ({ browser }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    // A large supermarket rack: a tiny top-up stays far under every threshold whatever the last addition.
    const rack = await appliance(tech.request, JOBS_DEMO.chargeAppliance);

    await page.goto("/jobs/new");
    await page.getByRole("radio", { name: /^Charge \/ addition/ }).click();
    await expect(page.getByRole("heading", { name: "Log a charge (refrigerant added)" })).toBeVisible();
    await expect(page.getByText("Refrigerant displaces oxygen")).toBeVisible();
    await page.getByLabel("Search by tag, description or site").fill(rack.tag);
    await page
      .getByRole("button", { name: new RegExp(rack.tag) })
      .first()
      .click();
    await expect(page.getByTestId("chosen-appliance")).toContainText(rack.tag);
    await page.getByLabel("Amount added", { exact: true }).fill("0.25");
    await page.getByLabel("Unit of the amount added").selectOption("lb");
    await page.getByRole("radio", { name: "New refrigerant from the branch's stock" }).check();
    await expect(page.getByTestId("draft-leak-rate")).toContainText("under the 20 % threshold");
    await noOverflow(page);
    await snap(page, "job-charge-phone-filled");

    await page.getByRole("button", { name: "Save charge" }).click();
    await expect(page).toHaveURL(/\/jobs\/\d+\?saved=1/);
    const leak = page.getByTestId("leak-rate");
    await expect(leak).toContainText("Leak rate with this addition");
    await expect(leak).toContainText("Under the threshold (20 %)");
    await expect(leak).toContainText(/\d+\.\d+ %/);
    await noOverflow(page);
    await snap(page, "job-charge-phone-leak-rate");

    const id = new URL(page.url()).pathname.split("/").pop();
    const detail = (await (await tech.request.get(`/api/jobs/${id}`)).json()) as {
      kind: string;
      chargedG: number;
      leakRate: { percent: number; threshold: number; covered: boolean };
    };
    expect(detail).toMatchObject({ kind: "charge", chargedG: 113, leakRate: { covered: true, threshold: 20 } }); // 0.25 lb = 113.4 g
    expect(detail.leakRate.percent).toBeGreaterThan(0);
    expect(detail.leakRate.percent).toBeLessThan(20);
    await tech.close();
  });

  test("the instant feedback names an evacuation short of the requirement, the job still saves, and its correction shows in the history", async ({
    browser,
  }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    const chiller = await appliance(tech.request, JOBS_DEMO.mediumPressureChiller);
    const cylinders = (
      (await (await tech.request.get(`/api/lookup/cylinders?branchId=${chiller.branchId}`)).json()) as { rows: CylinderOption[] }
    ).rows;
    const cylinder = cylinders.find(
      (c) => (c.refrigerant === null || c.contentsG === 0) && c.lastRequalifiedOn && c.lastRequalifiedOn > "2022-01-01",
    );
    expect(cylinder, "an empty, requalified cylinder in Columbus").toBeTruthy();
    const equipment = (
      (await (await tech.request.get(`/api/lookup/equipment?branchId=${chiller.branchId}`)).json()) as { rows: EquipmentOption[] }
    ).rows.find(
      (e) =>
        e.certificationState === "certified" && !e.smallApplianceOnly && !e.systemDependent && (e.manufacturedOn ?? "9999") >= "1993-11-15",
    );
    expect(equipment, "certified recovery equipment made after 1993").toBeTruthy();

    await page.goto("/jobs/new?kind=recovery");
    await page.getByLabel("Search by tag, description or site").fill(chiller.tag);
    await page
      .getByRole("button", { name: new RegExp(chiller.tag) })
      .first()
      .click();
    await page.getByLabel("Amount recovered", { exact: true }).fill("2");
    await page.getByLabel("Unit of the amount recovered").selectOption("lb");
    await page
      .getByRole("group", { name: "Recovery cylinder" })
      .getByRole("radio", { name: new RegExp(cylinder!.serial) })
      .check();
    await page
      .getByRole("group", { name: "Recovery equipment" })
      .getByRole("radio", { name: new RegExp(equipment!.serial) })
      .check();
    await page.getByLabel("Evacuation level reached", { exact: true }).fill("4");
    await page.getByLabel("Unit of the evacuation level").selectOption("in_hg_vacuum");
    await page.getByLabel("Existing service valve").check();

    // Source: 40 CFR 82.156 Table 1 — medium-pressure appliance of 200 lb or more, equipment made after 15 Nov 1993: 15 in Hg
    const warning = page.getByTestId("draft-warning").filter({ hasText: "Required evacuation level not reached" });
    await expect(warning).toBeVisible();
    await expect(warning).toContainText("This appliance needs 15 in Hg vacuum with this equipment; 4 in Hg entered.");
    await expect(warning).toContainText("Critical");
    await expect(page.getByTestId("evacuation-required")).toContainText("15 in Hg vacuum");
    await expect(page.getByTestId("field-warning").first()).toBeVisible();
    await noOverflow(page);
    await snap(page, "job-recovery-phone-feedback-warning");

    // The technician can still save; the finding will be raised if it stays so.
    await page.getByRole("button", { name: "Save recovery job" }).click();
    await expect(page).toHaveURL(/\/jobs\/\d+\?saved=1/);
    const id = new URL(page.url()).pathname.split("/").pop();
    const before = (await (await tech.request.get(`/api/lookup/cylinders?branchId=${chiller.branchId}`)).json()) as {
      rows: CylinderOption[];
    };
    expect(before.rows.find((c) => c.id === cylinder!.id)!.contentsG).toBe(907); // 2 lb = 907.2 g

    // The gauge was re-read: correct the level and the amount, with a reason.
    await page.getByRole("button", { name: "Correct this job" }).click();
    await page.getByLabel("Evacuation level reached", { exact: true }).fill("15");
    await page.getByLabel("Amount recovered").fill("1.5");
    await page.getByLabel("Why is it being corrected?").fill("Gauge re-read at the end of the pull-down; scale ticket says 1.5 lb");
    await page.getByRole("button", { name: "Save correction" }).click();
    await expect(page.getByRole("status").filter({ hasText: "Correction saved" })).toBeVisible();
    const history = page.getByTestId("amendment");
    await expect(history).toHaveCount(1);
    await expect(history).toContainText("Marcus Delacroix-Byrd");
    await expect(history).toContainText("Gauge re-read at the end of the pull-down");
    await expect(history.getByRole("row", { name: /Evacuation level/ })).toContainText("4");
    await expect(history.getByRole("row", { name: /Evacuation level/ })).toContainText("15");
    await expect(history.getByRole("row", { name: /Amount recovered/ })).toContainText("2.00 lb");
    await expect(history.getByRole("row", { name: /Amount recovered/ })).toContainText("1.50 lb");
    await noOverflow(page);
    await snap(page, "job-detail-phone-amendment-history");

    // The cylinder contents followed the correction.
    const after = (await (await tech.request.get(`/api/lookup/cylinders?branchId=${chiller.branchId}`)).json()) as {
      rows: CylinderOption[];
    };
    expect(after.rows.find((c) => c.id === cylinder!.id)!.contentsG).toBe(680); // 1.5 lb = 680.4 g
    const check = (await (
      await tech.request.post("/api/jobs/check", {
        data: {
          kind: "recovery",
          applianceId: chiller.id,
          equipmentId: equipment!.id,
          evacuationValue: 15,
          evacuationUnit: "in_hg_vacuum",
        },
      })
    ).json()) as { warnings: unknown[] };
    expect(check.warnings).toEqual([]);
    expect(((await (await tech.request.get(`/api/jobs/${id}`)).json()) as { evacuationValue: number }).evacuationValue).toBe(15);
    await tech.close();
  });

  test("a leak repair and a verification test each save with their own fields", async ({ browser }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    const split = await appliance(tech.request, JOBS_DEMO.chargeAppliance);

    await page.goto("/jobs/new?kind=leak_repair");
    await page.getByLabel("Search by tag, description or site").fill(split.tag);
    await page
      .getByRole("button", { name: new RegExp(split.tag) })
      .first()
      .click();
    await page.getByRole("button", { name: "Save leak repair" }).click();
    await expect(page.getByText("Say where the leak was", { exact: true })).toBeVisible();
    await page.getByLabel("Where was the leak?").fill("Flare nut at the liquid-line service valve");
    await page.getByLabel("What was repaired?").fill("Re-made the flare and torqued to spec");
    await page.getByRole("button", { name: "Save leak repair" }).click();
    await expect(page).toHaveURL(/\/jobs\/\d+\?saved=1/);
    await expect(page.getByRole("heading", { level: 1 })).toContainText(`Repaired a leak on ${split.tag}`);
    const repairId = Number(new URL(page.url()).pathname.split("/").pop());

    await page.goto("/jobs/new?kind=verification_test");
    await page.getByLabel("Search by tag, description or site").fill(split.tag);
    await page
      .getByRole("button", { name: new RegExp(split.tag) })
      .first()
      .click();
    await page.getByRole("radio", { name: /^Initial test/ }).check();
    await page.getByRole("radio", { name: "✓ Passed" }).check();
    await page.getByLabel("How was it tested?").fill("Electronic leak detector");
    await snap(page, "job-verification-phone-filled");
    await page.getByRole("button", { name: "Save verification test" }).click();
    await expect(page).toHaveURL(/\/jobs\/\d+\?saved=1/);
    await expect(page.getByRole("heading", { level: 1 })).toContainText("Initial verification test passed");
    await expect(page.getByRole("link", { name: `Job #${repairId}` })).toBeVisible();
    await tech.close();
  });
});
