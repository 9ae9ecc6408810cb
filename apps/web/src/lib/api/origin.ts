import "server-only";
import { env } from "../env";
import { RequestRefused } from "./errors";

/** What a state-changing route may receive: JSON, or a multipart form where the route takes files. */
export type BodyKind = "json" | "multipart" | "json-or-multipart";

const STATE_CHANGING = new Set(["POST", "PUT", "PATCH", "DELETE"]);

export function isStateChanging(method: string): boolean {
  return STATE_CHANGING.has(method.toUpperCase());
}

/** The app's own origin (scheme, host and port of NEXTAUTH_URL). */
export function appOrigin(): string {
  return new URL(env.NEXTAUTH_URL).origin;
}

function originOf(value: string | null): string | null {
  if (!value) return null;
  try {
    const url = new URL(value);
    return url.protocol === "http:" || url.protocol === "https:" ? url.origin : null;
  } catch {
    return null;
  }
}

/**
 * Cross-site request forgery defence for state-changing requests, on top of SameSite cookies:
 * - the request must come from the app's own pages: its Origin (or, when a browser sends none, its
 *   Referer) is the app's own origin;
 * - a body must be declared as JSON (or multipart where the route takes files). A plain HTML form can
 *   only send text/plain, urlencoded or multipart, and a page cannot send JSON to another site
 *   without a CORS preflight, which this app never grants.
 * Refusals are 403 with a plain message.
 */
export function checkRequestOrigin(req: Request, accepts: BodyKind = "json"): void {
  if (!isStateChanging(req.method)) return;
  const expected = appOrigin();
  const origin = req.headers.get("origin");
  const from = origin !== null ? originOf(origin) : originOf(req.headers.get("referer"));
  if (from !== expected) {
    throw new RequestRefused(403, "forbidden", "This request did not come from Coldtrail's own pages and was refused");
  }
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  const hasBody = type !== "" || (req.headers.get("content-length") ?? "0") !== "0" || req.headers.has("transfer-encoding");
  if (!hasBody) return;
  const json = type === "application/json";
  const multipart = type === "multipart/form-data";
  const ok = accepts === "json" ? json : accepts === "multipart" ? multipart : json || multipart;
  if (!ok) {
    const wanted =
      accepts === "json"
        ? "JSON (application/json)"
        : accepts === "multipart"
          ? "a file upload (multipart/form-data)"
          : "JSON or a file upload";
    throw new RequestRefused(403, "forbidden", `This request was refused: send ${wanted}`);
  }
}
