import "server-only";
import type { NextRequest } from "next/server";
import { NextResponse } from "next/server";
import type { z } from "zod";
import type { Action, Actor, AppAbility, SubjectName } from "@coldtrail/core";
import { currentActor } from "../auth/current-actor";
import { db } from "../db";
import { errorResponse, fieldErrorsOf, toErrorResponse } from "./errors";
import { branchesTouchedSince, latestActivityId } from "@coldtrail/db";
import { reevaluateAfterWrite } from "../server/continuous-audit";

export interface RouteContext<Q, B, P> {
  req: NextRequest;
  actor: Actor;
  ability: AppAbility;
  db: ReturnType<typeof db>;
  query: Q;
  body: B;
  params: P;
}

interface RouteSpec<Q extends z.ZodType | undefined, B extends z.ZodType | undefined> {
  /** The permission the route needs on at least some records; record-level checks follow in the handler. */
  can: [Action, SubjectName];
  query?: Q;
  body?: B;
}

type Out<S> = S extends z.ZodType ? z.output<S> : undefined;

/**
 * Every API route goes through here: session (401) → ability (403) → zod validation (400 with
 * field errors) → handler → one error mapping (403, 404, 409, 500). A handler returns data
 * (sent as JSON, 200) or its own Response.
 */
export function route<
  Q extends z.ZodType | undefined = undefined,
  B extends z.ZodType | undefined = undefined,
  P extends Record<string, string> = Record<string, string>,
>(spec: RouteSpec<Q, B>, handler: (ctx: RouteContext<Out<Q>, Out<B>, P>) => Promise<unknown>) {
  return async (req: NextRequest, context: { params: Promise<P> }): Promise<Response> => {
    try {
      const signedIn = await currentActor();
      if (!signedIn) return errorResponse(401, { code: "unauthenticated", message: "Sign in to continue" });
      const { actor, ability } = signedIn;

      const [action, subject] = spec.can;
      if (ability.cannot(action, subject)) {
        return errorResponse(403, { code: "forbidden", message: "You do not have permission to do that" });
      }

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
        let json: unknown;
        try {
          json = await req.json();
        } catch {
          return errorResponse(400, { code: "invalid", message: "The request body must be JSON" });
        }
        const parsed = spec.body.safeParse(json);
        if (!parsed.success) {
          return errorResponse(400, { code: "invalid", message: "Some fields need attention", fieldErrors: fieldErrorsOf(parsed.error) });
        }
        body = parsed.data;
      }

      const params = (await context?.params) ?? ({} as P);
      const writes = req.method !== "GET" && req.method !== "HEAD";
      const before = writes ? await latestActivityId(db()) : 0;
      const result = await handler({ req, actor, ability, db: db(), query: query as Out<Q>, body: body as Out<B>, params });
      if (writes && (!(result instanceof Response) || result.ok)) {
        // Continuous audit: every write appends to the activity history, so the branches whose records
        // this request changed are known; their rules run again in the background.
        for (const branchId of await branchesTouchedSince(db(), { afterId: before, actorId: actor.userId })) {
          void reevaluateAfterWrite(db(), { organisationId: actor.organisationId, branchId, actorId: actor.userId });
        }
      }
      if (result instanceof Response) return result;
      return NextResponse.json(result ?? null);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
}
