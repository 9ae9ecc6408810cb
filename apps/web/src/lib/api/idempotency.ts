import "server-only";
import { createHash } from "node:crypto";
import type { NextRequest } from "next/server";
import { NextResponse } from "next/server";
import type { Actor } from "@coldtrail/core";
import {
  findIdempotentAnswer,
  isUniqueViolation,
  lockIdempotencyKey,
  saveIdempotentAnswer,
  writeTransaction,
  type Knex,
  type StoredAnswer,
} from "@coldtrail/db";
import { errorResponse } from "./errors";

/**
 * `Idempotency-Key` for creating routes (`route({ idempotent: true, … })`). Without the header the
 * route runs as usual. With it:
 * - the handler runs inside one write transaction, and its answer (status + body) is stored with the
 *   key in that same transaction — a crash cannot commit the record without the key;
 * - a repeat with the same key from the same person gets the stored answer (header
 *   `Idempotency-Replayed: true`) and writes nothing;
 * - the same key with another request (other body, other route) is refused with 422;
 * - an answer that is not a success is not stored (its transaction rolls back, so nothing was
 *   written) and the request may be sent again with the same key.
 * The handler must use the database it is given (never the process-wide handle, which the
 * transaction holds on SQLite) and start background work by queuing a task in that transaction.
 */

export const IDEMPOTENCY_HEADER = "idempotency-key";
const KEY_PATTERN = /^[A-Za-z0-9._:-]{8,200}$/;

/** Deterministic JSON (object keys sorted), so equal bodies hash equal. */
function stableJson(value: unknown): string {
  if (value === undefined) return "null";
  if (value === null || typeof value !== "object") return JSON.stringify(value);
  if (value instanceof Date) return JSON.stringify(value.toISOString());
  if (Array.isArray(value)) return `[${value.map(stableJson).join(",")}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${stableJson(v)}`).join(",")}}`;
}

/** A multipart body by its fields and files' contents (the boundary differs on every send). */
async function formDigest(req: NextRequest): Promise<string> {
  const type = req.headers.get("content-type") ?? "";
  if (!req.body || req.bodyUsed) return "";
  if (!type.includes("multipart/form-data") && !type.includes("application/x-www-form-urlencoded")) {
    return createHash("sha256")
      .update(Buffer.from(await req.clone().arrayBuffer()))
      .digest("hex");
  }
  const form = await req.clone().formData();
  const parts: string[] = [];
  for (const [name, value] of form.entries()) {
    if (typeof value === "string") parts.push(`${name}=${value}`);
    else
      parts.push(
        `${name}=file:${value.name}:${value.size}:${createHash("sha256")
          .update(Buffer.from(await value.arrayBuffer()))
          .digest("hex")}`,
      );
  }
  return parts.join("\n");
}

function replay(answer: StoredAnswer): Response {
  return new NextResponse(answer.body, {
    status: answer.status,
    headers: { "content-type": answer.contentType, "idempotency-replayed": "true" },
  });
}

function differentRequest(): Response {
  return errorResponse(422, {
    code: "invalid",
    message: "This Idempotency-Key was already used for a different request. Open the form again to send a new one.",
  });
}

/** Thrown to roll the write transaction back while still answering with `response`. */
class NotStored extends Error {
  constructor(readonly response: Response) {
    super("The answer was not stored with its key");
  }
}

/**
 * Runs `call` once per key. `body` is the route's parsed JSON body (undefined for multipart routes,
 * whose form is read from a copy of the request). `toResponse` turns the handler's result into the
 * answer the route sends.
 */
export async function idempotently(opts: {
  req: NextRequest;
  actor: Actor;
  body: unknown;
  database: Knex;
  call: (database: Knex) => Promise<unknown>;
  toResponse: (result: unknown) => Response;
}): Promise<unknown> {
  const { req, actor, database } = opts;
  const key = req.headers.get(IDEMPOTENCY_HEADER);
  if (key === null) return opts.call(database);
  if (!KEY_PATTERN.test(key)) {
    return errorResponse(400, {
      code: "invalid",
      message: "Idempotency-Key must be 8 to 200 letters, digits, dots, dashes, colons or underscores (a UUID fits)",
    });
  }
  const method = req.method.toUpperCase();
  const path = req.nextUrl.pathname;
  const payload = opts.body !== undefined ? stableJson(opts.body) : await formDigest(req);
  const requestHash = createHash("sha256").update(`${method} ${path}\n${payload}`).digest("hex");
  const matches = (a: StoredAnswer) => a.requestHash === requestHash && a.method === method && a.path === path;

  const earlier = await findIdempotentAnswer(database, { userId: actor.userId, key });
  if (earlier) return matches(earlier) ? replay(earlier) : differentRequest();

  try {
    return await writeTransaction(database, async (trx) => {
      // Looked up again inside the write transaction, after taking the key's lock (SQLite: the write
      // lock itself; PostgreSQL: an advisory lock), so a concurrent repeat waits and finds the first answer.
      await lockIdempotencyKey(trx, { userId: actor.userId, key });
      const meanwhile = await findIdempotentAnswer(trx, { userId: actor.userId, key });
      if (meanwhile) throw new NotStored(matches(meanwhile) ? replay(meanwhile) : differentRequest());
      const res = opts.toResponse(await opts.call(trx));
      if (!res.ok) throw new NotStored(res);
      const answer: StoredAnswer = {
        method,
        path,
        requestHash,
        status: res.status,
        body: await res.text(),
        contentType: res.headers.get("content-type") ?? "application/json",
      };
      await saveIdempotentAnswer(trx, { userId: actor.userId, organisationId: actor.organisationId, key, answer });
      return new NextResponse(answer.body, { status: answer.status, headers: res.headers });
    });
  } catch (err) {
    if (err instanceof NotStored) return err.response;
    if (isUniqueViolation(err)) {
      // PostgreSQL: a concurrent repeat committed the key first; this attempt rolled back.
      const first = await findIdempotentAnswer(database, { userId: actor.userId, key });
      if (first) return matches(first) ? replay(first) : differentRequest();
    }
    throw err;
  }
}
