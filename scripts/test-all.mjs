#!/usr/bin/env node
// `npm test`: install, type-check, lint (ESLint and Prettier), run the unit, reference and database tests (vitest), build the
// app and run the end-to-end tests in Chromium (Playwright starts its own server and fakes).
import { existsSync } from "node:fs";
import { join } from "node:path";
import { install, nextBin, pnpm, root, run } from "./lib.mjs";

install();
pnpm(["run", "typecheck"]);
pnpm(["run", "lint"]);
pnpm(["exec", "vitest", "run"]);

const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
if (!existsSync(chromium)) {
  console.error(`✗ Chromium not found at ${chromium}. Install Debian's package (apt-get install -y chromium) or set CHROMIUM_PATH.`);
  process.exit(1);
}
run(process.execPath, [nextBin, "build"], {
  cwd: join(root, "apps", "web"),
  env: { NODE_ENV: "production", COLDTRAIL_ALLOW_DEV_DEFAULTS: "1" },
});
pnpm(["exec", "playwright", "test", "-c", "tests/e2e/playwright.config.ts"]);
console.log("\n✓ All tests passed");
