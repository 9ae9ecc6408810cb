import { DEMO, DEMO_PASSWORD, expect, snap, test } from "./fixtures";

const roles = [
  { email: DEMO.owner, role: "Owner" },
  { email: DEMO.officer, role: "Compliance officer" },
  { email: DEMO.managerColumbus, role: "Branch manager" },
  { email: DEMO.technicianColumbus, role: "Technician" },
  { email: DEMO.inspector, role: "Inspector" },
];

test.describe("sign-in", () => {
  for (const { email, role } of roles) {
    test(`a ${role.toLowerCase()} signs in with the form and sees their role`, async ({ page }) => {
      await page.goto("/jobs");
      await expect(page).toHaveURL(/\/sign-in/);
      await page.getByLabel("Email").fill(email);
      await page.getByLabel("Password").fill(DEMO_PASSWORD);
      await page.getByRole("button", { name: "Sign in" }).click();
      await expect(page.getByRole("heading", { name: /^Hello,/ })).toBeVisible();
      await expect(page.getByText(`Signed in as ${role}`)).toBeVisible();
      await snap(page, `overview-${role.toLowerCase().replace(/\s+/g, "-")}`);

      await page.getByRole("button", { name: "Sign out" }).click();
      await expect(page).toHaveURL(/\/sign-in/);
      const session = await (await page.request.get("/api/auth/session")).json();
      expect(session?.user).toBeUndefined();
    });
  }

  test("a wrong password is refused with a message and no session", async ({ page }) => {
    await page.goto("/sign-in");
    await page.getByLabel("Email").fill(DEMO.technicianColumbus);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("alert").filter({ hasText: "do not match" })).toBeVisible();
    await snap(page, "sign-in-refused");
    const session = await (await page.request.get("/api/auth/session")).json();
    expect(session?.user).toBeUndefined();
  });

  test("an API call without a session is refused with 401", async ({ request }) => {
    const res = await request.get("/api/jobs");
    expect(res.status()).toBe(401);
    const post = await request.post("/api/jobs", { data: {} });
    expect(post.status()).toBe(401);
  });
});
