import type { Browser, Page } from "@playwright/test";
import { DEMO, contextAs, expect, mailTo, signInApi, snap, test } from "./fixtures";

/**
 * The owner invites a branch manager by e-mail; the invitee chooses a password from the link, is
 * signed in and sees only their branch. The same person then resets their password by e-mail. Used
 * links are refused with a clear message (expired links: tests/db/admin-invitations.test.ts).
 */

test.describe.configure({ mode: "serial" });

const stamp = Date.now().toString(36);
const invitee = { name: "Noor Fairbanks", email: `noor.fairbanks.${stamp}@kestrelmoor.example` };
const FIRST_PASSWORD = "amber-evaporator-17";
const SECOND_PASSWORD = "quiet-compressor-58";
let invitationLink = "";
let resetLink = "";

function linkIn(text: string, path: string): string {
  const match = text.match(new RegExp(`https?://\\S+${path}/[A-Za-z0-9_-]{20,}`));
  expect(match, `a ${path} link in the e-mail`).not.toBeNull();
  return match![0];
}

async function anonymousPage(browser: Browser): Promise<Page> {
  const context = await browser.newContext();
  return context.newPage();
}

test("the owner invites a branch manager for Tucson; the e-mail arrives with a single-use link", async ({ browser, request }) => {
  const owner = await contextAs(browser, DEMO.owner);
  const page = await owner.newPage();
  await page.goto("/admin");
  await expect(page).toHaveURL(/\/admin\/people$/);
  await expect(page.getByRole("navigation", { name: "Organisation" }).getByRole("link")).toHaveText([
    "People",
    "Branches",
    "Inspector access",
    "Settings",
    "Background work",
  ]);
  await expect(page.getByTestId("person-row").first()).toBeVisible();
  await snap(page, "admin-people-owner");

  await page.getByRole("link", { name: "Invite a person" }).click();
  await expect(page.getByRole("heading", { name: "Invite a person" })).toBeVisible();
  // Bad input is refused beside the fields and nothing is sent.
  await page.getByRole("button", { name: "Send the invitation" }).click();
  await expect(page.getByText("Enter the person's full name")).toBeVisible();
  await expect(page.getByText("Choose at least one role")).toBeVisible();
  await page.getByLabel("Full name").fill(invitee.name);
  await page.getByLabel("E-mail address").fill(invitee.email);
  await page.getByRole("checkbox", { name: /^Branch manager/ }).check();
  await page.getByRole("button", { name: "Send the invitation" }).click();
  await expect(page.getByText("Branch managers and technicians need at least one branch")).toBeVisible();
  await page.getByRole("checkbox", { name: /^Tucson/ }).check();
  await snap(page, "admin-invite-form");
  await page.getByRole("button", { name: "Send the invitation" }).click();
  await expect(page).toHaveURL(/\/admin\/people\?invited=/);
  await expect(page.getByRole("status")).toContainText(`Invitation sent to ${invitee.email}`);

  await page.getByRole("searchbox", { name: "Search" }).fill(stamp);
  const row = page.getByTestId("person-row");
  await expect(row).toHaveCount(1);
  await expect(row).toContainText("Branch manager");
  await expect(row).toContainText("Tucson");
  await expect(row).toContainText("Invitation sent");

  let mails = await mailTo(request, invitee.email);
  await expect.poll(async () => (mails = await mailTo(request, invitee.email)).length).toBe(1);
  expect(mails[0]!.subject).toContain("Kestrelmoor Climate Services");
  expect(mails[0]!.text).toContain("Branch manager (Tucson)");
  expect(mails[0]!.text).toContain("works once");
  invitationLink = linkIn(mails[0]!.text, "/invitation");
  await owner.close();
});

