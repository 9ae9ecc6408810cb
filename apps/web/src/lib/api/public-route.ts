import "server-only";
import type { NextRequest } from "next/server";
import { NextResponse } from "next/server";
import type { z } from "zod";
import { db } from "../db";
import { errorResponse, fieldErrorsOf, toErrorResponse } from "./errors";
import { DEFAULT_JSON_LIMIT, parseJsonBody, readBodyLimited } from "./body";
import { checkRequestOrigin } from "./origin";
import type { PublicRouteName } from "@coldtrail/db";
import { throttlePublic } from "../server/throttle";

/**
 * The few routes a person uses before they can sign in (accepting an invitation, asking for and using
 * a password-reset link). No session and no ability: what they may do is decided by the single-use
 * token in the body. The same request checks as `route()` (own origin, JSON, body read as a stream up to
 * `maxBody`, default 64 KB, 413 past it), zod validation (400 with field errors) and error mapping.
 * Every request is counted per client address first (`throttle`: the limit's name and what is being
 * asked, for the 429 message; limits in @coldtrail/db throttle.ts).
 */
export function publicRoute<B extends z.ZodType>(
  spec: { body: B; maxBody?: number; throttle: { route: PublicRouteName; what: string } },
  handler: (ctx: { req: NextRequest; db: ReturnType<typeof db>; body: z.output<B> }) => Promise<unknown>,
) {
  const handle = async (req: NextRequest): Promise<Response> => {
    try {
      const throttled = await throttlePublic(req, spec.throttle.route, spec.throttle.what);
      if (throttled) return throttled;
      checkRequestOrigin(req, "json");
      const json = parseJsonBody(await readBodyLimited(req, spec.maxBody ?? DEFAULT_JSON_LIMIT));
      const parsed = spec.body.safeParse(json);
      if (!parsed.success) {
        return errorResponse(400, { code: "invalid", message: "Some fields need attention", fieldErrors: fieldErrorsOf(parsed.error) });
      }
      const result = await handler({ req, db: db(), body: parsed.data });
      if (result instanceof Response) return result;
      return NextResponse.json(result ?? null);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
  return Object.assign(handle, { spec });
}
