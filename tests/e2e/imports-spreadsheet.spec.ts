import ExcelJS from "exceljs";
import type { APIRequestContext } from "@playwright/test";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";

const stamp = () => `${Date.now().toString(36).toUpperCase()}${Math.floor(Math.random() * 100)}`;
const XLSX = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

interface ApplianceOption {
  id: number;
  tag: string;
  branchName: string;
}

async function workbook(headings: string[], rows: unknown[][]): Promise<Buffer> {
  const book = new ExcelJS.Workbook();
  const sheet = book.addWorksheet("Appliances");
  sheet.addRow(headings);
  for (const r of rows) sheet.addRow(r);
  return Buffer.from(await book.xlsx.writeBuffer());
}

async function importTotal(request: APIRequestContext): Promise<number> {
  return ((await (await request.get("/api/imports?pageSize=1")).json()) as { total: number }).total;
}

test.describe("spreadsheet import", () => {
  test("a branch manager imports a workbook with good and bad rows: exactly the good rows are imported and the others reported by row, field and why", async ({
    browser,
  }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus, { viewport: { width: 1366, height: 900 } });
    const page = await manager.newPage();
    const s = stamp();
    const { rows: existing } = (await (await manager.request.get("/api/lookup/appliances?limit=5")).json()) as { rows: ApplianceOption[] };
    const taken = existing[0]!.tag;

    const file = await workbook(
      ["Tag", "Description", "Category", "Refrigerant", "Full charge", "Full charge unit", "Site", "Customer", "Installed on"],
      [
        [
          `E2E-${s}-RTU1`,
          "Rooftop unit over the loading dock",
          "Packaged rooftop",
          "R-410A",
          14.5,
          "lb",
          `Quarry Lane Depot ${s}`,
          "Quarry Lane Storage",
          new Date(Date.UTC(2021, 3, 12)),
        ],
        [`E2E-${s}-BAD1`, "Unit with an unknown kind", "Hovercraft", "R-410A", 10, "lb", `Quarry Lane Depot ${s}`, "", ""],
        [`E2E-${s}-SPL2`, "Office split system", "Residential split", "r32", "2.4 kg", "", `Quarry Lane Depot ${s}`, "", "2022-06-01"],
        [taken, "Copy of a registered tag", "Packaged rooftop", "R-410A", 9, "lb", `Quarry Lane Depot ${s}`, "", ""],
        [`E2E-${s}-BAD2`, "Walk-in with no charge", "Commercial refrigeration", "R-448A", "", "lb", `Quarry Lane Depot ${s}`, "", ""],
        [`E2E-${s}-WIC3`, "Walk-in cooler", "Commercial refrigeration", "R-448A", 26, "lb", `Quarry Lane Depot ${s}`, "", ""],
      ],
    );

    await page.goto("/imports");
    await expect(page.getByRole("heading", { name: "Spreadsheet import" })).toBeVisible();
    await page.getByRole("link", { name: "Start an import" }).click();
    await page.getByLabel("Appliances").check();
    await page.getByLabel("Branch to import into").selectOption({ label: "Columbus (COL)" });
    await page.getByLabel("Spreadsheet").setInputFiles({ name: "columbus appliances.xlsx", mimeType: XLSX, buffer: file });
    await snap(page, "imports-upload-filled");
    await page.getByRole("button", { name: "Read the file" }).click();

    // Columns are suggested from the headings.
    await expect(page.getByRole("heading", { name: "Which column holds what?" })).toBeVisible();
    await expect(page.getByLabel(/^Tag/)).toHaveValue("0");
    await expect(page.getByLabel(/^Full charge unit/)).toHaveValue("5");
    await expect(page.getByLabel(/^Site address/)).toHaveValue("");
    await snap(page, "imports-mapping");
    await page.getByRole("button", { name: "Check every row" }).click();

    const summary = page.getByTestId("import-summary");
    await expect(summary).toContainText("3 of 6 rows can be imported", { timeout: 30_000 });
    await expect(summary).toContainText("3 rows have problems and will not be imported");
    const issues = page.getByTestId("issue-row");
    await expect(issues).toHaveCount(3);
    await expect(issues.nth(0)).toContainText("3");
    await expect(issues.nth(0)).toContainText("Category");
    await expect(issues.nth(0)).toContainText("Hovercraft");
    await expect(issues.nth(0)).toContainText("not a known appliance category");
    await expect(issues.nth(1)).toContainText("5");
    await expect(issues.nth(1)).toContainText("already in the register");
    await expect(issues.nth(2)).toContainText("6");
    await expect(issues.nth(2)).toContainText("Full charge");
    await expect(issues.nth(2)).toContainText("The full charge is missing");
    await snap(page, "imports-checked-preview");

    // Nothing is written by the check.
    const look = async (tag: string) =>
      (
        (await (await manager.request.get(`/api/lookup/appliances?limit=5&q=${encodeURIComponent(tag)}`)).json()) as {
          rows: ApplianceOption[];
        }
      ).rows;
    expect(await look(`E2E-${s}`)).toHaveLength(0);

    await page.getByRole("button", { name: "Import 3 valid rows" }).click();
    await expect(summary).toContainText("Imported 3 appliances", { timeout: 30_000 });
    await expect(summary).toContainText("3 rows with problems were not imported");
    await snap(page, "imports-imported");

    const imported = await look(`E2E-${s}`);
    expect(imported.map((a) => a.tag).sort()).toEqual([`E2E-${s}-RTU1`, `E2E-${s}-SPL2`, `E2E-${s}-WIC3`]);
    expect(imported.every((a) => a.branchName === "Columbus")).toBe(true);
    // The same import cannot be written twice.
    const id = Number(new URL(page.url()).pathname.split("/").pop());
    expect((await manager.request.post(`/api/imports/${id}/commit`)).status()).toBe(409);

    // Another branch's manager neither sees the import nor imports into Columbus.
    const tucson = await contextAs(browser, DEMO.managerTucson);
    expect((await tucson.request.get(`/api/imports/${id}`)).status()).toBe(404);
    const columbusId = (
      (await (await manager.request.get("/api/lookup/branches")).json()) as { rows: Array<{ id: number; code: string }> }
    ).rows.find((b) => b.code === "COL")!.id;
    const form = new FormData();
    form.set("kind", "appliances");
    form.set("branchId", String(columbusId));
    form.set("file", new Blob([new Uint8Array(file)], { type: XLSX }), "x.xlsx");
    expect((await tucson.request.post("/api/imports", { multipart: form })).status()).toBe(403);
    await tucson.close();
    await manager.close();
  });

  test("a broken file gets a clear error and writes nothing", async ({ browser }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus, { viewport: { width: 1366, height: 900 } });
    const page = await manager.newPage();
    const before = await importTotal(manager.request);

    // A workbook cut in half: refused at once, nothing stored or recorded.
    const whole = await workbook(["Serial number", "Water capacity", "Tare weight"], [["X-1", 50, 17]]);
    await page.goto("/imports/new");
    await page.getByLabel("Recovery cylinders").check();
    await page.getByLabel("Branch to import into").selectOption({ label: "Columbus (COL)" });
    await page
      .getByLabel("Spreadsheet")
      .setInputFiles({ name: "cylinders.xlsx", mimeType: XLSX, buffer: whole.subarray(0, Math.floor(whole.length / 2)) });
    await page.getByRole("button", { name: "Read the file" }).click();
    await expect(page.getByText("The workbook could not be read; it may be damaged or not an Excel file")).toBeVisible();
    await snap(page, "imports-broken-workbook");
    // A program renamed .xlsx, and a picture renamed .csv, are refused by their bytes.
    await page
      .getByLabel("Spreadsheet")
      .setInputFiles({ name: "cylinders.xlsx", mimeType: XLSX, buffer: Buffer.from("MZ\x90\x00 not a workbook", "latin1") });
    await page.getByRole("button", { name: "Read the file" }).click();
    await expect(page.getByText("This file is named .xlsx but is not an Excel workbook")).toBeVisible();
    expect(await importTotal(manager.request)).toBe(before);

    // A CSV that breaks further down (a quote never closed): the check stops, nothing is imported.
    const s = stamp();
    const lines = ["Serial number,Water capacity,Tare weight,Unit of the weights"];
    for (let i = 0; i < 40; i++) lines.push(`BRK-${s}-${i},50,17.5,lb`);
    lines.push(`"BRK-${s}-open,50,17.5,lb`);
    await page.goto("/imports/new");
    await page.getByLabel("Recovery cylinders").check();
    await page.getByLabel("Branch to import into").selectOption({ label: "Columbus (COL)" });
    await page
      .getByLabel("Spreadsheet")
      .setInputFiles({ name: "cylinders.csv", mimeType: "text/csv", buffer: Buffer.from(lines.join("\n")) });
    await page.getByRole("button", { name: "Read the file" }).click();
    await page.getByRole("button", { name: "Check every row" }).click();
    await expect(page.getByText("The import stopped. Nothing was imported.")).toBeVisible({ timeout: 30_000 });
    await expect(page.getByTestId("import-error")).toContainText(
      "The CSV file is broken: a quoted value that starts on line 42 is never closed",
    );
    await snap(page, "imports-broken-csv");
    const id = Number(new URL(page.url()).pathname.split("/").pop());
    expect((await manager.request.post(`/api/imports/${id}/commit`)).status()).toBe(409);
    const branchId = ((await (await manager.request.get("/api/lookup/branches")).json()) as { rows: Array<{ id: number }> }).rows[0]!.id;
    const cylinders = (await (await manager.request.get(`/api/lookup/cylinders?branchId=${branchId}`)).json()) as {
      rows: Array<{ serial: string }>;
    };
    expect(cylinders.rows.length).toBeGreaterThan(0);
    expect(cylinders.rows.filter((c) => c.serial.startsWith(`BRK-${s}`))).toHaveLength(0);
    await manager.close();
  });

  test("templates download per record kind; technicians cannot import", async ({ browser }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus);
    const res = await manager.request.get("/api/imports/template?kind=cylinders");
    expect(res.status()).toBe(200);
    expect(res.headers()["content-type"]).toBe(XLSX);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await res.body());
    const headings = (book.worksheets[0]!.getRow(1).values as unknown[]).slice(1);
    expect(headings).toEqual(expect.arrayContaining(["Serial number *", "Water capacity *", "Tare weight *", "Last requalified on"]));
    expect(book.worksheets[0]!.rowCount).toBe(1); // headings only: nothing to import by mistake
    await manager.close();

    const tech = await contextAs(browser, DEMO.technicianColumbus);
    expect((await tech.request.get("/api/imports/template?kind=jobs")).status()).toBe(403);
    expect((await tech.request.get("/api/imports")).status()).toBe(403);
    const page = await tech.newPage();
    await page.goto("/imports/new");
    await expect(page).not.toHaveURL(/\/imports/);
    await tech.close();
  });
});