test("the invitee chooses a password, is signed in and sees only Tucson", async ({ browser }) => {
  const page = await anonymousPage(browser);
  await page.goto(invitationLink);
  await expect(page.getByRole("heading", { name: "Join Kestrelmoor Climate Services on Coldtrail" })).toBeVisible();
  await expect(page.getByText(invitee.email)).toBeVisible();
  await expect(page.getByText("as Branch manager (Tucson)")).toBeVisible();
  await snap(page, "invitation-accept");

  await page.getByLabel("New password").fill(FIRST_PASSWORD);
  await page.getByLabel("The same password again").fill("something-else-entirely");
  await page.getByRole("button", { name: "Save my password and sign in" }).click();
  await expect(page.getByText("The two passwords are not the same")).toBeVisible();
  await page.getByLabel("The same password again").fill(FIRST_PASSWORD);
  await page.getByRole("button", { name: "Save my password and sign in" }).click();
  await expect(page.getByRole("heading", { name: "Hello, Noor" })).toBeVisible();
  await expect(page.getByTestId("signed-in-name")).toHaveText(invitee.name);

  // Only their branch: the jobs list, the branch picker and the people list.
  const branches = (await (await page.request.get("/api/lookup/branches")).json()) as { rows: { name: string }[] };
  expect(branches.rows.map((b) => b.name)).toEqual(["Tucson"]);
  const jobs = (await (await page.request.get("/api/jobs?pageSize=200")).json()) as { rows: { branchName: string }[]; total: number };
  expect(jobs.total).toBeGreaterThan(0);
  expect(new Set(jobs.rows.map((j) => j.branchName))).toEqual(new Set(["Tucson"]));
  const people = (await (await page.request.get("/api/admin/people?pageSize=200")).json()) as { rows: { branches: { name: string }[] }[] };
  expect(people.rows.length).toBeGreaterThan(1);
  for (const p of people.rows) expect(p.branches.map((b) => b.name)).toContain("Tucson");

  await page.goto("/jobs");
  await expect(page.getByTestId("job-row").first()).toBeVisible();
  await expect(page.getByLabel("Branch")).toHaveCount(0);
  await snap(page, "invitee-jobs-tucson-only");
  await page.goto("/admin/settings");
  await expect(page.getByText("Not available to you")).toBeVisible();
  await page.context().close();
});

test("the invitation link cannot be used a second time", async ({ browser }) => {
  const page = await anonymousPage(browser);
  await page.goto(invitationLink);
  await expect(page.getByRole("heading", { name: "This invitation link cannot be used" })).toBeVisible();
  await expect(page.getByTestId("link-refused")).toHaveText(/already been used/);
  await snap(page, "invitation-used");
  const token = invitationLink.split("/").pop()!;
  const res = await page.request.post("/api/invitation/accept", {
    data: { token, name: "Someone Else", password: "taking-it-over-1", confirmPassword: "taking-it-over-1" },
  });
  expect(res.status()).toBe(409);
  expect((await res.json()).error.message).toContain("already been used");
  await page.context().close();
});

test("a password reset by e-mail works once, and the form never tells whether an address has an account", async ({ browser, request }) => {
  // A session opened with the old password, e.g. on a lost phone.
  const lostPhone = await browser.newContext();
  await signInApi(lostPhone.request, invitee.email, FIRST_PASSWORD);
  expect((await lostPhone.request.get("/api/jobs?pageSize=1")).status()).toBe(200);

  const page = await anonymousPage(browser);
  await page.goto("/sign-in");
  await page.getByRole("link", { name: "Forgot your password?" }).click();
  await expect(page.getByRole("heading", { name: "Forgot your password?" })).toBeVisible();
  await page.getByLabel("Email").fill(invitee.email);
  await page.getByRole("button", { name: "Send me a link" }).click();
  const answer = await page.getByRole("status").textContent();
  expect(answer).toContain("If that address belongs to an account");
  await snap(page, "password-forgot-sent");

  const unknown = await page.request.post("/api/password/forgot", { data: { email: `nobody.${stamp}@nowhere.example` } });
  expect(unknown.status()).toBe(200);
  expect(answer).toContain(((await unknown.json()) as { message: string }).message);
  const bad = await page.request.post("/api/password/forgot", { data: { email: "not an address" } });
  expect(bad.status()).toBe(400);
  expect((await bad.json()).error.fieldErrors.email).toBeTruthy();

  let mails = await mailTo(request, invitee.email);
  await expect.poll(async () => (mails = await mailTo(request, invitee.email)).length).toBe(2);
  const resetMail = mails.find((m) => m.subject.includes("Reset"))!;
  expect(resetMail).toBeTruthy();
  resetLink = linkIn(resetMail.text, "/password/reset");
  expect(await mailTo(request, `nobody.${stamp}@nowhere.example`)).toHaveLength(0);

  await page.goto(resetLink);
  await expect(page.getByRole("heading", { name: "Choose a new password" })).toBeVisible();
  await snap(page, "password-reset-form");
  await page.getByLabel("New password").fill(SECOND_PASSWORD);
  await page.getByLabel("The same password again").fill(SECOND_PASSWORD);
  await page.getByRole("button", { name: "Save the new password and sign in" }).click();
  await expect(page.getByRole("heading", { name: "Hello, Noor" })).toBeVisible();
  await page.context().close();

  // The new password signs in; the old one no longer does.
  const fresh = await browser.newContext();
  await signInApi(fresh.request, invitee.email, SECOND_PASSWORD);
  await fresh.close();
  const old = await browser.newContext();
  const csrf = (await (await old.request.get("/api/auth/csrf")).json()) as { csrfToken: string };
  await old.request.post("/api/auth/callback/credentials", {
    form: { csrfToken: csrf.csrfToken, email: invitee.email, password: FIRST_PASSWORD, json: "true" },
    maxRedirects: 0,
  });
  expect((await (await old.request.get("/api/auth/session")).json())?.user).toBeUndefined();
  await old.close();

  // The session opened before the reset has ended.
  expect((await lostPhone.request.get("/api/jobs?pageSize=1")).status()).toBe(401);
  await lostPhone.close();
});

