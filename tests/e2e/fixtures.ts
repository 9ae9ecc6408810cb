import { test as base, expect, type APIRequestContext, type BrowserContext, type Page } from "@playwright/test";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { DEMO } from "./demo-data";

export { expect, DEMO };

export const DEMO_PASSWORD = "coldtrail-demo";
const port = Number(process.env.E2E_PORT ?? 3100);
const screensDir = join(import.meta.dirname, "..", "..", "test-results", port === 3100 ? "e2e" : `e2e-${port}`, "screens");

/** The local inbox of this run's SMTP fake (see scripts/fakes.ts and scripts/lib.mjs e2ePorts). */
export const MAIL_UI = `http://127.0.0.1:${2700 + (port - 3100)}`;

export interface CaughtMail {
  id: string;
  receivedAt: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
}

/** Mail the SMTP fake caught for an address, oldest first. */
export async function mailTo(request: APIRequestContext, address: string): Promise<CaughtMail[]> {
  const res = await request.get(`${MAIL_UI}/messages.json?to=${encodeURIComponent(address)}`);
  expect(res.ok()).toBeTruthy();
  return (await res.json()) as CaughtMail[];
}

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
