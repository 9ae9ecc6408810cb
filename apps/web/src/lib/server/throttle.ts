import "server-only";
import { createThrottle, type PublicRouteName, type Throttle } from "@coldtrail/db";
import { NextResponse } from "next/server";
import { db } from "../db";
import { env } from "../env";

const globalForThrottle = globalThis as unknown as { __coldtrailThrottle?: Throttle };

/** The throttle of this server process, counting in the shared database (see @coldtrail/db throttle.ts). */
export function throttle(): Throttle {
  globalForThrottle.__coldtrailThrottle ??= createThrottle(db(), { scale: env.COLDTRAIL_THROTTLE_SCALE });
  return globalForThrottle.__coldtrailThrottle;
}

type HeaderBag = Headers | Record<string, string | string[] | undefined>;

function header(headers: HeaderBag, name: string): string | undefined {
  if (headers instanceof Headers) return headers.get(name) ?? undefined;
  const v = headers[name] ?? headers[name.toLowerCase()];
  return Array.isArray(v) ? v.join(",") : v;
}

/**
 * The client's address. The Next.js server puts the socket's address in X-Forwarded-For when the
 * request has none; each reverse proxy in front appends the address it saw. So the address is the
 * entry COLDTRAIL_TRUSTED_PROXIES places from the right (1 by default: one proxy, or none); entries
 * further left were written by the client and are not trusted.
 */
export function clientAddress(headers: HeaderBag): string {
  const entries = (header(headers, "x-forwarded-for") ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  const hops = Math.max(1, env.COLDTRAIL_TRUSTED_PROXIES);
  return entries[Math.max(0, entries.length - hops)] ?? "unknown";
}

/** The 429 answer of a throttled public route, with Retry-After. */
export function tooManyRequests(refusal: { retryAfterSeconds: number; message: string }, what: string): Response {
  return NextResponse.json(
    { error: { code: "throttled", message: `Too many ${what} from this address. ${refusal.message}` } },
    { status: 429, headers: { "Retry-After": String(refusal.retryAfterSeconds) } },
  );
}

/** Counts a request to a public route from this client; a Response (429) when it is over the limit. */
export async function throttlePublic(req: Request, route: PublicRouteName, what: string): Promise<Response | null> {
  const refusal = await throttle().publicRequest(route, clientAddress(req.headers));
  return refusal ? tooManyRequests(refusal, what) : null;
}

/** For the pages that look a link's token up (invitation, reset): a refusal message when this client opened too many. */
export async function linkOpenRefusal(): Promise<string | null> {
  const { headers } = await import("next/headers");
  const refusal = await throttle().publicRequest("link-open", clientAddress(await headers()));
  return refusal ? `Too many links were opened from this address. ${refusal.message}` : null;
}
