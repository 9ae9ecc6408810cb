import "server-only";
import type { NextRequest } from "next/server";
import { NextRequest as ServerRequest, NextResponse } from "next/server";
import type { z } from "zod";
import type { Action, Actor, AppAbility, SubjectName } from "@coldtrail/core";
import { currentActor } from "../auth/current-actor";
import { db } from "../db";
import { errorResponse, fieldErrorsOf, toErrorResponse } from "./errors";
import { DEFAULT_JSON_LIMIT, parseJsonBody, readBodyLimited } from "./body";
import { checkRequestOrigin, isStateChanging, type BodyKind } from "./origin";
import { parseParams } from "./params";
import { branchesTouchedSince, latestActivityId } from "@coldtrail/db";
import { reevaluateAfterWrite } from "../server/continuous-audit";
import { idempotently } from "./idempotency";

export interface RouteContext<Q, B, P> {
  req: NextRequest;
  actor: Actor;
  ability: AppAbility;
  db: ReturnType<typeof db>;
  query: Q;
  body: B;
  params: P;
}

interface RouteSpec<Q extends z.ZodType | undefined, B extends z.ZodType | undefined, PS extends z.ZodType | undefined> {
  /** The permission the route needs on at least some records; record-level checks follow in the handler. */
  can: [Action, SubjectName];
  query?: Q;
  body?: B;
  /** The path params (`idParams("id")`); without it, every `id`/`…Id` segment must still be a record id. */
  params?: PS;
  /** The largest body accepted, in bytes, read as a stream and refused (413) past it. Default 64 KB. */
  maxBody?: number;
  /** What a state-changing request may send: JSON (default), or a multipart form for routes that take files. */
  accepts?: BodyKind;
  /** A creating route: honours `Idempotency-Key` (see ./idempotency.ts). */
  idempotent?: boolean;
}

type Out<S> = S extends z.ZodType ? z.output<S> : undefined;
type ParamsOut<PS, P> = PS extends z.ZodType ? z.output<PS> : P;

/**
 * The checks every request passes before its handler: the request comes from the app's own pages
 * (state-changing methods), and its body is read once, as a stream, up to the route's limit. Returns
 * the request to hand on (rebuilt around the bytes read, so handlers may still call `formData()`).
 */
async function admitRequest(
  req: NextRequest,
  spec: { maxBody?: number; accepts?: BodyKind },
): Promise<{ req: NextRequest; bytes: Uint8Array }> {
  checkRequestOrigin(req, spec.accepts);
  if (!isStateChanging(req.method)) return { req, bytes: new Uint8Array(0) };
  const bytes = await readBodyLimited(req, spec.maxBody ?? DEFAULT_JSON_LIMIT);
  const rebuilt = new ServerRequest(req.url, {
    method: req.method,
    headers: req.headers,
    body: bytes.byteLength ? (bytes as Uint8Array<ArrayBuffer>) : undefined,
  });
  return { req: rebuilt, bytes };
}

/**
 * Every API route goes through here: session (401) → own origin and body type (403) → body read up to
 * the route's limit (413) → ability (403) → path params (404) → zod validation (400 with field errors)
 * → handler → one error mapping (403, 404, 409, 503, 500). A handler returns data
 * (sent as JSON, 200) or its own Response.
 */
export function route<
  Q extends z.ZodType | undefined = undefined,
  B extends z.ZodType | undefined = undefined,
  P extends Record<string, string> = Record<string, string>,
  PS extends z.ZodType | undefined = undefined,
>(spec: RouteSpec<Q, B, PS>, handler: (ctx: RouteContext<Out<Q>, Out<B>, ParamsOut<PS, P>>) => Promise<unknown>) {
  const handle = async (incoming: NextRequest, context: { params: Promise<Record<string, string>> }): Promise<Response> => {
    try {
      const signedIn = await currentActor();
      if (!signedIn) return errorResponse(401, { code: "unauthenticated", message: "Sign in to continue" });
      const { actor, ability } = signedIn;
      const { req, bytes } = await admitRequest(incoming, spec);

      const [action, subject] = spec.can;
      if (ability.cannot(action, subject)) {
        return errorResponse(403, { code: "forbidden", message: "You do not have permission to do that" });
      }

      const params = parseParams((await context?.params) ?? {}, spec.params) as ParamsOut<PS, P>;

      let query: unknown = undefined;
      if (spec.query) {
        const parsed = spec.query.safeParse(Object.fromEntries(req.nextUrl.searchParams));
        if (!parsed.success) {
          return errorResponse(400, {
            code: "invalid",
            message: "The request has invalid parameters",
            fieldErrors: fieldErrorsOf(parsed.error),
          });
        }
        query = parsed.data;
      }

      let body: unknown = undefined;
      if (spec.body) {
        const json = parseJsonBody(bytes);
        const parsed = spec.body.safeParse(json);
        if (!parsed.success) {
          return errorResponse(400, { code: "invalid", message: "Some fields need attention", fieldErrors: fieldErrorsOf(parsed.error) });
        }
        body = parsed.data;
      }

      const writes = req.method !== "GET" && req.method !== "HEAD";
      const before = writes ? await latestActivityId(db()) : 0;
      const call = (database: ReturnType<typeof db>) =>
        handler({ req, actor, ability, db: database, query: query as Out<Q>, body: body as Out<B>, params });
      const result = spec.idempotent
        ? await idempotently({
            req,
            actor,
            body,
            database: db(),
            call,
            toResponse: (r) => (r instanceof Response ? r : NextResponse.json(r ?? null)),
          })
        : await call(db());
      if (writes && (!(result instanceof Response) || result.ok)) {
        // Continuous audit: every write appends to the activity history, so the branches whose records
        // this request changed are known; their rules run again in the background.
        for (const branchId of await branchesTouchedSince(db(), { afterId: before, actorId: actor.userId })) {
          void reevaluateAfterWrite(db(), {
            organisationId: actor.organisationId,
            branchId,
            actorId: actor.userId,
            afterActivityId: before,
          });
        }
      }
      if (result instanceof Response) return result;
      return NextResponse.json(result ?? null);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
  // The spec travels with the handler, so tests can reach every route's schemas (the fuzz suite).
  return Object.assign(handle, { spec });
}
