import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // knex loads optional drivers dynamically and better-sqlite3 is native: keep both out of the bundle.
  serverExternalPackages: ["knex", "better-sqlite3", "nodemailer", "smtp-server"],
  transpilePackages: ["@coldtrail/core", "@coldtrail/db"],
  poweredByHeader: false,
  typedRoutes: false,
};

export default nextConfig;
