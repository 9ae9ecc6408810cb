import { devices, type Page } from "@playwright/test";
import { deflateSync } from "node:zlib";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";
import { REGISTER_DEMO } from "./demo-data";

const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 } } as Record<string, unknown>;
delete phone.defaultBrowserType;

/** Unique per run: the CI runs every spec against one database. */
const RUN = Date.now().toString(36).toUpperCase();

/** Today's calendar date in a time zone, shifted by whole days and years. */
function dateIn(timeZone: string, opts: { years?: number; days?: number } = {}): string {
  const today = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date());
  const d = new Date(`${today}T12:00:00Z`);
  d.setUTCFullYear(d.getUTCFullYear() + (opts.years ?? 0));
  d.setUTCDate(d.getUTCDate() + (opts.days ?? 0));
  return d.toISOString().slice(0, 10);
}

/** A small real PNG (a grey label with dark bars), built here so the upload is a genuine image. */
function labelPng(width = 160, height = 80): Buffer {
  const crcTable = Array.from({ length: 256 }, (_, n) => {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    return c >>> 0;
  });
  const crc = (buf: Buffer) => {
    let c = 0xffffffff;
    for (const b of buf) c = crcTable[(c ^ b) & 0xff]! ^ (c >>> 8);
    return (c ^ 0xffffffff) >>> 0;
  };
  const chunk = (type: string, data: Buffer) => {
    const len = Buffer.alloc(4);
    len.writeUInt32BE(data.length);
    const body = Buffer.concat([Buffer.from(type, "ascii"), data]);
    const sum = Buffer.alloc(4);
    sum.writeUInt32BE(crc(body));
    return Buffer.concat([len, body, sum]);
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 0; // greyscale
  const raw = Buffer.alloc((width + 1) * height);
  for (let y = 0; y < height; y++) {
    raw[y * (width + 1)] = 0;
    for (let x = 0; x < width; x++) raw[y * (width + 1) + 1 + x] = y > 20 && y < 60 && x % 12 < 6 ? 40 : 220;
  }
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk("IHDR", ihdr),
    chunk("IDAT", deflateSync(raw)),
    chunk("IEND", Buffer.alloc(0)),
  ]);
}

async function noHorizontalOverflow(page: Page) {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(overflow, "nothing wider than the screen").toBeLessThanOrEqual(0);
}

