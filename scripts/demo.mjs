#!/usr/bin/env node
// `npm run demo`: install, migrate, load the demo data (first run only), start the local mail and
// file-storage fakes, build and serve Coldtrail on http://127.0.0.1:3000.
// `npm run demo -- --fresh` throws the local database away and loads the demo data again.
import { join } from "node:path";
import { devSecret, install, nextBin, root, run, start, stateDir, tsxBin } from "./lib.mjs";

const fresh = process.argv.includes("--fresh");
install();

const env = {
  NEXTAUTH_URL: "http://127.0.0.1:3000",
  NEXTAUTH_SECRET: devSecret(),
  COLDTRAIL_DB: process.env.COLDTRAIL_DB ?? join(stateDir, "coldtrail.sqlite"),
  COLDTRAIL_ALLOW_DEV_DEFAULTS: "1",
};

run(process.execPath, [tsxBin, "packages/db/src/cli.ts", fresh ? "reset" : "setup"], { env });
run(process.execPath, [nextBin, "build"], { cwd: join(root, "apps", "web"), env });

const fakes = start(process.execPath, [tsxBin, "scripts/fakes.ts"], { env });
const web = start(process.execPath, [nextBin, "start", "-H", "127.0.0.1", "-p", "3000"], { cwd: join(root, "apps", "web"), env });
console.log("\nColdtrail: http://127.0.0.1:3000  ·  caught mail: http://127.0.0.1:2580  ·  Ctrl+C stops everything");

const stop = () => {
  fakes.kill("SIGTERM");
  web.kill("SIGTERM");
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
web.on("exit", (code) => {
  fakes.kill("SIGTERM");
  process.exit(code ?? 0);
});
