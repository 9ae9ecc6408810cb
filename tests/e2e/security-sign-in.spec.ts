import { test, expect, DEMO_PASSWORD, signInApi } from "./fixtures";
import type { APIRequestContext } from "@playwright/test";

/**
 * Sign-in security against the running server with its real limits: throttling of wrong passwords,
 * sessions that end on the server, redirects after sign-in, the account page. Uses demo accounts no
 * other spec signs in with (Denver's and Peoria's managers, a Columbus technician).
 */
const THROTTLED = "henrik.solvang@kestrelmoor.example";
const SESSIONS = "yusuf.okonkwo-hale@kestrelmoor.example";
const CHANGER = "danielle.achterberg@kestrelmoor.example";

async function postCredentials(request: APIRequestContext, email: string, password: string) {
  const { csrfToken } = (await (await request.get("/api/auth/csrf")).json()) as { csrfToken: string };
  const res = await request.post("/api/auth/callback/credentials", {
    form: { csrfToken, email, password, json: "true", callbackUrl: "/" },
    maxRedirects: 0,
  });
  const body = (await res.json().catch(() => ({}))) as { url?: string };
  return { status: res.status(), error: body.url ? new URL(body.url).searchParams.get("error") : null };
}

async function sessionEmail(request: APIRequestContext): Promise<string | undefined> {
  const session = (await (await request.get("/api/auth/session")).json()) as { user?: { email?: string } } | null;
  return session?.user?.email;
}

test("the 6th wrong password in a minute is refused even with the right one, with the wait in minutes", async ({ browser }) => {
  const attacker = await browser.newContext();
  for (let i = 1; i <= 5; i++) {
    const r = await postCredentials(attacker.request, THROTTLED, `not-the-password-${i}`);
    expect(r.status).toBe(401);
    expect(r.error).toBe(i < 5 ? "CredentialsSignin" : "Too many failed sign-ins. Try again in 15 minutes.");
  }
  // The right password, sixth attempt within the minute: refused, no session.
  const sixth = await postCredentials(attacker.request, THROTTLED, DEMO_PASSWORD);
  expect(sixth.status).toBe(401);
  expect(sixth.error).toMatch(/^Too many failed sign-ins\. Try again in 1[45] minutes\.$/);
  expect(await sessionEmail(attacker.request)).toBeUndefined();

  // The sign-in form says so in words.
  const page = await attacker.newPage();
  await page.goto("/sign-in");
  await page.getByLabel("Email").fill(THROTTLED);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "Too many" })).toContainText(
    /Too many failed sign-ins\. Try again in 1[45] minutes\./,
  );
  await attacker.close();
});

test("a GET of the credentials callback is a clean 405", async ({ request }) => {
  const res = await request.get("/api/auth/callback/credentials");
  expect(res.status()).toBe(405);
  expect(res.headers()["allow"]).toBe("POST");
});

test("a cookie saved before sign-out is refused after it", async ({ browser }) => {
  const context = await browser.newContext();
  await signInApi(context.request, SESSIONS);
  const saved = await context.storageState();
  expect((await context.request.get("/api/notifications")).status()).toBe(200);

  const page = await context.newPage();
  await page.goto("/");
  await page.getByRole("button", { name: "Sign out" }).click();
  await page.waitForURL(/\/sign-in/);

  const replay = await browser.newContext({ storageState: saved });
  expect(saved.cookies.some((c) => c.name.includes("session-token"))).toBe(true);
  expect((await replay.request.get("/api/notifications")).status()).toBe(401);
  expect(await sessionEmail(replay.request)).toBeUndefined();
  const replayPage = await replay.newPage();
  await replayPage.goto("/jobs");
  await expect(replayPage).toHaveURL(/\/sign-in/);
  await Promise.all([context.close(), replay.close()]);
});

test("sign out everywhere ends the sessions on other devices too", async ({ browser }) => {
  const phone = await browser.newContext();
  const desk = await browser.newContext();
  await signInApi(phone.request, SESSIONS);
  await signInApi(desk.request, SESSIONS);

  const page = await desk.newPage();
  await page.goto("/account");
  await expect(page.getByTestId("open-sessions")).toContainText("open sessions");
  await page.getByRole("button", { name: "Sign out everywhere" }).click();
  await page.waitForURL(/\/sign-in/);

  expect((await phone.request.get("/api/notifications")).status()).toBe(401);
  expect(await sessionEmail(phone.request)).toBeUndefined();
  // Signing in again works.
  await signInApi(phone.request, SESSIONS);
  await Promise.all([phone.close(), desk.close()]);
});

test("changing one's password refuses common ones, then ends the other sessions and keeps this one signed in", async ({ browser }) => {
  const other = await browser.newContext();
  await signInApi(other.request, CHANGER);
  const context = await browser.newContext();
  await signInApi(context.request, CHANGER);
  const page = await context.newPage();
  await page.goto("/account");

  await page.getByLabel("Current password").fill(DEMO_PASSWORD);
  await page.getByLabel("New password", { exact: true }).fill("Summer2026!!!");
  await page.getByLabel("The same new password again").fill("Summer2026!!!");
  await page.getByRole("button", { name: "Change password" }).click();
  await expect(page.getByText(/one of the most common ones/)).toBeVisible();

  const fresh = "lantern-gasket-orchard-44";
  await page.getByLabel("New password", { exact: true }).fill(fresh);
  await page.getByLabel("The same new password again").fill(fresh);
  await page.getByRole("button", { name: "Change password" }).click();
  await page.waitForURL(/\/account\?changed=1/);
  await expect(page.getByTestId("account-email")).toHaveText(CHANGER);

  expect((await other.request.get("/api/notifications")).status()).toBe(401);
  const old = await browser.newContext();
  expect((await postCredentials(old.request, CHANGER, DEMO_PASSWORD)).error).toBe("CredentialsSignin");
  await Promise.all([other.close(), context.close(), old.close()]);
});

test.describe("after signing in, only pages of this site", () => {
  for (const next of ["/%5Cevil.example/", "/%09/evil.example", "//evil.example", "https://evil.example/"]) {
    test(`next=${next} lands on the overview`, async ({ browser }) => {
      const context = await browser.newContext();
      const page = await context.newPage();
      await page.goto(`/sign-in?next=${next}`);
      await page.getByLabel("Email").fill("marcus.delacroix-byrd@kestrelmoor.example");
      await page.getByLabel("Password").fill(DEMO_PASSWORD);
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL((url) => url.pathname === "/" || url.host !== new URL(page.url()).host);
      expect(new URL(page.url()).origin).toBe(new URL(test.info().project.use.baseURL!).origin);
      expect(new URL(page.url()).pathname).toBe("/");
      await context.close();
    });
  }

  test("a page of this site is kept", async ({ browser }) => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`/sign-in?next=${encodeURIComponent("/jobs?page=1")}`);
    await page.getByLabel("Email").fill("marcus.delacroix-byrd@kestrelmoor.example");
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(/\/jobs\?page=1$/);
    await context.close();
  });
});
