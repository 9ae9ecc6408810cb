/**
 * Where to go after signing in: `next` only when it resolves, by the URL standard, to a page of this
 * same site; otherwise "/". Parsed with the URL API as the browser will parse it, never by string
 * prefix: "/\evil.example/" and "/<tab>/evil.example" look like paths but browsers read them as
 * "//evil.example", another site.
 */
export function safeNextPath(next: string | null | undefined, origin: string): string {
  if (typeof next !== "string" || next === "") return "/";
  let base: URL;
  let target: URL;
  try {
    base = new URL(origin);
    target = new URL(next, base);
  } catch {
    return "/";
  }
  if (target.origin !== base.origin) return "/";
  if (target.username || target.password) return "/";
  const path = `${target.pathname}${target.search}${target.hash}`;
  // What we hand back is parsed again by the browser against the page: it must stay a plain path.
  return path.startsWith("/") && !path.startsWith("//") && !path.includes("\\") ? path : "/";
}
