import { test, expect, contextAs, DEMO } from "./fixtures";
import type { BrowserContext, Page, Response } from "@playwright/test";

/**
 * Every page under the security headers: a signed-in compliance officer and a technician visit every
 * page of the app (detail and edit pages through the first record each list links to), and a signed-out
 * visitor the public pages. Each answer carries the headers; no script is refused by the Content
 * Security Policy, and the page's own scripts run (it becomes interactive).
 */

const LIST_PAGES = [
  "/",
  "/account",
  "/admin",
  "/admin/branches",
  "/admin/branches/new",
  "/admin/inspectors",
  "/admin/inspectors/new",
  "/admin/people",
  "/admin/people/invite",
  "/admin/settings",
  "/appliances",
  "/appliances/new",
  "/audits",
  "/audits/new",
  "/branches",
  "/certifications",
  "/certifications/new",
  "/cylinders",
  "/cylinders/new",
  "/disposals",
  "/disposals/new",
  "/disposals/shop",
  "/equipment",
  "/equipment/new",
  "/findings",
  "/imports",
  "/imports/new",
  "/jobs",
  "/jobs/new",
  "/purchases",
  "/purchases/new",
  "/shipments",
  "/shipments/new",
];

/** Detail pages: the first link of this shape found on the list page, and its edit page where there is one. */
const DETAIL_LINKS: ReadonlyArray<{ list: string; pattern: RegExp; edit?: boolean }> = [
  { list: "/admin/branches", pattern: /^\/admin\/branches\/\d+$/ },
  { list: "/admin/people", pattern: /^\/admin\/people\/\d+$/ },
  { list: "/appliances", pattern: /^\/appliances\/\d+$/, edit: true },
  { list: "/audits", pattern: /^\/audits\/\d+$/ },
  { list: "/branches", pattern: /^\/branches\/\d+$/ },
  { list: "/certifications", pattern: /^\/certifications\/\d+$/ },
  { list: "/cylinders", pattern: /^\/cylinders\/\d+$/, edit: true },
  { list: "/disposals", pattern: /^\/disposals\/(records|statements)\/\d+$/ },
  { list: "/equipment", pattern: /^\/equipment\/\d+$/, edit: true },
  { list: "/findings", pattern: /^\/findings\/\d+$/ },
  { list: "/jobs", pattern: /^\/jobs\/\d+$/ },
  { list: "/purchases", pattern: /^\/purchases\/\d+$/ },
  { list: "/shipments", pattern: /^\/shipments\/\d+$/ },
];

const PUBLIC_PAGES = [
  "/sign-in",
  "/password/forgot",
  "/invitation/not-a-real-token-0123456789",
  "/password/reset/not-a-real-token-0123456789",
];

function expectPageHeaders(res: Response | null, path: string) {
  expect(res, `${path} answered`).not.toBeNull();
  const h = res!.headers();
  const csp = h["content-security-policy"] ?? "";
  const script =
    csp
      .split(";")
      .map((d) => d.trim())
      .find((d) => d.startsWith("script-src")) ?? "";
  expect(script, `${path}: script-src with a nonce`).toMatch(/'nonce-[A-Za-z0-9+/=]{16,}'/);
  expect(script, `${path}: no inline scripts`).not.toContain("'unsafe-inline'");
  expect(csp, path).toContain("frame-ancestors 'none'");
  expect(h["x-frame-options"], path).toBe("DENY");
  expect(h["x-content-type-options"], path).toBe("nosniff");
  expect(h["referrer-policy"], path).toBe("same-origin");
  expect(h["permissions-policy"], path).toContain("camera=(self)");
  // Served over plain http in the test: no HSTS (it is sent over https only).
  expect(h["strict-transport-security"], path).toBeUndefined();
}

/** Console reports of refused content, collected per page. */
function watchCsp(page: Page): string[] {
  const refused: string[] = [];
  page.on("console", (m) => {
    const text = m.text();
    if (/Content Security Policy|Refused to (execute|load|apply|connect|frame)/i.test(text)) refused.push(text);
  });
  return refused;
}

async function visit(page: Page, refused: string[], path: string, signedIn: boolean) {
  const res = await page.goto(path);
  expectPageHeaders(res, path);
  // Next.js's inline scripts (they carry the nonce) ran, and React made the page interactive.
  await page.waitForFunction(() => Array.isArray((window as unknown as { __next_f?: unknown[] }).__next_f));
  if (signedIn) await expect(page.getByRole("button", { name: "Sign out" })).toBeEnabled();
  await page.waitForLoadState("networkidle");
  const violations = await page.evaluate(() => (window as unknown as { __cspViolations?: string[] }).__cspViolations ?? []);
  expect([...refused, ...violations], `${path}: nothing refused by the policy`).toEqual([]);
}

async function newWatchedPage(context: BrowserContext) {
  await context.addInitScript(() => {
    const w = window as unknown as { __cspViolations?: string[] };
    w.__cspViolations = [];
    document.addEventListener("securitypolicyviolation", (e) => w.__cspViolations!.push(`${e.violatedDirective} ${e.blockedURI}`));
  });
  const page = await context.newPage();
  return { page, refused: watchCsp(page) };
}

for (const [who, email] of [
  ["a compliance officer", DEMO.officer],
  ["a technician", DEMO.technicianColumbus],
] as const) {
  test(`every page works under the security headers for ${who}`, async ({ browser }) => {
    test.setTimeout(300_000);
    const context = await contextAs(browser, email);
    const { page, refused } = await newWatchedPage(context);
    const seen: string[] = [];
    for (const path of LIST_PAGES) {
      await visit(page, refused, path, true);
      seen.push(path);
    }
    for (const { list, pattern, edit } of DETAIL_LINKS) {
      await page.goto(list);
      await page.waitForLoadState("networkidle");
      const hrefs = await page.locator("a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""));
      const detail = hrefs.find((h) => pattern.test(h));
      if (!detail) continue; // nothing this person may open from that list
      await visit(page, refused, detail, true);
      seen.push(detail);
      if (edit) {
        await visit(page, refused, `${detail}/edit`, true);
        seen.push(`${detail}/edit`);
      }
    }
    // The officer reaches a detail page of every kind; the technician at least jobs and registers.
    expect(seen.length).toBeGreaterThan(LIST_PAGES.length + (email === DEMO.officer ? 12 : 4));
    await context.close();
  });
}

test("the public pages work under the security headers, signed out", async ({ browser }) => {
  const context = await browser.newContext();
  const { page, refused } = await newWatchedPage(context);
  for (const path of PUBLIC_PAGES) await visit(page, refused, path, false);
  await context.close();
});

test("API answers carry nosniff and a policy that allows nothing", async ({ browser }) => {
  const context = await contextAs(browser, DEMO.technicianColumbus);
  for (const path of ["/api/notifications", "/api/jobs?page=1", "/api/auth/session"]) {
    const res = await context.request.get(path);
    expect(res.status(), path).toBe(200);
    const h = res.headers();
    expect(h["x-content-type-options"], path).toBe("nosniff");
    expect(h["x-frame-options"], path).toBe("DENY");
    expect(h["content-security-policy"], path).toContain("default-src 'none'");
  }
  const signedOut = await context.request.get("/api/auth/callback/credentials");
  expect(signedOut.headers()["x-content-type-options"]).toBe("nosniff");
  await context.close();
});
