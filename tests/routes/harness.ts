import { vi } from "vitest";
import { createRequire } from "node:module";
import { readdirSync, realpathSync, statSync } from "node:fs";
import { join, relative, sep } from "node:path";
import { fileURLToPath } from "node:url";
import { defineAbilityFor, type Actor, type AppAbility } from "@coldtrail/core";
import { DEMO_SIGN_INS, loadActor } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * Calls the app's API route handlers in-process, as the server calls them: the real `route()` wrapper,
 * the real handlers and upload checks, a copy of the demo database. Only the session lookup and the
 * object store are replaced (the store can be switched "down" to test the 503).
 */

export const APP_ORIGIN = "http://127.0.0.1:3000"; // the env module's default NEXTAUTH_URL in tests
const apiDir = fileURLToPath(new URL("../../apps/web/src/app/api/", import.meta.url));
const web = (p: string) => fileURLToPath(new URL(`../../apps/web/src/${p}`, import.meta.url));
const webRequire = createRequire(new URL("../../apps/web/package.json", import.meta.url));
export const { NextRequest } = webRequire("next/server") as { NextRequest: new (url: string, init?: RequestInit) => Request };

export const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;
export type Method = (typeof METHODS)[number];
type Handler = (req: Request, ctx: { params: Promise<Record<string, string | string[]>> }) => Promise<Response>;

/** Every `route.ts` under app/api, as its path pattern (`jobs/[id]/void`). */
export function routeFiles(): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const p = join(dir, name);
      if (statSync(p).isDirectory()) walk(p);
      else if (name === "route.ts") out.push(relative(apiDir, dir).split(sep).join("/"));
    }
  };
  walk(apiDir);
  return out.sort();
}

export const ROLES = ["owner", "compliance_officer", "branch_manager", "technician", "inspector", "other_org_manager"] as const;
export type RoleKey = (typeof ROLES)[number];

export interface Harness {
  t: TestDb;
  actors: Record<RoleKey, Actor>;
  session: { signedIn: { actor: Actor; ability: AppAbility } | null };
  storage: { down: boolean; files: Map<string, { bytes: Uint8Array; mime: string }> };
  load(route: string): Promise<Partial<Record<Method, Handler>>>;
  signInAs(role: RoleKey | null): AppAbility | null;
  call(route: string, method: Method, opts?: CallOptions): Promise<{ status: number; text: string; json: Record<string, unknown> | null }>;
  /** Row counts of every table plus the newest activity id: equal before and after means nothing was written. */
  fingerprint(): Promise<string>;
}

export interface CallOptions {
  params?: Record<string, string>;
  query?: string;
  body?: unknown;
  /** Raw body bytes or text (sent as is, with `contentType`). */
  raw?: BodyInit;
  contentType?: string;
  form?: FormData;
  headers?: Record<string, string>;
  /** false: no Origin header (as a request from outside the app's pages). */
  origin?: string | false;
}

export const NOW = new Date("2026-12-01T12:00:00Z");

async function firstRow(t: TestDb, sql: string): Promise<{ f: unknown }> {
  const rows = await t.db.raw<Array<{ f: unknown }>>(sql);
  return rows[0]!;
}

