import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { deflateSync } from "node:zlib";
import { cardPdf, cardPng } from "../fixtures/card-files";
import { createHarness, type Harness } from "./harness";

/**
 * The checks every request passes before its handler (body size, origin and body type, path ids) and
 * the checks every upload passes (type by bytes, pixels before decoding, decodable, name), called
 * through the real route wrapper and handlers.
 */

let h: Harness;
const ids = { purchase: 0, equipment: 0, finding: 0, job: 0 };

beforeAll(async () => {
  h = await createHarness();
  const col = Number((await h.t.db("branches").where({ code: "COL" }).first("id")).id);
  ids.purchase = Number((await h.t.db("purchases").where({ branch_id: col }).whereNull("voided_at").first("id")).id);
  ids.equipment = Number((await h.t.db("recovery_equipment").where({ branch_id: col, status: "in_service" }).first("id")).id);
  ids.job = Number((await h.t.db("jobs").where({ branch_id: col }).first("id")).id);
}, 120_000);

afterAll(async () => {
  vi.resetModules();
  await h?.t.destroy();
});

/** A PNG whose header claims width × height, with one tiny compressed row: tiny on disk, huge when decoded. */
function bombPng(width: number, height: number): Buffer {
  const png = cardPng(8, 8);
  const out = Buffer.from(png);
  out.writeUInt32BE(width, 16);
  out.writeUInt32BE(height, 20);
  // The IHDR CRC no longer matches, which a decoder would notice only when decoding: the size check comes first.
  return Buffer.concat([out, deflateSync(Buffer.alloc(1024))]);
}

describe("body size limits", () => {
  it("a JSON body above the route's limit is refused with 413 before it is parsed, and nothing is written", async () => {
    h.signInAs("branch_manager");
    const before = await h.fingerprint();
    const big = JSON.stringify({ reason: "x".repeat(200 * 1024) });
    const res = await h.call("purchases/[id]/void", "POST", {
      params: { id: String(ids.purchase) },
      raw: big,
      contentType: "application/json",
    });
    expect(res.status).toBe(413);
    expect(res.json?.error).toMatchObject({ code: "too_large" });
    expect(String((res.json?.error as { message: string }).message)).toMatch(/too large.*64 KB/);
    expect(await h.fingerprint()).toBe(before);
  });

  it("a streamed body without a declared length is cut off at the limit", async () => {
    h.signInAs("branch_manager");
    let sent = 0;
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        // 1 MB in 16 KB chunks; the reader stops well before the end.
        if (sent >= 1024 * 1024) return controller.close();
        sent += 16 * 1024;
        controller.enqueue(new Uint8Array(16 * 1024).fill(0x20));
      },
    });
    const res = await h.call("purchases/[id]/void", "POST", {
      params: { id: String(ids.purchase) },
      raw: stream,
      contentType: "application/json",
    });
    expect(res.status).toBe(413);
    expect(sent).toBeLessThan(1024 * 1024);
  });

  it("the public password-reset routes have the same limit", async () => {
    h.signInAs(null);
    for (const route of ["password/forgot", "password/reset", "invitation/accept"]) {
      const res = await h.call(route, "POST", { raw: JSON.stringify({ email: "a".repeat(100 * 1024) }), contentType: "application/json" });
      expect(res.status, route).toBe(413);
    }
  });

  it("an upload above the upload limit is refused with 413 while streaming", async () => {
    h.signInAs("branch_manager");
    const form = new FormData();
    form.set("file", new Blob([new Uint8Array(11 * 1024 * 1024)], { type: "image/png" }), "label.png");
    const res = await h.call("equipment/[id]/evidence", "POST", { params: { id: String(ids.equipment) }, form });
    expect(res.status).toBe(413);
  });
});

describe("cross-site request forgery", () => {
  it("a text/plain form post from the app's own origin is refused with 403 and writes nothing", async () => {
    h.signInAs("branch_manager");
    const before = await h.fingerprint();
    const res = await h.call("purchases/[id]/void", "POST", {
      params: { id: String(ids.purchase) },
      raw: '{"reason":"Forged from a plain form post"}',
      contentType: "text/plain",
    });
    expect(res.status).toBe(403);
    expect(String((res.json?.error as { message: string }).message)).toMatch(/JSON/);
    expect(await h.fingerprint()).toBe(before);
  });

  it("JSON from another origin, or with neither Origin nor Referer, is refused with 403", async () => {
    h.signInAs("branch_manager");
    const before = await h.fingerprint();
    const body = { reason: "Forged from another site" };
    const params = { id: String(ids.purchase) };
    for (const origin of ["http://evil.example", "http://127.0.0.1:3001", "https://127.0.0.1:3000", "null"]) {
      const res = await h.call("purchases/[id]/void", "POST", { params, body, origin });
      expect(res.status, origin).toBe(403);
    }
    expect((await h.call("purchases/[id]/void", "POST", { params, body, origin: false })).status).toBe(403);
    const viaReferer = await h.call("purchases/[id]/void", "POST", {
      params,
      body,
      origin: false,
      headers: { referer: "http://evil.example/page" },
    });
    expect(viaReferer.status).toBe(403);
    expect(await h.fingerprint()).toBe(before);
  });

  it("the app's own Referer is accepted when a browser sends no Origin", async () => {
    h.signInAs("branch_manager");
    const res = await h.call("findings/digest", "POST", { origin: false, headers: { referer: "http://127.0.0.1:3000/findings" } });
    expect([200, 201]).toContain(res.status);
  });

  it("a JSON-only route refuses multipart, and an upload route refuses JSON", async () => {
    h.signInAs("branch_manager");
    const form = new FormData();
    form.set("reason", "Sent as a form");
    expect((await h.call("purchases/[id]/void", "POST", { params: { id: String(ids.purchase) }, form })).status).toBe(403);
    expect((await h.call("equipment/[id]/evidence", "POST", { params: { id: String(ids.equipment) }, body: { file: "x" } })).status).toBe(
      403,
    );
  });

  it("reads (GET) need no origin", async () => {
    h.signInAs("branch_manager");
    expect((await h.call("purchases/[id]", "GET", { params: { id: String(ids.purchase) }, origin: false })).status).toBe(200);
  });
});

