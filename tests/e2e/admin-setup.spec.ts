import { DEMO, contextAs, expect, snap, test } from "./fixtures";

/**
 * Setting a company up in the browser: the owner (of the second organisation, so the first stays as
 * the other specs expect) opens a branch, corrects it, archives it, and changes the settings — each
 * with its explanation and default — then puts them back. Other roles see what they may: the
 * officer reads the settings without changing them, a branch manager sees their branch's people,
 * and a technician's page shows their certifications and jobs.
 */

test.describe.configure({ mode: "serial" });

const stamp = Date.now().toString(36);

test("the owner opens a branch, corrects it and archives it", async ({ browser }) => {
  const owner = await contextAs(browser, DEMO.otherOrgOwner);
  const page = await owner.newPage();
  await page.goto("/admin/branches");
  await expect(page.getByTestId("branch-row").getByRole("link", { name: /^Boise BOI/ })).toBeVisible();
  await page.getByRole("link", { name: "Open a branch" }).click();

  await page.getByRole("button", { name: "Open the branch" }).click();
  await expect(page.getByText("Enter the branch name")).toBeVisible();
  await expect(page.getByText("Choose the branch's time zone")).toBeVisible();
  const name = `Twin Falls ${stamp}`;
  await page.getByLabel("Name").fill(name);
  await page.getByLabel("Code").fill(`tf${stamp.slice(-4)}`);
  await page.getByLabel("Address (optional)").fill("400 Canal Street, Twin Falls");
  await page.getByLabel("Country").selectOption("US");
  await page.getByLabel("State").fill("ID");
  await page.getByLabel("Time zone").fill("Mars/Olympus_Mons");
  await page.getByRole("radio", { name: "Kilograms (kg)" }).check();
  await page.getByRole("button", { name: "Open the branch" }).click();
  await expect(page.getByText("Choose a time zone from the list")).toBeVisible();
  await page.getByLabel("Time zone").fill("America/Boise");
  await expect(page.getByText("Local time there now:")).toBeVisible();
  await snap(page, "admin-branch-new");
  await page.getByRole("button", { name: "Open the branch" }).click();
  await expect(page).toHaveURL(/\/admin\/branches\/\d+\?created=1/);
  await expect(page.getByRole("status")).toContainText(`${name} is open`);

  await page.getByLabel("Name").fill(`${name} Depot`);
  await page.getByRole("button", { name: "Save the branch" }).click();
  await expect(page.getByRole("heading", { name: `${name} Depot` })).toBeVisible();
  await page.getByRole("button", { name: "Archive…" }).click();
  await page.getByRole("button", { name: "Yes, archive" }).click();
  await expect(page.getByRole("button", { name: "Bring the branch back" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Archived", exact: true })).toBeVisible();
  await snap(page, "admin-branch-archived");

  await page.goto("/admin/branches");
  const row = page.getByTestId("branch-row").filter({ hasText: `${name} Depot` });
  await expect(row).toContainText("Archived");
  await expect(row).toContainText("America/Boise");
  await expect(row).toContainText("Kilograms");
  await snap(page, "admin-branches");
  // Archived branches leave the pickers; the invite form offers only open ones.
  await page.goto("/admin/people/invite");
  await expect(page.getByRole("checkbox", { name: /^Boise/ })).toBeVisible();
  await expect(page.getByRole("checkbox", { name: new RegExp(`^${name}`) })).toHaveCount(0);
  await owner.close();
});

test("the owner changes the settings, each explained with its default, and puts them back", async ({ browser }) => {
  const owner = await contextAs(browser, DEMO.otherOrgOwner);
  const page = await owner.newPage();
  await page.goto("/admin/settings");
  const pt = page.getByLabel("Pressure–temperature tolerance for suspected non-condensables");
  await expect(pt).toHaveValue("5");
  await expect(page.getByText(/no regulation sets it, 3–5 psi is usual\. Default: 5 psi\./)).toBeVisible();
  await expect(page.getByText(/49 CFR 180\.209 allows 5, 10 or 12 years/)).toBeVisible();
  // Which rules apply follows where each branch is; the page says which branches each pack covers.
  await expect(page.getByTestId("pack-coverage-us_federal")).toContainText("Boise");
  await expect(page.getByTestId("pack-coverage-eu")).toContainText("Covers 0 branches.");

  await pt.fill("-2");
  await page.getByRole("button", { name: "Save the settings" }).click();
  await expect(page.getByText("The tolerance cannot be negative")).toBeVisible();

  await pt.fill("3");
  await page.getByLabel("Cylinder requalification period").selectOption("10");
  await page.getByRole("checkbox", { name: /Stricter cylinder fill/ }).check();
  await page.getByRole("button", { name: "Save the settings" }).click();
  await expect(page.getByRole("status")).toContainText("Settings saved");
  await snap(page, "admin-settings-changed");

  await page.reload();
  await expect(pt).toHaveValue("3");
  await expect(page.getByLabel("Cylinder requalification period")).toHaveValue("10");

  await page.getByRole("button", { name: "Put back the defaults" }).click();
  await page.getByRole("button", { name: "Save the settings" }).click();
  await expect(page.getByRole("status")).toContainText("Settings saved");
  const saved = (await (await page.request.get("/api/admin/settings")).json()) as {
    rulePacks: string[];
    settings: Record<string, unknown>;
  };
  expect(saved.rulePacks).toEqual(["us_federal"]);
  expect(saved.settings).toMatchObject({ ptTolerancePsi: 5, requalificationYears: 5, strictFill130F: false });
  await owner.close();
});

test("the compliance officer reads the settings but cannot change them", async ({ browser }) => {
  const officer = await contextAs(browser, DEMO.officer);
  const page = await officer.newPage();
  await page.goto("/admin/settings");
  await expect(page.getByText("Only an owner can change them.")).toBeVisible();
  await expect(page.getByLabel("Name")).toBeDisabled();
  await expect(page.getByRole("button", { name: "Save the settings" })).toHaveCount(0);
  await snap(page, "admin-settings-officer");
  await officer.close();
});

test("a technician's page shows their certifications, in words, and their jobs", async ({ browser }) => {
  const owner = await contextAs(browser, DEMO.owner);
  const page = await owner.newPage();
  const found = (await (await page.request.get("/api/admin/people?q=kai.lindqvist")).json()) as { rows: { id: number }[] };
  await page.goto(`/admin/people/${found.rows[0]!.id}`);
  await expect(page.getByRole("heading", { name: "Kai Lindqvist" })).toBeVisible();
  const certs = page.getByTestId("certification");
  await expect(certs).toHaveCount(2);
  await expect(certs.filter({ hasText: "Rejected" })).toContainText("Reason:");
  await expect(certs.filter({ hasText: "Verified" })).toHaveCount(1);
  await expect(page.getByTestId("person-job-row").first()).toBeVisible();
  await expect(page.getByTestId("person-job-row").filter({ hasNotText: "Denver" })).toHaveCount(0);
  await snap(page, "admin-technician-page");
  await owner.close();
});

test("a branch manager sees the people of their branch, read-only", async ({ browser }) => {
  const manager = await contextAs(browser, DEMO.managerColumbus);
  const page = await manager.newPage();
  await page.goto("/");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "People" }).click();
  await expect(page).toHaveURL(/\/admin\/people$/);
  await expect(page.getByRole("link", { name: "Invite a person" })).toHaveCount(0);
  const rows = page.getByTestId("person-row");
  await expect(rows.first()).toBeVisible();
  await expect(rows.filter({ hasNotText: "Columbus" })).toHaveCount(0);
  await snap(page, "admin-people-manager");
  await rows.filter({ hasText: "Marcus Delacroix-Byrd" }).getByRole("link").click();
  await expect(page.getByRole("heading", { name: "Marcus Delacroix-Byrd" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Certifications" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Roles and branches" })).toHaveCount(0);
  await expect(page.getByRole("button", { name: "Deactivate…" })).toHaveCount(0);
  for (const path of ["/admin/branches", "/admin/inspectors", "/admin/settings"]) {
    await page.goto(path);
    await expect(page.getByText("Not available to you")).toBeVisible();
  }
  await manager.close();
});
