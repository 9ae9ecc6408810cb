import { devices, type APIRequestContext } from "@playwright/test";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";

const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 }, defaultBrowserType: undefined };
delete (phone as { defaultBrowserType?: unknown }).defaultBrowserType;

/** A one-page PDF, small but real: its bytes start with the PDF signature. */
const PDF = Buffer.from(
  "%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 200 200]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n",
  "latin1",
);
/** A Windows executable renamed to .pdf: refused by its bytes, whatever the name says. */
const RENAMED_EXE = Buffer.concat([
  Buffer.from("MZ", "latin1"),
  Buffer.alloc(126, 0),
  Buffer.from("PE\0\0", "latin1"),
  Buffer.alloc(200, 7),
]);

/** Today in Columbus: records carry the branch's calendar date. */
const columbusToday = () =>
  new Intl.DateTimeFormat("en-CA", { timeZone: "America/New_York", year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date());

interface ApplianceOption {
  id: number;
  tag: string;
  category: string;
  refrigerant: string;
  fullChargeG: number;
  branchId: number;
}

async function statementsTotal(api: APIRequestContext): Promise<number> {
  const res = await api.get("/api/disposals?type=statement&pageSize=1&voided=include");
  expect(res.status()).toBe(200);
  return ((await res.json()) as { total: number }).total;
}

/** Disposes of a Columbus small appliance through the API: recovery of 95 % of its charge. */
async function disposeSmallAppliance(api: APIRequestContext): Promise<{ jobId: number; appliance: ApplianceOption }> {
  const { rows } = (await (await api.get("/api/lookup/appliances?limit=50&q=COL-SA-")).json()) as { rows: ApplianceOption[] };
  const small = rows.filter((a) => a.category === "small_appliance").sort((a, b) => (a.tag < b.tag ? 1 : -1));
  expect(small.length, "a small appliance in service in Columbus").toBeGreaterThan(0);
  const appliance = small[0]!;
  const cylinders = (
    (await (await api.get(`/api/lookup/cylinders?branchId=${appliance.branchId}`)).json()) as {
      rows: { id: number; refrigerant: string | null; contentsG: number; lastRequalifiedOn: string | null }[];
    }
  ).rows;
  const cylinder = cylinders.find(
    (c) => (c.contentsG === 0 || c.refrigerant === appliance.refrigerant) && (c.lastRequalifiedOn ?? "") > "2022-01-01",
  );
  const equipment = (
    (await (await api.get(`/api/lookup/equipment?branchId=${appliance.branchId}`)).json()) as {
      rows: { id: number; certificationState: string; systemDependent: boolean }[];
    }
  ).rows.find((e) => e.certificationState === "certified" && !e.systemDependent);
  expect(cylinder && equipment, "a cylinder and certified equipment in Columbus").toBeTruthy();
  const res = await api.post("/api/jobs", {
    data: {
      kind: "disposal",
      applianceId: appliance.id,
      performedOn: columbusToday(),
      refrigerant: appliance.refrigerant,
      recoveredAmount: Math.ceil(appliance.fullChargeG * 0.95),
      recoveredUnit: "g",
      cylinderId: cylinder!.id,
      equipmentId: equipment!.id,
      evacuationValue: 4,
      evacuationUnit: "in_hg_vacuum",
      accessMethod: "piercing_pliers",
      temporaryAccessRemoved: true,
      compressorOperating: false,
      disposalPath: "on_site",
    },
  });
  expect(res.status(), await res.text()).toBe(201);
  return { jobId: ((await res.json()) as { id: number }).id, appliance };
}

test.describe("a small appliance's disposal statement", () => {
  test("the technician fills the statement on a phone, attaches the signed PDF, and the document is kept; a bad entry writes nothing", async ({
    browser,
  }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    const { jobId, appliance } = await disposeSmallAppliance(tech.request);
    const before = await statementsTotal(tech.request);

    await page.goto(`/jobs/${jobId}`);
    const proof = page.getByTestId("disposal-proof");
    await expect(proof).toContainText("needs a signed statement");
    await proof.getByRole("link", { name: "Add the signed statement" }).click();
    await expect(page.getByRole("heading", { name: `Signed statement for ${appliance.tag}` })).toBeVisible();

    // Missing fields: each is named, nothing is written.
    await page.getByRole("button", { name: "Save signed statement" }).click();
    await expect(page.getByText("Enter the address of the person who recovered the refrigerant", { exact: true })).toBeVisible();
    await expect(page.getByText("Enter the name of the person who signed", { exact: true })).toBeVisible();
    await expect(page.getByLabel("Their address")).toHaveAttribute("aria-invalid", "true");
    await snap(page, "disposal-statement-phone-errors");
    expect(await statementsTotal(tech.request)).toBe(before);

    await page.getByLabel("Their address").fill("400 Ridgeway Ave, Columbus, OH 43215");
    await page.getByLabel("Signed by").fill("Marcus Delacroix-Byrd");
    await page.getByLabel(/Signed document/).setInputFiles({ name: "signed-statement.pdf", mimeType: "application/pdf", buffer: PDF });
    await expect(page.getByText("PDF chosen")).toBeVisible();
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await snap(page, "disposal-statement-phone-filled");
    await page.getByRole("button", { name: "Save signed statement" }).click();

    await expect(page).toHaveURL(/\/disposals\/statements\/\d+\?saved=1/);
    const statementId = Number(new URL(page.url()).pathname.split("/").pop());
    await expect(page.getByRole("status").filter({ hasText: "Signed statement saved with its signed document" })).toBeVisible();
    await expect(page.getByTestId("statement-document")).toContainText("On file (PDF)");
    await expect(page.getByText("The statement has everything the rule asks for.")).toBeVisible();
    await snap(page, "disposal-statement-phone-saved");
    expect(await statementsTotal(tech.request)).toBe(before + 1);

    // The stored object is the PDF itself, served only through the permission-checked route.
    const doc = await tech.request.get(`/api/disposals/statements/${statementId}/document`);
    expect(doc.status()).toBe(200);
    expect(doc.headers()["content-type"]).toBe("application/pdf");
    expect((await doc.body()).subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const other = await contextAs(browser, DEMO.managerTucson);
    expect((await other.request.get(`/api/disposals/statements/${statementId}/document`)).status()).toBe(404);
    await other.close();

    // A renamed executable is refused by its bytes, naming the field, and nothing is added.
    const refused = await tech.request.post("/api/disposals/statements", {
      multipart: {
        applianceId: String(appliance.id),
        recoveredByName: "Marcus Delacroix-Byrd",
        recoveredByAddress: "400 Ridgeway Ave",
        recoveredOn: columbusToday(),
        signedByName: "Marcus Delacroix-Byrd",
        signedOn: columbusToday(),
        document: { name: "statement.pdf", mimeType: "application/pdf", buffer: RENAMED_EXE },
      },
    });
    expect(refused.status()).toBe(400);
    expect(((await refused.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.document?.[0]).toContain(
      "Only photos",
    );
    expect(await statementsTotal(tech.request)).toBe(before + 1);

    // The job now shows its proof on file.
    await page.goto(`/jobs/${jobId}`);
    await expect(page.getByTestId("disposal-proof")).toContainText("Signed statement on file");
    await tech.close();

    // The branch manager finds it on a desktop, with the document on file.
    const manager = await contextAs(browser, DEMO.managerColumbus);
    const mpage = await manager.newPage();
    await mpage.goto("/disposals?tab=statement");
    await mpage.getByLabel("Search appliance").fill(appliance.tag);
    const row = mpage.getByTestId("disposal-row").filter({ hasText: appliance.tag });
    await expect(row).toContainText("On file");
    await expect(mpage.getByTestId("monthly-recovered")).toBeVisible();
    await snap(mpage, "disposals-list-columbus-manager");
    await manager.close();
  });
});
