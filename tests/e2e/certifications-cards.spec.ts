import { devices, type APIRequestContext, type Page } from "@playwright/test";
import { DEMO, contextAs, expect, mailTo, snap, test } from "./fixtures";
import { cardPdf, cardPng, executableBytes } from "../fixtures/card-files";

const phone = { ...devices["Pixel 7"], viewport: { width: 390, height: 844 }, defaultBrowserType: undefined };
delete (phone as { defaultBrowserType?: unknown }).defaultBrowserType;

const port = Number(process.env.E2E_PORT ?? 3100);
/** The local S3 fake of this run (scripts/lib.mjs e2ePorts): anonymous reads are allowed there. */
const S3 = `http://127.0.0.1:${4600 + (port - 3100)}/coldtrail-files`;
const ORG = "Harrow Ridge Testing Council"; // invented certifying organisation
const stamp = () => `${Date.now().toString(36).toUpperCase()}${Math.floor(Math.random() * 1000)}`;

async function s3Keys(prefix: string): Promise<Map<string, number>> {
  const res = await fetch(`${S3}?list-type=2&prefix=${encodeURIComponent(prefix)}&max-keys=1000`);
  expect(res.ok).toBeTruthy();
  const xml = await res.text();
  const keys = new Map<string, number>();
  for (const m of xml.matchAll(/<Key>([^<]+)<\/Key>.*?<Size>(\d+)<\/Size>/g)) keys.set(m[1]!, Number(m[2]));
  return keys;
}

/** A JPEG drawn by the browser: a card-like picture with the number written on it. */
async function browserJpeg(page: Page, text: string): Promise<Buffer> {
  const b64 = await page.evaluate((label) => {
    const c = document.createElement("canvas");
    c.width = 900;
    c.height = 560;
    const g = c.getContext("2d")!;
    g.fillStyle = "#eef2f6";
    g.fillRect(0, 0, 900, 560);
    g.fillStyle = "#0f6e8c";
    g.fillRect(0, 0, 900, 120);
    g.fillStyle = "#ffffff";
    g.font = "bold 40px sans-serif";
    g.fillText("Technician certification", 30, 78);
    g.fillStyle = "#17212b";
    g.font = "32px sans-serif";
    g.fillText("Type I + Type II", 30, 220);
    g.fillText(`No. ${label}`, 30, 290);
    return c.toDataURL("image/jpeg", 0.85).split(",")[1]!;
  }, text);
  return Buffer.from(b64, "base64");
}

async function uploadByApi(
  request: APIRequestContext,
  opts: { number: string; file: { name: string; mimeType: string; buffer: Buffer }; types?: string[] },
) {
  const multipart: Record<string, string | { name: string; mimeType: string; buffer: Buffer }> = {
    certifyingOrganisation: ORG,
    certificateNumber: opts.number,
    card: opts.file,
  };
  // Playwright's multipart takes one value per name; repeated types go through FormData.
  const form = new FormData();
  for (const t of opts.types ?? ["type_i"]) form.append("types", t);
  for (const [k, v] of Object.entries(multipart)) {
    if (typeof v === "string") form.append(k, v);
    else form.append(k, new Blob([new Uint8Array(v.buffer)], { type: v.mimeType }), v.name);
  }
  return request.post("/api/certifications", { multipart: form });
}

