import { devices } from "@playwright/test";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";

const desktop = { viewport: { width: 1280, height: 900 } };
const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 }, defaultBrowserType: undefined };
delete (phone as { defaultBrowserType?: unknown }).defaultBrowserType;

interface CylinderOption {
  id: number;
  serial: string;
  refrigerant: string | null;
  contentsG: number;
}

test.describe("a branch manager keeps purchases and reclaim shipments on a desktop", () => {
  test("records a purchase, corrects it with a reason, and voids it; a bad entry names its fields and writes nothing", async ({
    browser,
  }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus, desktop);
    const page = await manager.newPage();
    const total = async () =>
      ((await (await manager.request.get("/api/purchases?pageSize=1&voided=include")).json()) as { total: number }).total;
    const before = await total();

    await page.goto("/purchases");
    await expect(page.getByRole("heading", { name: "Refrigerant purchases" })).toBeVisible();
    await expect(page.getByTestId("purchase-row").first()).toBeVisible();
    await snap(page, "purchases-list-columbus-manager");

    await page.getByRole("link", { name: "Record a purchase" }).click();
    await page.getByRole("button", { name: "Save purchase" }).click();
    await expect(page.getByText("Enter the supplier", { exact: true })).toBeVisible();
    await expect(page.getByText("Enter the quantity bought", { exact: true })).toBeVisible();
    await expect(page.getByLabel("Supplier")).toHaveAttribute("aria-invalid", "true");
    expect(await total()).toBe(before);

    await page.getByLabel("Supplier").fill("Invented Gas Supply");
    await page.getByLabel("Refrigerant").fill("R-410A");
    await page.getByLabel("Quantity bought").fill("25");
    await page.getByLabel("Number of containers (optional)").fill("1");
    await snap(page, "purchase-form-desktop");
    await page.getByRole("button", { name: "Save purchase" }).click();
    await expect(page).toHaveURL(/\/purchases\/\d+\?saved=1/);
    await expect(page.getByRole("heading", { level: 1 })).toContainText("25.00 lb R-410A from Invented Gas Supply");

    await page.getByRole("button", { name: "Correct this purchase" }).click();
    await page.getByLabel("Quantity").fill("24.5");
    await page.getByLabel("Why is it being corrected?").fill("Invoice shows 24.5 lb net");
    await page.getByRole("button", { name: "Save correction" }).click();
    await expect(page.getByTestId("amendment")).toContainText("25.00 lb");
    await expect(page.getByTestId("amendment")).toContainText("24.50 lb");

    await page.getByRole("button", { name: "Void this purchase…" }).click();
    await page.getByLabel("Why is it void?").fill("Entered for the wrong branch");
    await page.getByRole("button", { name: "Void purchase" }).click();
    await expect(page.getByTestId("voided-banner")).toContainText("Entered for the wrong branch");
    await snap(page, "purchase-detail-voided-history");
    expect(await total()).toBe(before + 1);
    await manager.close();
  });

  test("records a shipment of a cylinder, which empties it on record; voiding puts the contents back", async ({ browser }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus, desktop);
    const page = await manager.newPage();
    const branches = ((await (await manager.request.get("/api/lookup/branches")).json()) as { rows: { id: number; name: string }[] }).rows;
    const columbus = branches.find((b) => b.name === "Columbus")!.id;
    const cylinders = async () =>
      ((await (await manager.request.get(`/api/lookup/cylinders?branchId=${columbus}`)).json()) as { rows: CylinderOption[] }).rows;
    // A cylinder holding refrigerant that is not one of the planted gaps (serials ending in 9xx).
    const full = (await cylinders()).find((c) => c.contentsG > 0 && !/-9\d\d$/.test(c.serial));
    expect(full, "a Columbus cylinder holding refrigerant").toBeTruthy();

    await page.goto("/shipments");
    await expect(page.getByTestId("shipment-row").first()).toBeVisible();
    await snap(page, "shipments-list-columbus-manager");
    await page.getByRole("link", { name: "Record a shipment" }).click();
    await page.getByRole("checkbox", { name: new RegExp(full!.serial) }).check();
    await expect(page.getByTestId("shipment-totals")).toContainText(full!.refrigerant!);
    await page.getByLabel("Reclaimer", { exact: true }).fill("Invented Reclaim Works");
    await page.getByLabel(/Bill of lading/).fill("BOL-TEST-1");
    await snap(page, "shipment-form-desktop");
    await page.getByRole("button", { name: /Save shipment of 1 cylinder/ }).click();
    await expect(page).toHaveURL(/\/shipments\/\d+\?saved=1/);
    await expect(page.getByTestId("shipment-lines")).toContainText(full!.serial);
    await snap(page, "shipment-detail-desktop");
    expect((await cylinders()).find((c) => c.id === full!.id)!.contentsG).toBe(0);

    await page.getByRole("button", { name: "Void this shipment…" }).click();
    await page.getByLabel("Why is it void?").fill("Pickup was cancelled");
    await page.getByRole("button", { name: "Void shipment" }).click();
    await expect(page.getByTestId("voided-banner")).toBeVisible();
    const restored = (await cylinders()).find((c) => c.id === full!.id)!;
    expect(restored).toMatchObject({ contentsG: full!.contentsG, refrigerant: full!.refrigerant });
    await manager.close();
  });

  test("an empty scrap run is refused by field and writes nothing; the disposals page fits a phone", async ({ browser }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    const jobs = async () => ((await (await tech.request.get("/api/jobs?pageSize=1")).json()) as { total: number }).total;
    const before = await jobs();
    const res = await tech.request.post("/api/disposals/shop", { data: { performedOn: "2026-11-30", items: [], confirmStatement: false } });
    expect(res.status()).toBe(400);
    const fieldErrors = ((await res.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors;
    expect(fieldErrors.items?.[0]).toBe("Pick at least one appliance");
    expect(fieldErrors.confirmStatement?.[0]).toBe("Confirm that you recovered the refrigerant before saving");
    expect(fieldErrors.cylinderId?.[0]).toBe("Choose the recovery cylinder");
    expect(await jobs()).toBe(before);

    await page.goto("/disposals");
    await expect(page.getByRole("tab", { name: "Disposal records" })).toHaveAttribute("aria-selected", "true");
    await expect(page.getByTestId("disposal-row").first()).toBeVisible();
    expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
    await snap(page, "disposals-list-phone");
    await tech.close();
  });
});
