import { fileURLToPath } from "node:url";
import { ESLint } from "eslint";
import { beforeAll, describe, expect, it } from "vitest";

// The import boundaries of eslint.config.mjs, run through ESLint's Node API on in-memory modules placed
// in each part of the workspace. Only the boundary rule runs, without type information, so this stays fast.
const root = fileURLToPath(new URL("../..", import.meta.url));
const RULE = "coldtrail/import-boundary";

let eslint: ESLint;
beforeAll(() => {
  eslint = new ESLint({
    cwd: root,
    cache: false,
    overrideConfig: { languageOptions: { parserOptions: { projectService: false, project: null } } },
    ruleFilter: ({ ruleId }) => ruleId === RULE,
  });
});

async function boundaryErrors(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: `${root}/${filePath}` });
  expect(result, `${filePath} is linted`).toBeDefined();
  const fatal = result!.messages.filter((m) => m.fatal);
  expect(fatal, "the probe parses").toEqual([]);
  return result!.messages.filter((m) => m.ruleId === RULE).map((m) => m.message);
}

const CORE = "packages/core/src/lint-probe.ts";
const DB = "packages/db/src/lint-probe.ts";
const CLIENT = "apps/web/src/app/(app)/lint-probe/probe-form.tsx";

describe("packages/core imports no database, web, framework or Node I/O code", () => {
  it.each([
    `import { getDb } from "@coldtrail/db";`,
    `import { db } from "@/lib/db";`,
    `import { env } from "../../../apps/web/src/lib/env";`,
    `import { listJobs } from "../../db/src/jobs";`,
    `import { NextResponse } from "next/server";`,
    `import { useState } from "react";`,
    `import knex from "knex";`,
    `import Database from "better-sqlite3";`,
    `import { readFileSync } from "node:fs";`,
    `import { readFile } from "fs/promises";`,
    `import { createServer } from "http";`,
    `import net from "net";`,
    `export { spawn } from "node:child_process";`,
    `export async function load() { return import("node:fs"); }`,
  ])("refuses %s", async (code) => {
    const errors = await boundaryErrors(CORE, code);
    expect(errors).toHaveLength(1);
    expect(errors[0]).toContain("packages/core holds pure rules");
  });

  it("accepts its own modules and zod", async () => {
    expect(
      await boundaryErrors(
        CORE,
        `import { z } from "zod";\nimport { toGrams } from "./units";\nexport const s = z.string(); export { toGrams };`,
      ),
    ).toEqual([]);
  });
});

describe("packages/db imports nothing from the web app or its framework", () => {
  it.each([
    `import { db } from "@/lib/db";`,
    `import { env } from "../../../apps/web/src/lib/env";`,
    `import { NextResponse } from "next/server";`,
    `import { getServerSession } from "next-auth";`,
    `import { useState } from "react";`,
    `import "server-only";`,
  ])("refuses %s", async (code) => {
    const errors = await boundaryErrors(DB, code);
    expect(errors).toHaveLength(1);
    expect(errors[0]).toContain("packages/db");
  });

  it("accepts knex, Node modules and the rules core", async () => {
    expect(
      await boundaryErrors(
        DB,
        `import knex from "knex";\nimport { readFileSync } from "node:fs";\nimport { toGrams } from "@coldtrail/core";\nexport { knex, readFileSync, toGrams };`,
      ),
    ).toEqual([]);
  });
});

describe('client components ("use client") import no server modules', () => {
  const client = (line: string) => `"use client";\n${line}\nexport function Probe() { return null; }\n`;

  it.each([
    `import { getDb } from "@coldtrail/db";`,
    `import "server-only";`,
    `import { sendMail } from "@/lib/server/mail";`,
    `import { sendMail } from "../../../lib/server/mail";`,
    `import { db } from "@/lib/db";`,
    `import { env } from "@/lib/env";`,
    `import { readFileSync } from "node:fs";`,
    `import path from "path";`,
    `import knex from "knex";`,
  ])("refuses %s", async (line) => {
    const errors = await boundaryErrors(CLIENT, client(line));
    expect(errors).toHaveLength(1);
    expect(errors[0]).toContain('"use client" module');
  });

  it("accepts type-only imports of database rows, React and client helpers", async () => {
    const code = client(
      `import type { CylinderRow } from "@coldtrail/db";\nimport { type JobRow } from "@coldtrail/db";\nimport { useState } from "react";\nimport { fetchJson } from "@/lib/client/fetch-json";\nexport type Rows = [CylinderRow, JobRow]; export { useState, fetchJson };`,
    );
    expect(await boundaryErrors(CLIENT, code)).toEqual([]);
  });

  it("leaves server components free to read the database", async () => {
    expect(await boundaryErrors(CLIENT, `import { getDb } from "@coldtrail/db";\nimport "server-only";\nexport const db = getDb;`)).toEqual(
      [],
    );
  });
});
