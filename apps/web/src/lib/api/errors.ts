import { ForbiddenError } from "@casl/ability";
import { NextResponse } from "next/server";
import { z } from "zod";
import { DomainError } from "@coldtrail/db";

export type FieldErrors = Record<string, string[]>;

export interface ApiErrorBody {
  error: {
    code: "unauthenticated" | "forbidden" | "invalid" | "not_found" | "conflict" | "too_large" | "unavailable" | "internal";
    message: string;
    fieldErrors?: FieldErrors;
  };
}

/**
 * A request refused before any handler ran or because a service it needs is down: body too large (413),
 * not from the app's own pages (403), file storage unavailable (503). The message is shown as is.
 */
export class RequestRefused extends Error {
  constructor(
    readonly status: number,
    readonly code: ApiErrorBody["error"]["code"],
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}

export function errorResponse(status: number, body: ApiErrorBody["error"]): NextResponse<ApiErrorBody> {
  return NextResponse.json({ error: body }, { status });
}

/** zod issues → `{ "field.path": ["message"] }`, the shape forms show beside each input. */
export function fieldErrorsOf(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** The one mapping from what went wrong to HTTP. */
export function toErrorResponse(err: unknown): NextResponse<ApiErrorBody> {
  if (err instanceof z.ZodError) {
    return errorResponse(400, { code: "invalid", message: "Some fields need attention", fieldErrors: fieldErrorsOf(err) });
  }
  if (err instanceof RequestRefused) {
    return errorResponse(err.status, {
      code: err.code,
      message: err.message,
      ...(err.field && { fieldErrors: { [err.field]: [err.message] } }),
    });
  }
  if (err instanceof ForbiddenError) {
    return errorResponse(403, { code: "forbidden", message: "You do not have permission to do that" });
  }
  if (err instanceof DomainError) {
    const fieldErrors = err.field ? { [err.field]: [err.message] } : undefined;
    switch (err.code) {
      case "not_found":
        return errorResponse(404, { code: "not_found", message: err.message });
      case "forbidden":
        return errorResponse(403, { code: "forbidden", message: err.message });
      case "conflict":
        return errorResponse(409, { code: "conflict", message: err.message, ...(fieldErrors && { fieldErrors }) });
      case "invalid":
        return errorResponse(400, { code: "invalid", message: err.message, ...(fieldErrors && { fieldErrors }) });
    }
  }
  console.error(err);
  return errorResponse(500, { code: "internal", message: "Something went wrong on our side; nothing was saved" });
}
