// ESLint for the whole workspace: `pnpm lint` (with `prettier --check`). See DEVELOPERS.md, "Lint and format".
import path from "node:path";
import { fileURLToPath } from "node:url";
import js from "@eslint/js";
import nextPlugin from "@next/eslint-plugin-next";
import prettier from "eslint-config-prettier";
import reactHooks from "eslint-plugin-react-hooks";
import globals from "globals";
import tseslint from "typescript-eslint";
import coldtrail from "./tools/eslint-plugin-coldtrail.mjs";

const root = path.dirname(fileURLToPath(import.meta.url));
const webServerDir = path.join(root, "apps/web/src/lib/server");

const boundary = (options) => ({ "coldtrail/import-boundary": ["error", options] });

export default tseslint.config(
  {
    ignores: [
      "**/node_modules/**",
      "**/.next*/**",
      "**/.coldtrail/**",
      "test-results/**",
      "playwright-report*/**",
      "apps/web/next-env.d.ts",
    ],
  },
  { linterOptions: { reportUnusedDisableDirectives: "error" } },

  js.configs.recommended,
  ...tseslint.configs.recommendedTypeChecked,
  {
    languageOptions: {
      parserOptions: { projectService: true, tsconfigRootDir: root },
      globals: { ...globals.node },
    },
    plugins: { coldtrail },
    rules: {
      "@typescript-eslint/no-unused-vars": [
        "error",
        { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none", ignoreRestSiblings: true },
      ],
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports" }],
      "@typescript-eslint/no-import-type-side-effects": "error",
      "@typescript-eslint/switch-exhaustiveness-check": ["error", { considerDefaultExhaustiveForUnions: true }],
      "@typescript-eslint/no-unnecessary-type-assertion": "error",
      "@typescript-eslint/no-misused-promises": ["error", { checksVoidReturn: { attributes: false } }], // React ignores what an event handler returns; react-hook-form's handleSubmit returns a promise
      "@typescript-eslint/require-await": "off", // async functions that satisfy a Promise-returning interface (next-auth callbacks, fakes) are clearer than Promise.resolve()
      "@typescript-eslint/no-base-to-string": "off", // String(value) formats unknown column values that are primitives at run time; flagged ~30 times, none an object
      eqeqeq: ["error", "smart"],
    },
  },
  {
    files: ["packages/db/**/*.ts", "tests/**/*.ts"],
    rules: {
      // knex query builders are thenables, so knex's own callback style `where((qb) => qb.where(...))` reads as a misused promise.
      "@typescript-eslint/no-misused-promises": [
        "error",
        { checksVoidReturn: { attributes: false, arguments: false, properties: false, variables: false } },
      ],
    },
  },
  {
    files: ["packages/db/**/*.ts"],
    rules: {
      // knex returns rows as `any` until the rows are typed; meanwhile each `any` shows as a warning and the unsafe-any rules are off.
      "@typescript-eslint/no-explicit-any": "warn",
      "@typescript-eslint/no-unsafe-assignment": "off",
      "@typescript-eslint/no-unsafe-member-access": "off",
      "@typescript-eslint/no-unsafe-argument": "off",
      "@typescript-eslint/no-unsafe-return": "off",
      "@typescript-eslint/no-unsafe-call": "off",
      // knex infers a query's row type from a cast around it (`(await db("t")…) as Row[]`), which this rule reports.
      "@typescript-eslint/no-unnecessary-type-assertion": "off",
    },
  },
  {
    files: ["tests/**/*.ts", "packages/*/test/**/*.ts"],
    rules: {
      // Route modules are imported after their mocks are set up (`await import(...)`), so their types are
      // named at that point with `typeof import(...)`.
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports", disallowTypeAnnotations: false }],
      // Tests read JSON responses and raw rows (`any`) and assert their shape at run time; typing each one adds nothing.
      "@typescript-eslint/no-unsafe-assignment": "off",
      "@typescript-eslint/no-unsafe-member-access": "off",
      "@typescript-eslint/no-unsafe-argument": "off",
      "@typescript-eslint/no-unsafe-return": "off",
      "@typescript-eslint/no-unsafe-call": "off",
    },
  },
  {
    files: ["**/*.{js,mjs,cjs}", "*.mts", "tests/**/vitest.config.mts"],
    ...tseslint.configs.disableTypeChecked,
  },

  {
    files: ["apps/web/**/*.{ts,tsx}"],
    rules: {
      // The web app still reads some knex rows and `response.json()` results, both typed `any`; until
      // the data layer returns typed rows (the thin-data-layer work), each such use is a warning to fix
      // there, not an error that blocks every change.
      "@typescript-eslint/no-unsafe-assignment": "warn",
      "@typescript-eslint/no-unsafe-member-access": "warn",
      "@typescript-eslint/no-unsafe-argument": "warn",
      "@typescript-eslint/no-unsafe-return": "warn",
      "@typescript-eslint/no-unsafe-call": "warn",
    },
  },

  // React and Next.js rules for the web app.
  {
    files: ["apps/web/**/*.{ts,tsx}"],
    ...reactHooks.configs.flat.recommended,
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
  },
  {
    files: ["apps/web/**/*.{ts,tsx}"],
    rules: {
      "react-hooks/exhaustive-deps": "error",
      // The two rules below inform the React Compiler, which this app does not use.
      "react-hooks/incompatible-library": "off", // react-hook-form's watch() cannot be memoised by the compiler
      "react-hooks/set-state-in-effect": "off", // flags the "interactive after hydration" flag and resetting state on navigation, both intended
    },
  },
  {
    files: ["apps/web/**/*.{ts,tsx}"],
    plugins: nextPlugin.configs["core-web-vitals"].plugins,
    rules: nextPlugin.configs["core-web-vitals"].rules,
    settings: { next: { rootDir: "apps/web/" } },
  },

  // Architecture boundaries (tested in tests/unit/lint-boundaries.test.ts).
  {
    files: ["packages/core/src/**/*.ts"],
    rules: boundary({
      boundary: "packages/core holds pure rules with no I/O, database or framework",
      forbidden: [
        "@coldtrail/db",
        "@coldtrail/web",
        "@/*",
        { resolved: path.join(root, "apps") },
        { resolved: path.join(root, "packages/db") },
        "next",
        "react",
        "react-dom",
        "knex",
        "better-sqlite3",
        "pg",
        "server-only",
        "node:builtins",
      ],
    }),
  },
  {
    files: ["packages/db/**/*.ts"],
    rules: boundary({
      boundary: "packages/db serves every app and knows nothing of the web app or its framework",
      forbidden: ["@coldtrail/web", "@/*", { resolved: path.join(root, "apps") }, "next", "next-auth", "react", "react-dom", "server-only"],
    }),
  },
  {
    files: ["apps/web/src/**/*.{ts,tsx}"],
    rules: boundary({
      boundary: 'a "use client" module is sent to the browser, so it imports no server code (type-only imports are fine)',
      onlyClientModules: true,
      allowTypeImports: true,
      forbidden: [
        "@coldtrail/db",
        "server-only",
        "@/lib/server/",
        { resolved: webServerDir },
        "@/lib/db",
        "@/lib/env",
        "knex",
        "better-sqlite3",
        "pg",
        "nodemailer",
        "node:builtins",
      ],
    }),
  },

  prettier,
);
