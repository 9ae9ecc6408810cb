import type { Knex } from "knex";

/**
 * Writers that wait instead of failing.
 *
 * SQLite allows one writer at a time. A transaction begun with plain `BEGIN` starts as a reader and
 * upgrades to a writer on its first write; when another connection (a second server instance, a
 * maintenance script, the digest) holds the write lock at that moment the upgrade fails at once with
 * SQLITE_BUSY — the busy timeout does not apply to a reader that must upgrade. So every transaction on
 * SQLite begins `BEGIN IMMEDIATE`: it takes the write lock up front, waiting up to the connection's
 * busy timeout, and is retried a few times more on SQLITE_BUSY before anything in it has run. A lock
 * that outlasts all of that becomes a `DatabaseBusyError`, which the app answers with 503 and
 * Retry-After (never a 500).
 *
 * PostgreSQL needs no twin: row locks wait, and its transactions start as they are.
 */

/** The database stayed locked by another writer for longer than the wait allows. Nothing was written. */
export class DatabaseBusyError extends Error {
  /** Seconds after which a retry is likely to succeed. */
  readonly retryAfterSeconds: number;
  constructor(cause?: unknown, retryAfterSeconds = 2) {
    super("The records are busy with another change; nothing was saved. Try again in a moment.");
    this.name = "DatabaseBusyError";
    this.retryAfterSeconds = retryAfterSeconds;
    if (cause !== undefined) (this as { cause?: unknown }).cause = cause;
  }
}

/**
 * True for a lock that did not come free in time: SQLite's SQLITE_BUSY family (and SQLITE_LOCKED), and
 * on PostgreSQL a lock timeout (55P03), a deadlock (40P01) or a serialization failure (40001).
 */
export function isBusyError(err: unknown): boolean {
  if (err instanceof DatabaseBusyError) return true;
  if (!err || typeof err !== "object" || !("code" in err)) return false;
  const code = String((err as { code: unknown }).code);
  return code.startsWith("SQLITE_BUSY") || code.startsWith("SQLITE_LOCKED") || code === "55P03" || code === "40P01" || code === "40001";
}

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

export interface ImmediateOptions {
  /** Further attempts at BEGIN IMMEDIATE after the busy timeout ran out (default 2). */
  retries?: number;
  /** Pause before each further attempt, in ms (default 100, doubled each time, with jitter). */
  retryDelayMs?: number;
}

interface TransactionLike {
  begin: (conn: unknown) => Promise<unknown>;
  trxClient: { query: (conn: unknown, sql: string) => Promise<unknown> };
}

/**
 * Makes every top-level transaction of a SQLite knex handle begin IMMEDIATE (nested transactions
 * stay savepoints). Knex has no option for the BEGIN statement, so the client's `transaction` factory
 * is wrapped and the new transaction's `begin` replaced before it runs (it runs after the connection
 * is acquired, asynchronously).
 */
export function useImmediateTransactions(knex: Knex, opts: ImmediateOptions = {}): Knex {
  const retries = opts.retries ?? 2;
  const delay = opts.retryDelayMs ?? 100;
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  const client = knex.client as any;
  const original = client.transaction as (...args: unknown[]) => TransactionLike;
  client.transaction = function immediateTransaction(this: { transacting?: boolean }, ...args: unknown[]) {
    const trx = original.apply(this, args);
    trx.begin = async (conn: unknown) => {
      for (let attempt = 0; ; attempt += 1) {
        try {
          // The transaction's own `query` swallows errors into a rejection of the whole transaction;
          // its client's `query` throws, so a busy lock can be retried here.
          return await trx.trxClient.query(conn, "BEGIN IMMEDIATE;");
        } catch (err) {
          if (!isBusyError(err)) throw err;
          if (attempt >= retries) throw new DatabaseBusyError(err);
          await sleep(delay * 2 ** attempt * (0.5 + Math.random()));
        }
      }
    };
    return trx;
  };
  return knex;
}

/**
 * A write transaction: IMMEDIATE on SQLite (every transaction of a handle from `createDb` is), a
 * normal one on PostgreSQL. A busy lock surfaces as `DatabaseBusyError`.
 */
export async function writeTransaction<T>(db: Knex, fn: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  try {
    return await db.transaction(fn);
  } catch (err) {
    if (isBusyError(err) && !(err instanceof DatabaseBusyError)) throw new DatabaseBusyError(err);
    throw err;
  }
}
