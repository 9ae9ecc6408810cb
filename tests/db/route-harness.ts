import { createRequire } from "node:module";
import { realpathSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { vi } from "vitest";
import { defineAbilityFor, type Actor, type AppAbility } from "@coldtrail/core";
import { loadActor, type Knex } from "@coldtrail/db";

/**
 * Calls the app's API route handlers as the server does (the real `route()` wrapper and handlers)
 * against a test database; only the session lookup and the process-wide handle are replaced.
 */

const web = (p: string) => fileURLToPath(new URL(`../../apps/web/src/${p}`, import.meta.url));
const webRequire = createRequire(new URL("../../apps/web/package.json", import.meta.url));
const APP_ORIGIN = "http://127.0.0.1:3000";
const { NextRequest } = webRequire("next/server") as { NextRequest: new (url: string, init?: RequestInit) => Request };

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;
export type RouteModule = Partial<Record<"GET" | "POST" | "PATCH" | "DELETE", Handler>>;

export interface Harness {
  signInAs: (userId: number | null) => Promise<void>;
  load: (path: string) => Promise<RouteModule>;
  call: (
    mod: RouteModule,
    method: "GET" | "POST" | "PATCH" | "DELETE",
    opts?: { params?: Record<string, string>; body?: unknown; form?: FormData; headers?: Record<string, string>; path?: string },
  ) => Promise<{ status: number; json: Record<string, unknown>; headers: Headers }>;
}

/** Call once in beforeAll, before loading any route module. `db` is read on every request. */
export function routeHarness(db: () => Knex, extraMocks: (webPath: (p: string) => string) => void = () => undefined): Harness {
  const session: { signedIn: { actor: Actor; ability: AppAbility } | null } = { signedIn: null };
  vi.doMock(realpathSync(webRequire.resolve("server-only")), () => ({}));
  vi.doMock(web("lib/auth/current-actor.ts"), () => ({ currentActor: async () => session.signedIn }));
  vi.doMock(web("lib/db.ts"), () => ({ db: () => db() }));
  vi.doMock("@/lib/api/route", () => import(web("lib/api/route.ts")));
  vi.doMock("@/lib/server/task-kick", () => import(web("lib/server/task-kick.ts")));
  extraMocks(web);
  return {
    signInAs: async (userId) => {
      if (userId === null) {
        session.signedIn = null;
        return;
      }
      const actor = (await loadActor(db(), userId))!;
      session.signedIn = { actor, ability: defineAbilityFor(actor, new Date()) };
    },
    load: (p) => import(web(`app/api/${p}/route.ts`)) as Promise<RouteModule>,
    call: async (mod, method, opts = {}) => {
      const handler = mod[method];
      if (!handler) throw new Error(`${method} is not exported`);
      // The app's own origin (the env module's default NEXTAUTH_URL in tests), as its pages send it.
      const origin = { origin: APP_ORIGIN };
      const init: RequestInit = { method, headers: { ...origin, ...opts.headers } };
      if (opts.body !== undefined) {
        init.body = JSON.stringify(opts.body);
        init.headers = { "content-type": "application/json", ...origin, ...opts.headers };
      }
      if (opts.form) init.body = opts.form;
      const res = await handler(new NextRequest(`${APP_ORIGIN}${opts.path ?? "/api/x"}`, init), {
        params: Promise.resolve(opts.params ?? {}),
      });
      const text = await res.text();
      let json: unknown;
      try {
        json = JSON.parse(text);
      } catch {
        json = text;
      }
      return { status: res.status, json: json as Record<string, unknown>, headers: res.headers };
    },
  };
}
