#!/usr/bin/env node
// Started by Playwright's webServer: a fresh demo database, the local fakes on test ports, and the
// built app on http://127.0.0.1:$E2E_PORT (default 3100). Ports of the fakes follow the app's port,
// so several runs can share a machine (set NEXT_DIST_DIR too, and build into it first).
import { rmSync } from "node:fs";
import { join } from "node:path";
import { e2ePorts, nextBin, root, run, start, stateDir, tsxBin } from "./lib.mjs";

const ports = e2ePorts();
const dir = join(stateDir, `e2e-${ports.app}`);
rmSync(dir, { recursive: true, force: true });

const env = {
  NODE_ENV: "production",
  NEXTAUTH_URL: `http://127.0.0.1:${ports.app}`,
  NEXTAUTH_SECRET: "e2e-only-secret-not-for-production-0123456789",
  COLDTRAIL_ALLOW_DEV_DEFAULTS: "1",
  COLDTRAIL_DB: join(dir, "coldtrail.sqlite"),
  SMTP_PORT: String(ports.smtp),
  MAIL_UI_PORT: String(ports.mailUi),
  S3_PORT: String(ports.s3),
  S3_ENDPOINT: `http://127.0.0.1:${ports.s3}`,
  FAKES_DIR: join(dir, "fakes"),
  // Digests are sent on demand in the tests; a timer firing mid-run would add unexpected mail.
  COLDTRAIL_DIGEST: "off",
};

run(process.execPath, [tsxBin, "packages/db/src/cli.ts", "reset"], { env });
const fakes = start(process.execPath, [tsxBin, "scripts/fakes.ts"], { env });
const web = start(process.execPath, [nextBin, "start", "-H", "127.0.0.1", "-p", String(ports.app)], {
  cwd: join(root, "apps", "web"),
  env,
});

const stop = () => {
  fakes.kill("SIGTERM");
  web.kill("SIGTERM");
  setTimeout(() => process.exit(0), 1500).unref();
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
web.on("exit", () => {
  fakes.kill("SIGTERM");
  process.exit(0);
});
