import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

const SRC = join(__dirname, "../src");
const OWN_DIRS = ["units", "dates", "refrigerants", "classification", "evacuation", "leak-rate", "cylinders", "eu", "audit"];

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? files(p) : p.endsWith(".ts") ? [p] : [];
  });
}

describe("the rules core has no I/O", () => {
  it("imports no node built-ins, database or web code", () => {
    const own = [
      ...OWN_DIRS.flatMap((d) => files(join(SRC, d))),
      ...["errors.ts", "mass-balance.ts", "record-completeness.ts", "settings.ts", "rules-core.ts"].map((f) => join(SRC, f)),
    ];
    expect(own.length).toBeGreaterThan(20);
    for (const file of own) {
      const imports = [...readFileSync(file, "utf8").matchAll(/from\s+"([^"]+)"/g)].map((m) => m[1]!);
      for (const spec of imports) {
        expect(spec.startsWith(".") || spec === "zod", `${file} imports ${spec}`).toBe(true);
      }
    }
  });
});