describe("path ids", () => {
  it("only plain positive integers are ids: 1e3, hex, signs, decimals, padding and huge numbers are not found", async () => {
    h.signInAs("owner");
    expect((await h.call("jobs/[id]", "GET", { params: { id: String(ids.job) } })).status).toBe(200);
    for (const id of ["1e3", "1E3", "0x10", "+1", "-1", "1.0", " 1", "1 ", "01", "0", "9007199254740993", "1_000", "١"]) {
      const res = await h.call("jobs/[id]", "GET", { params: { id } });
      expect(res.status, JSON.stringify(id)).toBe(404);
    }
  });

  it("a second id in the path is checked the same way", async () => {
    h.signInAs("owner");
    const res = await h.call("cylinders/[id]/weighings/[weighingId]/void", "POST", {
      params: { id: "1", weighingId: "1e0" },
      body: { reason: "Checking the id parser" },
    });
    expect(res.status).toBe(404);
  });
});

describe("uploads", () => {
  const upload = async (bytes: Uint8Array | Buffer, name: string) => {
    const form = new FormData();
    form.set("file", new Blob([new Uint8Array(bytes)]), name);
    return h.call("equipment/[id]/evidence", "POST", { params: { id: String(ids.equipment) }, form });
  };
  const fieldError = (res: { json: Record<string, unknown> | null }) =>
    ((res.json?.error as { fieldErrors?: Record<string, string[]> })?.fieldErrors?.file ?? [])[0] ?? "";

  it("a small PNG claiming 12000 × 12000 pixels is refused from its header, before decoding", async () => {
    h.signInAs("branch_manager");
    const before = await h.fingerprint();
    for (const [w, hgt] of [
      [12000, 12000],
      [20000, 20000],
    ]) {
      const bomb = bombPng(w!, hgt!);
      expect(bomb.byteLength).toBeLessThan(200 * 1024);
      const res = await upload(bomb, "label.png");
      expect(res.status).toBe(400);
      expect(fieldError(res)).toMatch(new RegExp(`${w} × ${hgt} pixels; the limit is 50 megapixels`));
    }
    expect(await h.fingerprint()).toBe(before);
  });

  it("equipment evidence refuses path-like and CR/LF file names, truncated images and truncated PDFs", async () => {
    h.signInAs("branch_manager");
    const before = await h.fingerprint();
    const png = cardPng(64, 40);
    expect(fieldError(await upload(png, "../../etc/passwd.png"))).toMatch(/file name is not accepted/);
    expect(fieldError(await upload(png, "label\r\nX-Injected: 1.png"))).toMatch(/file name is not accepted/);
    expect(fieldError(await upload(png.subarray(0, png.byteLength - 40), "label.png"))).toMatch(/could not be opened/);
    const pdf = cardPdf();
    expect(fieldError(await upload(pdf.subarray(0, pdf.byteLength - 30), "cert.pdf"))).toMatch(/PDF is incomplete/);
    expect(fieldError(await upload(Buffer.from("MZ\x90\x00not a photo"), "label.jpg"))).toMatch(/Only photos/);
    expect(await h.fingerprint()).toBe(before);
  });

  it("a good photo is accepted, stored under a key of ours", async () => {
    h.signInAs("branch_manager");
    const res = await upload(cardPng(64, 40), "label.png");
    expect(res.status).toBe(201);
    const keys = [...h.storage.files.keys()];
    expect(keys.at(-1)).toMatch(new RegExp(`^equipment/\\d+/${ids.equipment}/\\d+\\.png$`));
  });

  it("when object storage is down, the upload answers 503 and saves nothing", async () => {
    h.signInAs("branch_manager");
    const before = await h.fingerprint();
    h.storage.down = true;
    try {
      const res = await upload(cardPng(64, 40), "label.png");
      expect(res.status).toBe(503);
      expect(res.json?.error).toMatchObject({ code: "unavailable", message: "file storage is unavailable, nothing was saved" });
    } finally {
      h.storage.down = false;
    }
    expect(await h.fingerprint()).toBe(before);
  });
});
