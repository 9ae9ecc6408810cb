import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { RULES, RULES_REFERENCE_END, RULES_REFERENCE_START, renderRulesReference, replaceRulesReference } from "../src/rules-core";

describe("README rule reference", () => {
  it("matches the registry (run `pnpm rules:doc` after changing a rule)", () => {
    const readme = readFileSync(join(__dirname, "../README.md"), "utf8");
    expect(readme).toContain(RULES_REFERENCE_START);
    expect(readme).toContain(RULES_REFERENCE_END);
    expect(replaceRulesReference(readme, renderRulesReference(RULES))).toBe(readme);
  });
  it("lists every rule id with an anchor so a reader finds it in one step", () => {
    const section = renderRulesReference(RULES);
    for (const r of RULES) expect(section).toContain(`<a id="${r.id.toLowerCase()}"></a>**${r.id}**`);
  });
});
