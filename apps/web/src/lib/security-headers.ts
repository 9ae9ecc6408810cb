/**
 * The security headers of every response (pure, so they are unit-tested). Pages get a Content
 * Security Policy with a fresh nonce per request: Next.js puts the nonce on its own scripts, and no
 * other script runs ('strict-dynamic' lets those scripts load the app's chunks; no 'unsafe-inline' for
 * scripts). API answers get a policy that allows nothing, since they are data, not documents.
 */

export interface CspOptions {
  nonce: string;
  /** Development only: React's dev build evaluates code for its error overlay. */
  dev?: boolean;
  https?: boolean;
}

export function pageCsp({ nonce, dev = false, https = false }: CspOptions): string {
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    // Inline style attributes (React style={...}, charts) need 'unsafe-inline' for styles only;
    // styles cannot run code.
    "style-src 'self' 'unsafe-inline'",
    // Card photos are previewed from blob: URLs before upload; data: for small inline images.
    "img-src 'self' blob: data:",
    "font-src 'self'",
    "connect-src 'self'",
    "media-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    "frame-src 'none'",
    "worker-src 'self' blob:",
    "manifest-src 'self'",
  ];
  if (https) directives.push("upgrade-insecure-requests");
  return directives.join("; ");
}

/** For API answers (JSON, files): nothing may run or be framed. */
export const API_CSP = "default-src 'none'; frame-ancestors 'none'; sandbox";

/** HSTS: two years, subdomains included; sent only when the app is served over https. */
export const HSTS = "max-age=63072000; includeSubDomains";

/** Headers for every response, pages, API and static files alike (next.config.ts). */
export const COMMON_SECURITY_HEADERS: ReadonlyArray<{ key: string; value: string }> = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Referrer-Policy", value: "same-origin" },
  // The camera is used by this site itself (photographing certification cards); nothing else is.
  {
    key: "Permissions-Policy",
    value: "camera=(self), microphone=(), geolocation=(), payment=(), usb=(), serial=(), bluetooth=(), midi=(), display-capture=()",
  },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  { key: "Cross-Origin-Resource-Policy", value: "same-origin" },
];

/** A nonce: 16 random bytes, base64. */
export function newNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}
