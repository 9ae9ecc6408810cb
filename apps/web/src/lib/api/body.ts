import "server-only";
import { RequestRefused } from "./errors";

/** The most a JSON body may hold unless a route says otherwise: every form of the app fits well inside. */
export const DEFAULT_JSON_LIMIT = 64 * 1024;
/** The largest upload file (checked again per file) plus room for the form's other fields and framing. */
export const MAX_FILE_BYTES = 10 * 1024 * 1024;
export const UPLOAD_BODY_LIMIT = MAX_FILE_BYTES + 256 * 1024;

export function tooLarge(limit: number): RequestRefused {
  const size = limit >= 1024 * 1024 ? `${Math.round(limit / 1024 / 1024)} MB` : `${Math.round(limit / 1024)} KB`;
  return new RequestRefused(413, "too_large", `The request is too large (the limit is ${size})`);
}

/**
 * Reads a request body as a stream and stops as soon as it passes `limit` bytes, so an oversized body
 * is refused (413) without being held in memory. A declared Content-Length above the limit is refused
 * before anything is read.
 */
export async function readBodyLimited(req: Request, limit: number): Promise<Uint8Array> {
  const declared = req.headers.get("content-length");
  if (declared !== null && Number(declared) > limit) {
    await req.body?.cancel().catch(() => undefined);
    throw tooLarge(limit);
  }
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(limit);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** Parses a body already read: JSON text, or a refusal saying the body must be JSON. */
export function parseJsonBody(bytes: Uint8Array): unknown {
  try {
    return JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes));
  } catch {
    throw new RequestRefused(400, "invalid", "The request body must be JSON");
  }
}
