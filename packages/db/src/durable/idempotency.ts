import type { Knex } from "knex";
import { isPostgres } from "../connection";

/**
 * Idempotency keys of creating requests. A client sends `Idempotency-Key` with a create (a form makes
 * one when it opens and sends it with every submit and retry); the first answer is stored with the key
 * in the SAME transaction as the record, so a crash cannot commit the record without the key. A repeat
 * with the key gets the stored answer and writes nothing. Keys belong to one person; they expire after
 * a week (housekeeping).
 */

export interface StoredAnswer {
  method: string;
  path: string;
  requestHash: string;
  status: number;
  body: string;
  contentType: string;
}

/** How long a key is remembered. */
export const IDEMPOTENCY_KEY_DAYS = 7;

/** The stored answer for this person's key, if the key was used before. */
export async function findIdempotentAnswer(
  db: Knex | Knex.Transaction,
  opts: { userId: number; key: string },
): Promise<StoredAnswer | undefined> {
  const r = await db("idempotency_keys").where({ user_id: opts.userId, key: opts.key }).first();
  if (!r) return undefined;
  return {
    method: r.method,
    path: r.path,
    requestHash: r.request_hash,
    status: Number(r.status),
    body: r.response_body,
    contentType: r.content_type,
  };
}

/**
 * Makes concurrent requests with the same key wait for each other inside their write transactions,
 * so the second finds the first's answer instead of racing it. SQLite needs nothing: its write
 * transactions begin IMMEDIATE and run one at a time. PostgreSQL: a transaction-scoped advisory lock
 * on (person, hash of the key), released at commit or rollback.
 */
export async function lockIdempotencyKey(trx: Knex | Knex.Transaction, opts: { userId: number; key: string }): Promise<void> {
  if (isPostgres(trx)) await trx.raw("SELECT pg_advisory_xact_lock(?::int, hashtext(?))", [opts.userId, opts.key]);
}

/** Stores the first answer to a key; call it inside the transaction that wrote the record. */
export async function saveIdempotentAnswer(
  trx: Knex | Knex.Transaction,
  opts: { userId: number; organisationId: number; key: string; answer: StoredAnswer; now?: Date },
): Promise<void> {
  await trx("idempotency_keys").insert({
    user_id: opts.userId,
    organisation_id: opts.organisationId,
    key: opts.key,
    method: opts.answer.method,
    path: opts.answer.path.slice(0, 500),
    request_hash: opts.answer.requestHash,
    status: opts.answer.status,
    response_body: opts.answer.body,
    content_type: opts.answer.contentType.slice(0, 100),
    created_at: (opts.now ?? new Date()).toISOString(),
  });
}

/** True for a unique-constraint violation (SQLite or PostgreSQL): the same key committed meanwhile. */
export function isUniqueViolation(err: unknown): boolean {
  if (!err || typeof err !== "object" || !("code" in err)) return false;
  const code = String((err as { code: unknown }).code);
  return code === "SQLITE_CONSTRAINT_UNIQUE" || code === "SQLITE_CONSTRAINT_PRIMARYKEY" || code === "23505";
}

/** Forgets keys older than `IDEMPOTENCY_KEY_DAYS` (housekeeping). Returns how many went. */
export async function expireIdempotencyKeys(db: Knex, opts: { now?: Date; days?: number } = {}): Promise<number> {
  const now = opts.now ?? new Date();
  const before = new Date(now.getTime() - (opts.days ?? IDEMPOTENCY_KEY_DAYS) * 86_400_000).toISOString();
  return db("idempotency_keys").where("created_at", "<", before).delete();
}
