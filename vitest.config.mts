import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: [
      "packages/*/test/**/*.test.ts",
      "tests/reference/**/*.test.ts",
      "tests/db/**/*.test.ts",
      "tests/authz/**/*.test.ts",
      "tests/unit/**/*.test.ts",
    ],
    environment: "node",
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: "forks",
  },
});
