#!/usr/bin/env node
// `npm test`: install, type-check, lint (ESLint and Prettier), run the unit, reference and database tests (vitest), build the
// app and run the end-to-end tests in Chromium (Playwright starts its own server and fakes).
import { join } from "node:path";
import { ensureChromium, install, nextBin, pnpm, root, run } from "./lib.mjs";

install();
ensureChromium();
pnpm(["run", "typecheck"]);
pnpm(["run", "lint"]);
pnpm(["exec", "vitest", "run"]);

run(process.execPath, [nextBin, "build"], {
  cwd: join(root, "apps", "web"),
  env: { NODE_ENV: "production", COLDTRAIL_ALLOW_DEV_DEFAULTS: "1" },
});
pnpm(["exec", "playwright", "test", "-c", "tests/e2e/playwright.config.ts"]);
console.log("\n✓ All tests passed");
