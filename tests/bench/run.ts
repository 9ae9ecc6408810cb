/**
 * `pnpm bench`: runs every benchmark in this folder one after the other, each in its own process
 * (so one's memory does not weigh on the next). Benchmarks print figures; none asserts a timing.
 * Pass file names to run only those: `pnpm bench audit-bench.ts`.
 */
import { spawnSync } from "node:child_process";
import { readdirSync } from "node:fs";
import { join } from "node:path";

const here = import.meta.dirname;
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith(".ts") && f !== "run.ts")
  .filter((f) => only.length === 0 || only.includes(f))
  .sort();
let failed = 0;
for (const file of files) {
  console.log(`\n=== ${file} ===`);
  const res = spawnSync(process.execPath, [join(here, "..", "..", "node_modules", "tsx", "dist", "cli.mjs"), join(here, file)], {
    stdio: "inherit",
    env: process.env,
  });
  if (res.status !== 0) failed++;
}
process.exitCode = failed ? 1 : 0;