test.describe("registers", () => {
  test("a branch manager adds an appliance and a cylinder, and sees the fill gauge and the requalification due", async ({ browser }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus, { viewport: { width: 1280, height: 900 } });
    const page = await manager.newPage();

    // The appliance, with a new site and a new customer.
    await page.goto("/appliances");
    await expect(page.getByRole("heading", { name: "Appliances", exact: true })).toBeVisible();
    await expect(page.getByTestId("appliance-row").first()).toBeVisible();
    await snap(page, "registers-appliances-list-manager");
    await page.getByRole("link", { name: "Add an appliance" }).click();
    await expect(page.getByRole("heading", { name: "Add an appliance" })).toBeVisible();
    const tag = `ZREG-RTU-${RUN}`;
    await page.getByLabel("A new site").check();
    await page.getByLabel("Site name").fill(`Quarry Road depot ${RUN}`);
    await page.getByLabel("Address").fill("5 Quarry Road");
    await page.getByLabel("A new customer").check();
    await page.getByLabel("Customer name").fill(`Quarry Road Storage ${RUN}`);
    await page.getByLabel("Tag", { exact: true }).fill(tag);
    await page.getByLabel("Kind of appliance").selectOption("packaged_rooftop");
    await page.getByLabel("Description").fill("Rooftop unit over the loading bay");
    await page.getByLabel("Refrigerant", { exact: true }).fill("r410a");
    await page.getByLabel("Full charge", { exact: true }).fill("18.5");
    await page.getByLabel("Unit of the full charge").selectOption("lb");
    await page.getByLabel("Installed on").fill("2021-05-04");
    await expect(page.getByTestId("derived-preview")).toContainText("Type II or Universal");
    await expect(page.getByTestId("derived-preview")).toContainText("High pressure");
    await snap(page, "registers-appliance-form-filled");
    await page.getByRole("button", { name: "Add appliance" }).click();

    await expect(page).toHaveURL(/\/appliances\/\d+\?saved=created/);
    await expect(page.getByRole("status")).toContainText("Appliance added");
    await expect(page.getByRole("heading", { level: 1 })).toContainText(tag);
    await expect(page.getByTestId("certification-needed")).toHaveText("Type II or Universal");
    await expect(page.getByTestId("full-charge")).toHaveText("18.50 lb");
    await expect(page.getByTestId("deadlines")).toContainText("No leak-repair deadline is open");
    await expect(page.getByTestId("leak-chart")).toContainText("No refrigerant has been added");
    const applianceUrl = page.url();

    // Correcting the full charge asks for a reason and keeps the previous value.
    await page.getByRole("link", { name: "Edit" }).click();
    await page.getByLabel("Full charge", { exact: true }).fill("21");
    await page.getByRole("button", { name: "Save changes" }).click();
    await expect(page.getByRole("alert").filter({ hasText: "Say why the full charge is corrected" })).toBeVisible();
    await expect(page.getByLabel("Reason for the change")).toHaveAttribute("aria-invalid", "true");
    await page.getByLabel("Reason for the change").fill("Nameplate read again: 21 lb");
    await page.getByRole("button", { name: "Save changes" }).click();
    await expect(page).toHaveURL(/saved=updated/);
    await expect(page.getByTestId("full-charge")).toHaveText("21.00 lb");
    const correction = page.getByTestId("amendment").first();
    await expect(correction).toContainText("Nameplate read again: 21 lb");
    await expect(correction).toContainText("18.50 lb");
    await expect(correction).toContainText("21.00 lb");
    await snap(page, "registers-appliance-detail-after-correction");

    // The appliance is listed with the branch's filters.
    await page.goto("/appliances");
    await page.getByLabel("Search").fill(tag);
    await page.getByLabel("Kind").selectOption("packaged_rooftop");
    const row = page.getByTestId("appliance-row").filter({ hasText: tag });
    await expect(row).toHaveCount(1);
    await expect(row).toContainText("21.00 lb");
    await expect(row).toContainText("Type II or Universal");

    // Retiring it keeps it in the register, with the date and the reason in its history.
    await page.goto(applianceUrl);
    await page.getByRole("button", { name: "Change status" }).click();
    await page.getByLabel("New status").selectOption("retired");
    await page.getByLabel("Why").fill("Replaced by a larger unit");
    await page.getByRole("button", { name: "Change status" }).click();
    await expect(page.getByTestId("amendment").first()).toContainText("Replaced by a larger unit");
    await expect(page.getByRole("heading", { level: 1 }).locator("..")).toContainText("Retired");

    // The cylinder: requalified a little under five years ago, so it falls due soon.
    const lastRequalified = dateIn("America/New_York", { years: -5, days: 40 });
    const serial = `ZREG-C-${RUN}`;
    await page.goto("/cylinders/new");
    await expect(page.getByText("Never heat a cylinder")).toBeVisible();
    await expect(page.getByText("Local codes and licensed practice take precedence")).toBeVisible();
    await page.getByLabel("Serial number").fill(serial);
    await page.getByLabel("Specification").fill("dot-4ba400");
    await page.getByLabel("Water capacity", { exact: true }).fill("50");
    await page.getByLabel("Tare weight", { exact: true }).fill("17.5");
    await page.getByLabel("Last requalified on").fill(lastRequalified);
    await page.getByRole("button", { name: "Add cylinder" }).click();
    await expect(page).toHaveURL(/\/cylinders\/\d+\?saved=created/);
    await expect(page.getByRole("heading", { level: 1 })).toContainText(serial);
    const due = dateIn("America/New_York", { days: 40 });
    await expect(page.getByTestId("requalification-due")).toHaveText(due);
    await expect(page.getByTestId("requalification").getByTestId("requalification-badge")).toContainText(
      `Requalification due soon: ${due}`,
    );
    await expect(page.getByTestId("fill-percent")).toHaveText("Empty");

    // A scale reading sets the contents; the gauge shows them against the maximum in words and marks.
    await page.getByLabel("Scale reading", { exact: true }).fill("40");
    await page.getByRole("combobox", { name: /^Refrigerant/ }).fill("R-410A");
    await expect(page.getByTestId("weighing-preview")).toContainText("Net contents 22.50 lb");
    await page.getByRole("button", { name: "Record weighing" }).click();
    await expect(page.getByText("Weighing recorded.")).toBeVisible();
    await expect(page.getByTestId("net-contents")).toHaveText("22.50 lb R-410A");
    await expect(page.getByTestId("fill-percent")).toHaveText(/^\d+ % of the maximum fill$/);
    const percent = Number((await page.getByTestId("fill-percent").innerText()).split(" ")[0]);
    expect(percent).toBeGreaterThan(0);
    expect(percent).toBeLessThanOrEqual(100);
    await expect(page.getByTestId("fill-state")).toContainText(percent >= 90 ? "Close to the maximum" : "Within the maximum fill");
    const meter = page.getByRole("meter", { name: "Cylinder fill" });
    await expect(meter).toHaveAttribute("aria-valuetext", /22\.50 lb of .* net/);
    await expect(page.getByTestId("weighing-row")).toHaveCount(1);
    await snap(page, "registers-cylinder-detail-manager");

    // Listed with its requalification state.
    await page.goto("/cylinders");
    await page.getByLabel("Search").fill(serial);
    await page.getByLabel("Requalification").selectOption("due_soon");
    const cylinderRow = page.getByTestId("cylinder-row").filter({ hasText: serial });
    await expect(cylinderRow).toHaveCount(1);
    await expect(cylinderRow.getByTestId("requalification-badge")).toHaveAttribute("data-state", "due_soon");
    await expect(cylinderRow.getByRole("meter", { name: "Fill" })).toBeVisible();
    await snap(page, "registers-cylinders-list-manager");

    // Another branch's manager cannot see either record.
    const other = await contextAs(browser, DEMO.managerTucson);
    const applianceId = new URL(applianceUrl).pathname.split("/").pop();
    expect((await other.request.get(`/api/appliances/${applianceId}`)).status()).toBe(404);
    const found = await (await other.request.get(`/api/cylinders?q=${encodeURIComponent(serial)}`)).json();
    expect(found.total).toBe(0);
    await Promise.all([manager.close(), other.close()]);
  });

  test("an invalid entry shows the field's error and writes nothing", async ({ browser }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus, phone);
    const page = await manager.newPage();
    const serial = `ZREG-BAD-${RUN}`;
    await page.goto("/cylinders/new");
    await page.getByLabel("Serial number").fill(serial);
    await page.getByLabel("Water capacity", { exact: true }).fill("50");
    await page.getByRole("button", { name: "Add cylinder" }).click();
    await expect(page.getByText("Enter the tare weight stamped on the cylinder (TW)")).toBeVisible();
    await expect(page.getByLabel("Tare weight", { exact: true })).toHaveAttribute("aria-invalid", "true");
    await expect(page.getByRole("alert").filter({ hasText: "Some fields need attention" })).toBeVisible();
    await noHorizontalOverflow(page);
    await snap(page, "registers-cylinder-form-phone-errors");
    expect((await (await manager.request.get(`/api/cylinders?q=${serial}`)).json()).total).toBe(0);

    await page.goto("/appliances/new");
    await page.getByLabel("Kind of appliance").selectOption("small_appliance");
    await page.getByLabel("Full charge", { exact: true }).fill("9");
    await page.getByLabel("Refrigerant", { exact: true }).fill("R-999Q");
    await page.getByRole("button", { name: "Add appliance" }).click();
    await expect(page.getByText(/not in the catalogue/)).toBeVisible();
    await expect(page.getByText("Give the appliance a tag people will recognise, e.g. RTU-07")).toBeVisible();
    await snap(page, "registers-appliance-form-phone-errors");

    // The server refuses on its own, naming the field, and writes nothing.
    const branches = (await (await manager.request.get("/api/lookup/branches")).json()).rows as { id: number; code: string }[];
    const before = (await (await manager.request.get("/api/appliances?pageSize=1")).json()).total as number;
    const res = await manager.request.post("/api/appliances", {
      data: {
        branchId: branches[0]!.id,
        siteChoice: "new",
        newSiteName: "Nowhere",
        customerChoice: "none",
        tag: `ZREG-SA-${RUN}`,
        description: "Drinking-water cooler",
        category: "small_appliance",
        refrigerant: "R-134a",
        fullChargeAmount: 9,
        fullChargeUnit: "lb",
        fullChargeMethod: "nameplate",
        factorySealed: true,
      },
    });
    expect(res.status()).toBe(400);
    const body = await res.json();
    expect(body.error.fieldErrors.fullChargeAmount[0]).toContain("5 lb");
    const after = (await (await manager.request.get("/api/appliances?pageSize=1")).json()).total as number;
    expect(after).toBe(before);
    await manager.close();
  });

  test("a technician on a phone views a cylinder of their branch, read-only", async ({ browser }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    await page.goto("/cylinders");
    await expect(page.getByRole("heading", { name: "Cylinders", exact: true })).toBeVisible();
    await expect(page.getByRole("link", { name: "Add a cylinder" })).toHaveCount(0);
    const card = page.getByTestId("cylinder-row-card").first();
    await expect(card).toBeVisible();
    await expect(card.getByTestId("requalification-badge")).toBeVisible();
    await noHorizontalOverflow(page);
    await snap(page, "registers-cylinders-list-technician-phone");
    const serial = (await card.locator("span.font-semibold").first().innerText()).trim();
    expect(serial.startsWith("COL-") || serial.startsWith("ZREG-")).toBe(true);
    await card.click();
    await expect(page.getByRole("heading", { level: 1 })).toContainText(serial);
    await expect(page.getByTestId("fill-gauge")).toBeVisible();
    await expect(page.getByTestId("fill-percent")).toBeVisible();
    await expect(page.getByTestId("requalification")).toContainText("Next due");
    await expect(page.getByText("Never heat a cylinder")).toBeVisible();
    await expect(page.getByRole("link", { name: "Edit" })).toHaveCount(0);
    await expect(page.getByTestId("weighing-form")).toHaveCount(0);
    await noHorizontalOverflow(page);
    await snap(page, "registers-cylinder-detail-technician-phone");
    // The server agrees: the technician may not change it.
    const id = new URL(page.url()).pathname.split("/").pop();
    const weigh = await tech.request.post(`/api/cylinders/${id}/weighings`, {
      data: { weighedOn: dateIn("America/New_York"), grossAmount: 30, grossUnit: "lb", refrigerant: "R-410A" },
    });
    expect(weigh.status()).toBe(403);
    await tech.close();
  });

  test("a branch manager registers recovery equipment and attaches its certification label", async ({ browser }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus, { viewport: { width: 1280, height: 900 } });
    const page = await manager.newPage();
    const serial = `ZREG-RE-${RUN}`;
    await page.goto("/equipment/new");
    await page.getByLabel("Serial number").fill(serial);
    await page.getByLabel("Make and model").fill("Invented Draw 400 recovery unit");
    await page.getByLabel("Manufactured on").fill("1992-03-10");
    await expect(page.getByText("Made before 15 Nov 1993")).toBeVisible();
    await page.getByLabel("Certification unknown").check();
    await page.getByRole("button", { name: "Add equipment" }).click();
    await expect(page).toHaveURL(/\/equipment\/\d+\?saved=created/);
    await expect(page.getByTestId("evacuation-claims")).toContainText("before 15 November 1993");
    // 40 CFR 82.156 Table 1: medium pressure under 200 lb — 4 in Hg with equipment made before 15 Nov 1993.
    await expect(page.getByTestId("claim-row").filter({ hasText: "Medium pressure" })).toContainText("4 in Hg vacuum");
    await expect(page.getByTestId("evacuation-claims")).toContainText("Only certified recovery equipment may be used");

    // A renamed executable is refused; a real photo is stored and shown.
    const upload = page.getByLabel("Upload the evidence");
    await upload.setInputFiles({
      name: "label.jpg",
      mimeType: "image/jpeg",
      buffer: Buffer.from("MZ\x90\x00\x03\x00\x00\x00 not really an image"),
    });
    await page.getByRole("button", { name: "Upload", exact: true }).click();
    await expect(page.getByText("Only photos (JPEG, PNG, WebP, HEIC) and PDF documents can be uploaded")).toBeVisible();
    // A name that looks like a path is refused, as for every other upload.
    await upload.setInputFiles({ name: "../../label photo.png", mimeType: "image/png", buffer: labelPng() });
    await page.getByRole("button", { name: "Upload", exact: true }).click();
    await expect(page.getByText(/file name is not accepted/)).toBeVisible();
    await upload.setInputFiles({ name: "label photo.png", mimeType: "image/png", buffer: labelPng() });
    await page.getByRole("button", { name: "Upload", exact: true }).click();
    await expect(page.getByText("Evidence uploaded.")).toBeVisible();
    const img = page.getByRole("img", { name: `Certification label of recovery equipment ${serial}` });
    await expect(img).toBeVisible();
    await expect.poll(async () => img.evaluate((el) => (el as HTMLImageElement).naturalWidth)).toBe(160);
    const id = new URL(page.url()).pathname.split("/").pop();
    const file = await manager.request.get(`/api/equipment/${id}/evidence`);
    expect(file.status()).toBe(200);
    expect(file.headers()["content-type"]).toBe("image/png");
    expect(file.headers()["content-disposition"]).not.toContain("label photo");

    // Marking it certified is a correction with a reason, kept in its history.
    await page.getByRole("link", { name: "Edit" }).click();
    await page.getByLabel("Certified", { exact: true }).check();
    await page.getByLabel("Reason for the change").fill("Label photographed and checked");
    await page.getByRole("button", { name: "Save changes" }).click();
    await expect(page).toHaveURL(/saved=updated/);
    await expect(page.getByTestId("amendment").first()).toContainText("Label photographed and checked");
    await expect(page.getByTestId("evacuation-claims")).not.toContainText("Only certified recovery equipment may be used");
    await snap(page, "registers-equipment-detail-manager");

    // Another branch's manager and another organisation see nothing of it.
    const other = await contextAs(browser, DEMO.otherOrgManager);
    expect((await other.request.get(`/api/equipment/${id}`)).status()).toBe(404);
    expect((await other.request.get(`/api/equipment/${id}/evidence`)).status()).toBe(404);
    await Promise.all([manager.close(), other.close()]);
  });

  test("the compliance officer reads a leaking rack's chart and its overdue repair", async ({ browser }) => {
    const officer = await contextAs(browser, DEMO.officer, { viewport: { width: 1280, height: 1000 } });
    const page = await officer.newPage();
    const list = await (await officer.request.get(`/api/appliances?q=${REGISTER_DEMO.leakingRack}`)).json();
    const rack = list.rows.find((r: { tag: string }) => r.tag === REGISTER_DEMO.leakingRack);
    await page.goto(`/appliances/${rack.id}`);
    await expect(page.getByRole("heading", { level: 1 })).toContainText(REGISTER_DEMO.leakingRack);
    const deadline = page.getByTestId("deadline").first();
    await expect(deadline).toContainText("Overdue since 2026-10-12");
    await expect(deadline).toContainText("Repair the leak");
    const chart = page.getByTestId("leak-chart");
    await expect(chart.locator(".recharts-surface").first()).toBeVisible();
    await expect(chart).toContainText("Threshold 20 %");
    await expect(chart).toContainText("Leak rate (%)");
    await expect(chart.getByTestId("leak-event").first()).toContainText("Over the threshold");
    await expect(page.getByTestId("appliance-job").first()).toBeVisible();
    await expect(page.getByRole("link", { name: "Edit" })).toHaveCount(0);
    await snap(page, "registers-appliance-leak-chart-officer");

    // The overfilled and overdue cylinders say so in words.
    await page.goto("/cylinders");
    await page.getByLabel("Search").fill(REGISTER_DEMO.overfilledCylinder);
    await expect(page.getByTestId("cylinder-row").filter({ hasText: REGISTER_DEMO.overfilledCylinder })).toContainText("over");
    await page.getByLabel("Search").fill(REGISTER_DEMO.overdueCylinder);
    await expect(
      page.getByTestId("cylinder-row").filter({ hasText: REGISTER_DEMO.overdueCylinder }).getByTestId("requalification-badge"),
    ).toContainText("overdue since 2025-02-18");
    await snap(page, "registers-cylinders-overdue-officer");
    await officer.close();
  });
});
