import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // knex loads optional drivers dynamically and better-sqlite3 is native: keep both out of the bundle.
  serverExternalPackages: ["knex", "better-sqlite3", "nodemailer", "jimp"],
  transpilePackages: ["@coldtrail/core", "@coldtrail/db"],
  poweredByHeader: false,
  // Parallel builds (e.g. several end-to-end runs on one machine) each use their own folder.
  distDir: process.env.NEXT_DIST_DIR ?? ".next",
  typedRoutes: false,
};

export default nextConfig;