test.describe("a technician adds a certification card from a phone", () => {
  test("a real photo is accepted, stored under our own key in object storage with a thumbnail, and shown; wrong files are refused", async ({
    browser,
  }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const page = await tech.newPage();
    const number = `CT-${stamp()}`;

    await page.goto("/certifications");
    await expect(page.getByRole("heading", { name: "Certification cards", level: 1 })).toBeVisible();
    await expect(page.getByRole("heading", { name: "Your cards" })).toBeVisible();
    await snap(page, "cards-phone-my-cards");
    await page.getByRole("link", { name: "Add a card" }).click();
    await expect(page.getByRole("heading", { name: "Add a certification card" })).toBeVisible();

    // The camera input is there for phones (capture), beside a plain file picker.
    const camera = page.locator('input[type="file"][capture="environment"]');
    await expect(camera).toHaveAttribute("accept", "image/*,application/pdf");
    await snap(page, "cards-phone-upload-empty");

    // Sending without anything names every field that needs attention.
    await page.getByRole("button", { name: "Send the card for verification" }).click();
    await expect(page.getByRole("alert").first()).toContainText("Some fields need attention");
    await expect(page.getByText("Choose at least one certification type")).toBeVisible();
    await expect(page.getByText("Take a photo of the card or choose a photo or PDF of it")).toBeVisible();

    // A renamed executable is refused by its bytes, whatever its name says.
    await page.getByText("Type I", { exact: true }).click();
    await page.getByText("Type II", { exact: true }).click();
    await page.getByLabel("Certifying organisation").fill(ORG);
    await page.getByLabel("Certificate number").fill(number);
    await page.getByTestId("card-file").setInputFiles({ name: "card-photo.jpg", mimeType: "image/jpeg", buffer: executableBytes() });
    await page.getByRole("button", { name: "Send the card for verification" }).click();
    await expect(page.getByText("Only photos (JPEG, PNG, WebP, HEIC) and PDF documents can be uploaded")).toBeVisible();
    await snap(page, "cards-phone-upload-refused-executable");
    const mineAfterRefusal = (await (await tech.request.get("/api/certifications?mine=1&pageSize=100")).json()) as {
      rows: Array<{ certificateNumber: string }>;
    };
    expect(mineAfterRefusal.rows.some((r) => r.certificateNumber === number)).toBe(false);

    // A real JPEG (drawn by the browser) is accepted.
    const before = await s3Keys("certifications/");
    const jpeg = await browserJpeg(page, number);
    await page.getByTestId("card-file").setInputFiles({ name: "my-card-photo.jpg", mimeType: "image/jpeg", buffer: jpeg });
    await expect(page.getByTestId("chosen-card")).toContainText("my-card-photo.jpg");
    await snap(page, "cards-phone-upload-filled");
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await page.getByRole("button", { name: "Send the card for verification" }).click();
    await expect(page).toHaveURL(/\/certifications\?uploaded=1/);
    await expect(page.getByRole("status")).toContainText("awaiting verification");
    const mine = page.getByTestId("my-card").filter({ hasText: number });
    await expect(mine).toContainText("Awaiting verification");
    await expect(mine).toContainText("Type I + Type II");
    // Its thumbnail (made on the server from the photo) loads: 900 × 560 scaled into 480 × 480.
    await expect.poll(() => mine.getByRole("img").evaluate((el) => (el as HTMLImageElement).naturalWidth)).toBe(480);
    await snap(page, "cards-phone-after-upload");

    // The object landed in the S3 fake under a key we made (never the file's name), with a thumbnail.
    const after = await s3Keys("certifications/");
    const added = [...after.keys()].filter((k) => !before.has(k));
    expect(added).toHaveLength(2);
    for (const key of added) expect(key).toMatch(/^certifications\/\d+\/\d+\/(thumbnails\/)?[0-9a-f-]{36}\.jpg$/);
    const cardKey = added.find((k) => !k.includes("/thumbnails/"))!;
    expect(after.get(cardKey)).toBe(jpeg.length);
    expect(Buffer.from(await (await fetch(`${S3}/${cardKey}`)).arrayBuffer()).equals(jpeg)).toBe(true);

    // Shown on the card's page, large, through the permission-checked file route.
    await mine.click();
    await expect(page.getByRole("heading", { name: /Certification card of Marcus Delacroix-Byrd/ })).toBeVisible();
    const img = page.getByRole("img", { name: new RegExp(number) });
    await expect(img).toBeVisible();
    await expect.poll(() => img.evaluate((el) => (el as HTMLImageElement).naturalWidth)).toBe(900);
    await snap(page, "cards-phone-card-detail");
    const id = Number(new URL(page.url()).pathname.split("/").pop());
    const served = await tech.request.get(`/api/files/certifications/${id}`);
    expect(served.headers()["content-type"]).toBe("image/jpeg");
    expect(Buffer.from(await served.body()).equals(jpeg)).toBe(true);
    const thumb = await tech.request.get(`/api/files/certifications/${id}?variant=thumbnail`);
    expect(thumb.status()).toBe(200);
    expect((await thumb.body()).length).toBeLessThan(jpeg.length);

    // A path-like file name is refused, even with a real photo inside; so is an oversize file. Nothing stored.
    const keysBefore = await s3Keys("certifications/");
    const pathLike = await uploadByApi(tech.request, {
      number: `${number}-P`,
      file: { name: "../../etc/card.png", mimeType: "image/png", buffer: cardPng() },
    });
    expect(pathLike.status()).toBe(400);
    expect(((await pathLike.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors.card?.[0]).toContain(
      "file name is not accepted",
    );
    const big = Buffer.concat([cardPng(), Buffer.alloc(11 * 1024 * 1024)]);
    const oversize = await uploadByApi(tech.request, {
      number: `${number}-B`,
      file: { name: "big.png", mimeType: "image/png", buffer: big },
    });
    // Cut off while it streams in, before the form is parsed.
    expect(oversize.status()).toBe(413);
    expect(JSON.stringify(await oversize.json())).toContain("The request is too large (the limit is 10 MB)");
    expect((await s3Keys("certifications/")).size).toBe(keysBefore.size);

    // A real PNG and a real PDF are accepted too (PDFs keep no thumbnail).
    const png = await uploadByApi(tech.request, {
      number: `${number}-G`,
      file: { name: "card.png", mimeType: "image/png", buffer: cardPng() },
    });
    expect(png.status()).toBe(201);
    const pdf = await uploadByApi(tech.request, {
      number: `${number}-F`,
      types: ["type_i", "type_ii"],
      file: { name: "card scan.pdf", mimeType: "application/pdf", buffer: cardPdf() },
    });
    expect(pdf.status()).toBe(201);
    const pdfId = ((await pdf.json()) as { id: number }).id;
    expect((await tech.request.get(`/api/files/certifications/${pdfId}`)).headers()["content-type"]).toBe("application/pdf");
    expect((await tech.request.get(`/api/files/certifications/${pdfId}?variant=thumbnail`)).status()).toBe(404);

    // Leave nothing pending behind: the technician withdraws these test cards.
    for (const cardId of [id, ((await png.json()) as { id: number }).id, pdfId]) {
      const res = await tech.request.post(`/api/certifications/${cardId}/withdraw`, { data: { reason: "Test upload, withdrawn" } });
      expect(res.status()).toBe(200);
    }
    await tech.close();
  });

  test("another person cannot see the card or its file", async ({ browser }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus);
    const res = await uploadByApi(tech.request, {
      number: `CT-${stamp()}-X`,
      file: { name: "card.png", mimeType: "image/png", buffer: cardPng() },
    });
    expect(res.status()).toBe(201);
    const { id } = (await res.json()) as { id: number };
    for (const email of [DEMO.otherOrgManager, DEMO.managerTucson]) {
      const other = await contextAs(browser, email);
      expect((await other.request.get(`/api/certifications/${id}`)).status()).toBe(404);
      expect((await other.request.get(`/api/files/certifications/${id}`)).status()).toBe(404);
      await other.close();
    }
    const manager = await contextAs(browser, DEMO.managerColumbus);
    expect((await manager.request.get(`/api/certifications/${id}`)).status()).toBe(200);
    await manager.close();
    expect((await tech.request.post(`/api/certifications/${id}/withdraw`, { data: { reason: "Test upload, withdrawn" } })).status()).toBe(
      200,
    );
    await tech.close();
  });
});

test.describe("the compliance officer's verification queue", () => {
  test("not accepted with a reason, then verified; the technician is told by e-mail and in the app; a manager cannot decide", async ({
    browser,
  }) => {
    const tech = await contextAs(browser, DEMO.technicianColumbus, phone);
    const techPage = await tech.newPage();
    await techPage.goto("/certifications");
    const first = `CT-${stamp()}-Q1`;
    const jpeg = await browserJpeg(techPage, first);
    const up1 = await uploadByApi(tech.request, {
      number: first,
      types: ["type_i", "type_ii"],
      file: { name: "card.jpg", mimeType: "image/jpeg", buffer: jpeg },
    });
    expect(up1.status()).toBe(201);
    const id1 = ((await up1.json()) as { id: number }).id;

    // A branch manager sees the card of their technician but may not decide.
    const manager = await contextAs(browser, DEMO.managerColumbus);
    expect((await manager.request.post(`/api/certifications/${id1}/decision`, { data: { decision: "verify" } })).status()).toBe(403);
    const mpage = await manager.newPage();
    await mpage.goto(`/certifications/${id1}`);
    await expect(mpage.getByRole("heading", { name: /Certification card of Marcus/ })).toBeVisible();
    await expect(mpage.getByRole("button", { name: /Verify this card/ })).toHaveCount(0);
    await manager.close();
    // Nor may the technician decide on their own card.
    expect((await tech.request.post(`/api/certifications/${id1}/decision`, { data: { decision: "verify" } })).status()).toBe(403);

    const officer = await contextAs(browser, DEMO.officer, { viewport: { width: 1366, height: 900 } });
    const page = await officer.newPage();
    await page.goto("/certifications");
    await expect(page.getByRole("heading", { name: "Verification queue" })).toBeVisible();
    await expect(page.getByLabel("State")).toHaveValue("pending");
    await page.getByLabel("Search cards").fill(first);
    const row = page.getByTestId("card-row").filter({ hasText: first });
    await expect(row).toBeVisible();
    await expect(row).toContainText("Awaiting verification");
    await expect(row).toContainText("Marcus Delacroix-Byrd");
    await snap(page, "cards-queue-officer");
    await row.getByTestId("card-link").click();

    await expect(page.getByRole("heading", { name: /Certification card of Marcus Delacroix-Byrd/ })).toBeVisible();
    await expect(page.getByRole("img", { name: new RegExp(first) })).toBeVisible();
    await snap(page, "cards-officer-card-large");
    await page.getByRole("button", { name: /Do not accept…/ }).click();
    await page.getByRole("button", { name: /Do not accept the card/ }).click();
    await expect(page.getByText("Tell the technician why the card is not accepted")).toBeVisible();
    const reason = "The certificate number on the photo does not match what was entered.";
    await page.getByLabel("Why is the card not accepted?").fill(reason);
    await page.getByRole("button", { name: /Do not accept the card/ }).click();
    await expect(page.getByRole("status")).toContainText("Card not accepted");
    await expect(page.getByRole("status")).toContainText("told by e-mail");
    await expect(page.getByTestId("card-state").first()).toContainText("Not accepted");
    await snap(page, "cards-officer-not-accepted");

    // The e-mail reaches the technician through the local SMTP fake.
    await expect
      .poll(async () => (await mailTo(page.request, DEMO.technicianColumbus)).filter((m) => m.text.includes(first)).length, {
        timeout: 15_000,
      })
      .toBe(1);
    const rejectedMail = (await mailTo(page.request, DEMO.technicianColumbus)).find((m) => m.text.includes(first))!;
    expect(rejectedMail.subject).toBe("Your Type I + Type II certification card was not accepted");
    expect(rejectedMail.text).toContain(reason);
    expect(rejectedMail.text).toMatch(new RegExp(`/certifications/${id1}`));

    // A second card, verified; a second decision on the first is refused.
    const second = `CT-${stamp()}-Q2`;
    const up2 = await uploadByApi(tech.request, {
      number: second,
      types: ["type_i", "type_ii"],
      file: { name: "card.png", mimeType: "image/png", buffer: cardPng() },
    });
    expect(up2.ok()).toBe(true);
    expect((await officer.request.post(`/api/certifications/${id1}/decision`, { data: { decision: "verify" } })).status()).toBe(409);
    await page.goto("/certifications");
    await page.getByLabel("Search cards").fill(second);
    await page.getByTestId("card-row").filter({ hasText: second }).getByTestId("card-link").click();
    await page.getByRole("button", { name: /Verify this card/ }).click();
    await expect(page.getByRole("status")).toContainText("Card verified");
    await expect(page.getByTestId("card-state").first()).toContainText("Verified");

    // A correction is an amendment, shown in the history with the reason.
    await page.getByText("Correct the details").click();
    await page.getByLabel("Certificate number").fill(`${second}-A`);
    await page.getByLabel("Why is it corrected?").fill("Last letter misread from the photo");
    await page.getByRole("button", { name: "Save the correction" }).click();
    await expect(page.getByTestId("card-amendment")).toContainText(`Certificate number: ${second} → ${second}-A`);
    await expect(page.getByTestId("card-amendment")).toContainText("Last letter misread from the photo");
    await snap(page, "cards-officer-verified-with-history");

    await expect
      .poll(
        async () =>
          (await mailTo(page.request, DEMO.technicianColumbus)).filter(
            (m) => m.subject === "Your Type I + Type II certification card is verified" && m.text.includes(second),
          ).length,
        {
          timeout: 15_000,
        },
      )
      .toBe(1);

    // In the app: the technician's notices show both decisions.
    await techPage.goto("/certifications");
    await expect(techPage.getByTestId("notifications-count")).toBeVisible();
    await techPage.getByTestId("notifications-button").click();
    const notices = techPage.getByRole("region", { name: "Notifications" });
    await expect(notices.getByTestId("notification").filter({ hasText: "is verified" }).first()).toBeVisible();
    await expect(notices.getByTestId("notification").filter({ hasText: "was not accepted" }).first()).toContainText(reason);
    await snap(techPage, "cards-phone-notifications");
    await expect(techPage.getByTestId("my-card").filter({ hasText: first })).toContainText("Not accepted");
    await notices.getByRole("button", { name: "Mark all as read" }).click();
    await expect(techPage.getByTestId("notifications-count")).toHaveCount(0);
    await officer.close();
    await tech.close();
  });
});
