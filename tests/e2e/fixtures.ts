import { test as base, expect, type APIRequestContext, type BrowserContext, type Page } from "@playwright/test";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { DEMO } from "./demo-data";

export { expect, DEMO };

export const DEMO_PASSWORD = "coldtrail-demo";
const screensDir = join(import.meta.dirname, "..", "..", "test-results", "e2e", "screens");

/** Signs a browser context in through next-auth's credentials endpoint (no form typing). */
export async function signInApi(request: APIRequestContext, email: string, password = DEMO_PASSWORD) {
  const csrf = await request.get("/api/auth/csrf");
  expect(csrf.ok()).toBeTruthy();
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await request.post("/api/auth/callback/credentials", {
    form: { csrfToken, email, password, json: "true", callbackUrl: "/" },
    maxRedirects: 0,
  });
  expect([200, 302]).toContain(res.status());
  const session = await (await request.get("/api/auth/session")).json();
  expect(session?.user?.email, `signed in as ${email}`).toBe(email);
}

export async function contextAs(browser: { newContext: (o?: object) => Promise<BrowserContext> }, email: string, options: object = {}) {
  const context = await browser.newContext(options);
  await signInApi(context.request, email);
  return context;
}

/** Saves a named full-page screenshot for people to look at (test-results/e2e/screens). */
export async function snap(page: Page, name: string) {
  mkdirSync(screensDir, { recursive: true });
  await page.screenshot({ path: join(screensDir, `${name}.png`), fullPage: true });
}

export const test = base;
