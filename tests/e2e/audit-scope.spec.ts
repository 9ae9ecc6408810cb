import { DEMO, contextAs, expect, snap, test } from "./fixtures";
import { allFindings, todayUtc, waitForAudit } from "./audit-helpers";

/**
 * What an audit covers is what the officer chose: the branches ticked on the new-audit screen (and
 * nothing else), and for each branch only the rule packs of the place it is in. The second demo
 * organisation has only US branches, so no audit of it ever shows an EU finding; the settings page
 * says which branches each pack covers.
 */

interface Lookup {
  rows: { id: number; name: string }[];
}

test.describe.serial("audit scope", () => {
  test("an officer audits two of the US branches and only those two run", async ({ browser }) => {
    const officer = await contextAs(browser, DEMO.officer);
    const page = await officer.newPage();
    await page.goto("/audits/new");
    await expect(page.getByRole("heading", { name: "New audit" })).toBeVisible();
    const all = page.getByLabel(/^All branches \(\d+\)$/);
    await expect(all).toBeChecked();
    await all.uncheck();
    await page.getByLabel("Columbus", { exact: true }).check();
    await page.getByLabel("Denver", { exact: true }).check();
    await expect(all).not.toBeChecked();
    await expect(page.getByTestId("audit-scope")).toHaveText(/^Audits 2 of \d+ branches: Columbus, Denver\.$/);
    // Each pack says which of the chosen branches it applies to.
    await expect(page.getByText("Applies to every chosen branch.")).toBeVisible();
    await expect(page.getByText("Applies to none of the chosen branches.")).toBeVisible();
    await page.getByLabel("From", { exact: true }).fill("2024-12-01");
    await page.getByLabel("To", { exact: true }).fill(todayUtc());
    await snap(page, "audit-new-two-branches");
    await page.getByRole("button", { name: "Start the audit" }).click();
    await expect(page).toHaveURL(/\/audits\/\d+$/);
    const id = Number(new URL(page.url()).pathname.split("/").pop());
    await expect(page.getByTestId("audit-state")).toHaveText("Finished", { timeout: 90_000 });
    await expect(page.getByTestId("audit-branches")).toHaveText("Branches: Columbus, Denver");
    await snap(page, "audit-two-branches-finished");

    const audit = await waitForAudit(officer.request, id);
    const branches = ((await (await officer.request.get("/api/lookup/branches")).json()) as Lookup).rows;
    const idOf = (name: string) => branches.find((b) => b.name === name)!.id;
    expect([...audit.branchIds].sort((a, b) => a - b)).toEqual([idOf("Columbus"), idOf("Denver")].sort((a, b) => a - b));
    expect(audit.summary!.branches.map((b) => b.branchName).sort()).toEqual(["Columbus", "Denver"]);
    const seen = await allFindings(officer.request, { auditId: id });
    expect(seen.length).toBeGreaterThan(0);
    expect(new Set(seen.map((f) => f.branchName))).toEqual(new Set(["Columbus", "Denver"]));
    await officer.close();
  });

  test("the API runs exactly the branches it is given, and the EU branch gets only EU findings", async ({ browser }) => {
    const officer = await contextAs(browser, DEMO.officer);
    const branches = ((await (await officer.request.get("/api/lookup/branches")).json()) as Lookup).rows;
    const rotterdam = branches.find((b) => b.name === "Rotterdam")!;
    const tucson = branches.find((b) => b.name === "Tucson")!;
    const res = await officer.request.post("/api/audits", {
      data: { branchIds: [rotterdam.id, tucson.id], periodFrom: "2024-12-01", periodTo: todayUtc(), packs: ["us_federal", "eu"] },
    });
    expect(res.status()).toBe(201);
    const audit = await waitForAudit(officer.request, ((await res.json()) as { id: number }).id);
    expect(audit.summary!.branches.map((b) => b.branchName).sort()).toEqual(["Rotterdam", "Tucson"]);
    const found = await allFindings(officer.request, { auditId: audit.id });
    const euRules = (name: string) => found.filter((f) => f.branchName === name && f.ruleId.startsWith("CT-EU-"));
    expect(euRules("Rotterdam").length).toBeGreaterThan(0);
    expect(found.filter((f) => f.branchName === "Rotterdam").every((f) => f.ruleId.startsWith("CT-EU-"))).toBe(true);
    expect(euRules("Tucson")).toEqual([]);
    await officer.close();
  });

  test("a US-only organisation never sees an EU finding, even from an audit that includes the EU pack", async ({ browser }) => {
    const owner = await contextAs(browser, DEMO.otherOrgOwner);
    const places = ((await (await owner.request.get("/api/admin/branches?pageSize=200")).json()) as { rows: { country: string }[] }).rows;
    expect(places.length).toBeGreaterThan(0);
    expect(places.every((b) => b.country === "US")).toBe(true);
    const branches = ((await (await owner.request.get("/api/lookup/branches")).json()) as Lookup).rows;
    const res = await owner.request.post("/api/audits", {
      data: { branchIds: branches.map((b) => b.id), periodFrom: "2024-12-01", periodTo: todayUtc(), packs: ["us_federal", "eu"] },
    });
    expect(res.status()).toBe(201);
    const audit = await waitForAudit(owner.request, ((await res.json()) as { id: number }).id);
    // Each branch ran with the packs of its place only: US federal, never the EU pack.
    const ran = audit.summary!.branches as unknown as { branchName: string; packs: string[] }[];
    expect(ran.length).toBe(branches.length);
    for (const b of ran) expect(b.packs, b.branchName).toEqual(["us_federal"]);
    const found = await allFindings(owner.request);
    expect(found.filter((f) => f.ruleId.startsWith("CT-EU-"))).toEqual([]);

    const page = await owner.newPage();
    await page.goto("/findings?state=all");
    await expect(page.getByRole("heading", { name: "Findings", exact: true })).toBeVisible();
    await expect(page.getByTestId("finding-row").filter({ hasText: "CT-EU-" })).toHaveCount(0);
    await page.goto("/admin/settings");
    await expect(page.getByTestId("pack-coverage-us_federal")).toContainText("Boise (ID, United States)");
    await expect(page.getByTestId("pack-coverage-eu")).toContainText("Covers 0 branches.");
    await snap(page, "settings-pack-coverage-us-only");
    await owner.close();
  });

  test("the settings page says which branches each pack covers, and a branch's place is set on its form", async ({ browser }) => {
    const owner = await contextAs(browser, DEMO.owner);
    const page = await owner.newPage();
    await page.goto("/admin/settings");
    await expect(page.getByRole("heading", { name: "Rules the audits apply, by place" })).toBeVisible();
    await expect(page.getByTestId("pack-coverage-us_federal")).toContainText("Covers 4 branches");
    await expect(page.getByTestId("pack-coverage-eu")).toContainText("Covers 1 branch: Rotterdam (South Holland, Netherlands)");
    await snap(page, "settings-pack-coverage");
    await owner.close();

    // The second organisation opens another US branch (its branches stay in the US).
    const other = await contextAs(browser, DEMO.otherOrgOwner);
    const form = await other.newPage();
    const stamp = Date.now().toString(36);
    await form.goto("/admin/branches/new");
    await form.getByLabel("Name").fill(`Pocatello ${stamp}`);
    await form.getByLabel("Code").fill(`PC${stamp.slice(-4)}`);
    await form.getByLabel("Time zone").fill("America/Boise");
    await form.getByLabel("Country").selectOption("US");
    await expect(form.getByText("Audited against: United States, federal rules.")).toBeVisible();
    await form.getByRole("button", { name: "Open the branch" }).click();
    // A US branch names its state; the error sits beside the field.
    await expect(form.getByLabel("State")).toHaveAttribute("aria-invalid", "true");
    await expect(form.getByText("Choose the state the branch is in")).toBeVisible();
    await form.getByLabel("Country").selectOption("FR");
    await expect(form.getByText("Audited against: European Union.")).toBeVisible();
    await expect(form.getByLabel("State or region (optional)")).toBeVisible();
    await form.getByLabel("Country").selectOption("US");
    await form.getByLabel("State").fill("zz");
    await form.getByRole("button", { name: "Open the branch" }).click();
    await expect(form.getByText("Use the state's two-letter code, like TX or CO")).toBeVisible();
    await form.getByLabel("State").fill("id");
    await snap(form, "branch-form-place");
    await form.getByRole("button", { name: "Open the branch" }).click();
    await expect(form).toHaveURL(/\/admin\/branches\/\d+\?created=1$/);
    await expect(form.getByLabel("Country")).toHaveValue("US");
    await expect(form.getByLabel("State")).toHaveValue("ID");
    await snap(form, "branch-form-edit-place");
    await other.close();
  });
});