export async function createHarness(): Promise<Harness> {
  const t = await createSeededTestDb();
  const session: Harness["session"] = { signedIn: null };
  const storage: Harness["storage"] = { down: false, files: new Map() };
  vi.doMock(realpathSync(webRequire.resolve("server-only")), () => ({}));
  vi.doMock(web("lib/auth/current-actor.ts"), () => ({ currentActor: async () => session.signedIn }));
  vi.doMock(web("lib/db.ts"), () => ({ db: () => t.db }));
  vi.doMock(web("lib/server/storage.ts"), async () => {
    const { RequestRefused } = await import(web("lib/api/errors.ts"));
    const { DomainError } = await import("@coldtrail/db");
    const down = () => new RequestRefused(503, "unavailable", "file storage is unavailable, nothing was saved");
    return {
      storageUnavailable: down,
      s3: () => {
        throw down();
      },
      putFile: async (o: { prefix: string; bytes: Uint8Array; mime: string; ext: string }) => {
        if (storage.down) throw down();
        const key = `${o.prefix}/${storage.files.size + 1}.${o.ext}`;
        storage.files.set(key, { bytes: o.bytes, mime: o.mime });
        return key;
      },
      getFile: async (key: string) => {
        if (storage.down) throw down();
        const f = storage.files.get(key);
        // As the real module answers a missing object.
        if (!f)
          throw Object.assign(new DomainError("not_found", "The file is not in storage"), {
            name: "NoSuchKey",
            $metadata: { httpStatusCode: 404 },
          });
        return f;
      },
    };
  });
  // Work the routes start in the background (re-checks, audit runs, import workers, mail) is left out:
  // it is not part of answering the request, and a refused request must find the database still.
  vi.doMock(web("lib/server/continuous-audit.ts"), () => ({ reevaluateAfterWrite: async () => undefined }));
  // Audits still queue their task in the request's transaction (a table row); only the kick is left out.
  vi.doMock(web("lib/server/audit-runner.ts"), async (original) => ({
    ...(await original<object>()),
    kickAuditRunner: () => undefined,
  }));
  vi.doMock(web("app/api/imports/_lib/import-worker.ts"), async (original) => ({
    ...(await original<object>()),
    startCommit: () => undefined,
    startCheck: () => undefined,
  }));
  vi.doMock(web("lib/server/finding-mail.ts"), async (original) => ({
    ...(await original<object>()),
    deliverFindingMailLater: () => undefined,
  }));
  // Mail is sent after answering; keep it from trying a server.
  vi.doMock(web("lib/server/mail.ts"), async (original) => ({ ...(await original<object>()), sendMail: async () => undefined }));

  const actors = {} as Record<RoleKey, Actor>;
  for (const role of ROLES) {
    const user = await t.db("users").where({ email: DEMO_SIGN_INS[role] }).first("id");
    actors[role] = (await loadActor(t.db, Number(user.id)))!;
  }
  const modules = new Map<string, Partial<Record<Method, Handler>>>();
  const load = async (route: string) => {
    if (!modules.has(route)) modules.set(route, (await import(join(apiDir, route, "route.ts"))) as Partial<Record<Method, Handler>>);
    return modules.get(route)!;
  };
  const signInAs = (role: RoleKey | null) => {
    if (role === null) {
      session.signedIn = null;
      return null;
    }
    const ability = defineAbilityFor(actors[role], NOW);
    session.signedIn = { actor: actors[role], ability };
    return ability;
  };
  const call: Harness["call"] = async (route, method, opts = {}) => {
    const handler = (await load(route))[method];
    if (!handler) throw new Error(`${method} ${route} is not exported`);
    const headers: Record<string, string> = { ...opts.headers };
    if (opts.origin !== false) headers.origin = opts.origin ?? APP_ORIGIN;
    const init: RequestInit & { duplex?: string } = { method, headers };
    if (opts.body !== undefined) {
      init.body = JSON.stringify(opts.body);
      headers["content-type"] = "application/json";
    } else if (opts.raw !== undefined) {
      init.body = opts.raw;
      init.duplex = "half";
      if (opts.contentType) headers["content-type"] = opts.contentType;
    } else if (opts.form) init.body = opts.form;
    const url = `http://127.0.0.1:3000/api/${route}${opts.query ? `?${opts.query}` : ""}`;
    const res = await handler(new NextRequest(url, init), { params: Promise.resolve(opts.params ?? {}) });
    const text = res.headers.get("content-type")?.includes("json") ? await res.text() : `[${res.headers.get("content-type")}]`;
    let json: Record<string, unknown> | null;
    try {
      json = JSON.parse(text);
    } catch {
      json = null;
    }
    return { status: res.status, text, json };
  };
  const tables = (
    await t
      .db("sqlite_master")
      .where({ type: "table" })
      .whereNot("name", "like", "sqlite_%")
      .whereNot("name", "like", "knex_%")
      .select("name")
  )
    .map((r) => String(r.name))
    // Throttling counters count every request, refused or not; they hold no record of anyone's work.
    .filter((name) => name !== "rate_limits");
  // One query: the row count of every table and the newest activity id (every write appends to activity).
  const fingerprintSql = `select ${tables.map((name) => `(select count(*) from "${name}")`).join(" || ',' || ")} || ';' || coalesce((select max(id) from activity), 0) as f`;
  const fingerprint = async () => String((await firstRow(t, fingerprintSql)).f);
  return { t, actors, session, storage, load, signInAs, call, fingerprint };
}
