import { devices, type APIRequestContext } from "@playwright/test";
import { DEMO, contextAs, expect, snap, test } from "./fixtures";

const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 }, defaultBrowserType: undefined };
delete (phone as { defaultBrowserType?: unknown }).defaultBrowserType;

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

/** The last in-service Columbus appliance of a category holding R-410A (never a planted-gap unit). */
async function pick(api: APIRequestContext, q: string, category: string): Promise<ApplianceOption> {
  const { rows } = (await (await api.get(`/api/lookup/appliances?limit=50&q=${q}`)).json()) as { rows: ApplianceOption[] };
  const found = rows
    .filter((a) => a.category === category && a.refrigerant === "R-410A" && !/-9\d\d$/.test(a.tag))
    .sort((a, b) => (a.tag < b.tag ? 1 : -1))[0];
  expect(found, `an R-410A ${category} in Columbus`).toBeTruthy();
  return found!;
}

test.describe("retired units scrapped at the shop", () => {
  test("a technician records the recovery from two retired units at once on a phone; each gets its record or signed statement", async ({
    browser,
  }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus);
    const small = await pick(manager.request, "COL-SA-", "small_appliance");
    const split = await pick(manager.request, "COL-RES-", "residential_split");
    // The branch manager retires both units: they wait at the shop to be scrapped.
    for (const a of [small, split]) {
      const res = await manager.request.post(`/api/appliances/${a.id}/status`, {
        data: { status: "retired", on: columbusToday(), reason: "Swapped out; waiting at the shop to be scrapped" },
      });
      expect(res.status(), await res.text()).toBe(200);
    }
    const cylinders = (
      (await (await manager.request.get(`/api/lookup/cylinders?branchId=${split.branchId}`)).json()) as {
        rows: { id: number; serial: string; contentsG: number; lastRequalifiedOn: string | null }[];
      }
    ).rows;
    const cylinder = cylinders.find((c) => c.contentsG === 0 && (c.lastRequalifiedOn ?? "") > "2022-01-01");
    expect(cylinder, "an empty, requalified Columbus cylinder").toBeTruthy();
    const equipment = (
      (await (await manager.request.get(`/api/lookup/equipment?branchId=${split.branchId}`)).json()) as {
        rows: { id: number; serial: string; certificationState: string; systemDependent: boolean; smallApplianceOnly: boolean }[];
      }
    ).rows.find((e) => e.certificationState === "certified" && !e.systemDependent && !e.smallApplianceOnly);
    await manager.close();

    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    await page.goto("/disposals/shop");
    await expect(page.getByRole("heading", { name: "Scrap run at the shop" })).toBeVisible();
    await expect(page.getByText("Refrigerant displaces oxygen")).toBeVisible();
    for (const a of [small, split]) await page.getByTestId("shop-unit").filter({ hasText: a.tag }).getByRole("checkbox").check();
    const grams = (a: ApplianceOption) => a.fullChargeG * 0.9;
    await page.getByLabel(`Amount recovered from ${small.tag}`).fill((grams(small) / 453.59237).toFixed(2));
    await page.getByLabel(`Evacuation level reached on ${small.tag}`).fill("4");
    await page.getByTestId("shop-unit").filter({ hasText: small.tag }).getByRole("radio", { name: "Not running" }).check();
    await page.getByLabel(`Amount recovered from ${split.tag}`).fill((grams(split) / 453.59237).toFixed(2));
    await page.getByLabel(`Evacuation level reached on ${split.tag}`).fill("4");
    await page
      .getByRole("group", { name: "Recovery cylinder" })
      .getByRole("radio", { name: new RegExp(cylinder!.serial) })
      .check();
    await page
      .getByRole("group", { name: "Recovery equipment" })
      .getByRole("radio", { name: new RegExp(equipment!.serial) })
      .check();
    await page.getByRole("radio", { name: "Clamp-on piercing pliers (temporary)" }).check();
    await page.getByRole("radio", { name: "Yes, removed" }).check();
    await page.getByRole("checkbox", { name: /I recovered the refrigerant/ }).check();
    expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
    await snap(page, "disposal-shop-run-phone-filled");
    await page.getByRole("button", { name: "Save 2 disposals" }).click();

    await expect(page.getByRole("status").filter({ hasText: "Saved 2 disposals: 1 record and 1 signed statement" })).toBeVisible();
    await expect(page.getByTestId("shop-empty")).toBeVisible();
    await snap(page, "disposal-shop-run-phone-saved");

    const statements = (await (await tech.request.get(`/api/disposals?type=statement&q=${small.tag}`)).json()) as {
      rows: { applianceTag: string; who: string }[];
    };
    expect(statements.rows.map((r) => [r.applianceTag, r.who])).toEqual([[small.tag, "Marcus Delacroix-Byrd"]]);
    const records = (await (await tech.request.get(`/api/disposals?type=record&q=${split.tag}`)).json()) as {
      rows: { applianceTag: string; refrigerant: string }[];
    };
    expect(records.rows.map((r) => [r.applianceTag, r.refrigerant])).toEqual([[split.tag, "R-410A"]]);
    const jobs = (await (await tech.request.get(`/api/jobs?kind=disposal&q=${split.tag}`)).json()) as { rows: { applianceTag: string }[] };
    expect(jobs.rows.map((r) => r.applianceTag)).toContain(split.tag);
    await tech.close();
  });

  test("a scrap run that would take a cylinder past its safe fill asks for a confirmation first, then saves", async ({ browser }) => {
    const manager = await contextAs(browser, DEMO.managerColumbus);
    // Another split than the test above takes (the second newest), retired to wait at the shop.
    const { rows } = (await (await manager.request.get(`/api/lookup/appliances?limit=50&q=COL-RES-`)).json()) as {
      rows: ApplianceOption[];
    };
    const split = rows
      .filter((a) => a.category === "residential_split" && a.refrigerant === "R-410A" && !/-9\d\d$/.test(a.tag))
      .sort((a, b) => (a.tag < b.tag ? 1 : -1))[1]!;
    expect(split, "a second R-410A split in Columbus").toBeTruthy();
    const retired = await manager.request.post(`/api/appliances/${split.id}/status`, {
      data: { status: "retired", on: columbusToday(), reason: "Swapped out; waiting at the shop to be scrapped" },
    });
    expect(retired.status(), await retired.text()).toBe(200);
    const cylinder = (
      (await (await manager.request.get(`/api/lookup/cylinders?branchId=${split.branchId}`)).json()) as {
        rows: { id: number; serial: string; contentsG: number; waterCapacityG: number; lastRequalifiedOn: string | null }[];
      }
    ).rows.find((c) => c.contentsG === 0 && (c.lastRequalifiedOn ?? "") > "2022-01-01");
    expect(cylinder, "an empty, requalified Columbus cylinder").toBeTruthy();
    const equipment = (
      (await (await manager.request.get(`/api/lookup/equipment?branchId=${split.branchId}`)).json()) as {
        rows: { serial: string; certificationState: string; systemDependent: boolean; smallApplianceOnly: boolean }[];
      }
    ).rows.find((e) => e.certificationState === "certified" && !e.systemDependent && !e.smallApplianceOnly);
    await manager.close();

    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    await page.goto("/disposals/shop");
    await page.getByTestId("shop-unit").filter({ hasText: split.tag }).getByRole("checkbox").check();
    // 95 % of the water capacity: above the safe fill (Guideline K, about 80 % for R-410A) but under
    // liquid-full, so possible and asked about, never refused outright.
    await page.getByLabel(`Amount recovered from ${split.tag}`).fill(((cylinder!.waterCapacityG * 0.95) / 453.59237).toFixed(2));
    await page.getByLabel(`Evacuation level reached on ${split.tag}`).fill("4");
    await page
      .getByRole("group", { name: "Recovery cylinder" })
      .getByRole("radio", { name: new RegExp(cylinder!.serial) })
      .check();
    await page
      .getByRole("group", { name: "Recovery equipment" })
      .getByRole("radio", { name: new RegExp(equipment!.serial) })
      .check();
    await page.getByRole("radio", { name: "Clamp-on piercing pliers (temporary)" }).check();
    await page.getByRole("radio", { name: "Yes, removed" }).check();
    await page.getByRole("checkbox", { name: /I recovered the refrigerant/ }).check();
    await page.getByRole("button", { name: "Save 1 disposal" }).click();

    const confirm = page.getByRole("checkbox", { name: /I confirm the cylinder now holds more than its safe fill/ });
    await expect(page.getByText(/above its safe fill/).first()).toBeVisible();
    await expect(page.getByText("Do not move or heat an overfilled cylinder", { exact: false })).toBeVisible();
    await snap(page, "disposal-shop-run-phone-over-fill");
    await confirm.check();
    await page.getByRole("button", { name: "Save 1 disposal" }).click();
    await expect(page.getByRole("status").filter({ hasText: "Saved 1 disposal" })).toBeVisible();
    await tech.close();
  });
});
