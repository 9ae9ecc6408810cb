import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  // The web app's own import alias, so its route handlers can be called in-process by the tests.
  resolve: { alias: { "@/": fileURLToPath(new URL("./apps/web/src/", import.meta.url)) } },
  test: {
    include: [
      "packages/*/test/**/*.test.ts",
      "tests/reference/**/*.test.ts",
      "tests/db/**/*.test.ts",
      "tests/authz/**/*.test.ts",
      "tests/routes/**/*.test.ts",
      "tests/unit/**/*.test.ts",
    ],
    environment: "node",
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: "forks",
  },
});