test("the reset link is refused once used", async ({ browser }) => {
  const page = await anonymousPage(browser);
  await page.goto(resetLink);
  await expect(page.getByRole("heading", { name: "This password link cannot be used" })).toBeVisible();
  await expect(page.getByTestId("link-refused")).toHaveText(/already been used/);
  await snap(page, "password-reset-used");
  const res = await page.request.post("/api/password/reset", {
    data: { token: resetLink.split("/").pop(), password: "third-password-99", confirmPassword: "third-password-99" },
  });
  expect(res.status()).toBe(409);
  await page.context().close();
});

test("the owner sees the invitee's history: invited, accepted, reset", async ({ browser }) => {
  const owner = await contextAs(browser, DEMO.owner);
  const page = await owner.newPage();
  const people = (await (await page.request.get(`/api/admin/people?q=${stamp}`)).json()) as { rows: { id: number }[] };
  await page.goto(`/admin/people/${people.rows[0]!.id}`);
  await expect(page.getByRole("heading", { name: invitee.name })).toBeVisible();
  await expect(page.locator("main header").getByText("Active")).toBeVisible();
  const history = page.getByTestId("history-entry");
  await expect(history).toHaveCount(4);
  await expect(history.nth(0)).toContainText("chose a new password with a reset link");
  await expect(history.nth(2)).toContainText("accepted the invitation");
  await expect(history.nth(3)).toContainText("Marguerite Halvorsen: Invited Noor Fairbanks");
  await snap(page, "admin-person-invitee");
  await owner.close();
});

test("the owner deactivates the invitee: they can no longer sign in, and their history stays", async ({ browser }) => {
  const signedIn = await browser.newContext();
  await signInApi(signedIn.request, invitee.email, SECOND_PASSWORD);
  expect((await signedIn.request.get("/api/jobs?pageSize=1")).status()).toBe(200);

  const owner = await contextAs(browser, DEMO.owner);
  const page = await owner.newPage();
  const people = (await (await page.request.get(`/api/admin/people?q=${stamp}`)).json()) as { rows: { id: number }[] };
  await page.goto(`/admin/people/${people.rows[0]!.id}`);
  await page.getByRole("button", { name: "Deactivate…" }).click();
  await page.getByRole("button", { name: "Yes, deactivate" }).click();
  await expect(page.locator("main header").getByText("Deactivated")).toBeVisible();
  await expect(page.getByTestId("history-entry").first()).toContainText("Deactivated Noor Fairbanks");
  await expect(page.getByRole("button", { name: "Let them sign in again" })).toBeVisible();
  await snap(page, "admin-person-deactivated");
  await owner.close();

  // A session already open is refused from the next request on.
  expect((await signedIn.request.get("/api/jobs?pageSize=1")).status()).toBe(401);
  await signedIn.close();

  const again = await browser.newContext();
  const csrf = (await (await again.request.get("/api/auth/csrf")).json()) as { csrfToken: string };
  await again.request.post("/api/auth/callback/credentials", {
    form: { csrfToken: csrf.csrfToken, email: invitee.email, password: SECOND_PASSWORD, json: "true" },
    maxRedirects: 0,
  });
  expect((await (await again.request.get("/api/auth/session")).json())?.user).toBeUndefined();
  await again.close();
});
