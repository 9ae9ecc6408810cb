import { NextResponse, type NextRequest } from "next/server";
import { API_CSP, HSTS, newNonce, pageCsp } from "./lib/security-headers";

/**
 * Runs before every page and API request (Next.js 16 Proxy): a fresh nonce and Content Security Policy
 * per page request, a locked-down policy for API answers, and HSTS when served over https. The other
 * security headers are set for every path in next.config.ts.
 */
export function proxy(request: NextRequest) {
  const https = request.nextUrl.protocol === "https:" || request.headers.get("x-forwarded-proto")?.split(",")[0]?.trim() === "https";
  const isApi = request.nextUrl.pathname.startsWith("/api/");
  let response: NextResponse;
  if (isApi) {
    response = NextResponse.next();
    response.headers.set("Content-Security-Policy", API_CSP);
  } else {
    const nonce = newNonce();
    const csp = pageCsp({ nonce, dev: process.env.NODE_ENV === "development", https });
    // Next.js reads the policy from the request to put the nonce on the scripts it renders.
    const requestHeaders = new Headers(request.headers);
    requestHeaders.set("x-nonce", nonce);
    requestHeaders.set("Content-Security-Policy", csp);
    response = NextResponse.next({ request: { headers: requestHeaders } });
    response.headers.set("Content-Security-Policy", csp);
  }
  if (https) response.headers.set("Strict-Transport-Security", HSTS);
  return response;
}

export const config = {
  matcher: [
    // Everything but Next's build files and the icon, which carry no nonce.
    { source: "/((?!_next/static|_next/image|favicon.ico).*)" },
  ],
};
