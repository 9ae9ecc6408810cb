// Regenerates the rule reference section of packages/core/README.md from the registry.
// Run from the repository root: pnpm rules:doc
import { readFileSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { RULES } from "../src/audit/rule-registry";
import { renderRulesReference, replaceRulesReference } from "../src/audit/rules-reference";

const readmePath = join(dirname(fileURLToPath(import.meta.url)), "../README.md");
const before = readFileSync(readmePath, "utf8");
const after = replaceRulesReference(before, renderRulesReference(RULES));
if (after === before) {
  console.log(`rules reference up to date (${RULES.length} rules)`);
} else {
  writeFileSync(readmePath, after);
  console.log(`rules reference written (${RULES.length} rules)`);
}
