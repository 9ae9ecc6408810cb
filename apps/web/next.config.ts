import type { NextConfig } from "next";
import { COMMON_SECURITY_HEADERS } from "./src/lib/security-headers";

const nextConfig: NextConfig = {
  // knex loads optional drivers dynamically and better-sqlite3 is native: keep both out of the bundle.
  serverExternalPackages: ["knex", "better-sqlite3", "nodemailer", "jimp"],
  transpilePackages: ["@coldtrail/core", "@coldtrail/db"],
  poweredByHeader: false,
  // Parallel builds (e.g. several end-to-end runs on one machine) each use their own folder.
  distDir: process.env.NEXT_DIST_DIR ?? ".next",
  typedRoutes: false,
  // `npm test` type-checks the whole workspace before building; parallel local builds may skip it.
  typescript: { ignoreBuildErrors: process.env.NEXT_SKIP_TYPECHECK === "1" },
  // nosniff, framing, referrer and permissions on every answer: pages, API and static files
  // (the Content Security Policy and HSTS are set per request in src/proxy.ts).
  headers: async () => [{ source: "/:path*", headers: [...COMMON_SECURITY_HEADERS] }],
};

export default nextConfig;
