import type { Knex } from "knex";

/**
 * Restricts a query to the rows the caller may see. It receives a grouped `where` builder, so its
 * conditions are ANDed with the query's own filters as one parenthesised block (an `orWhere` inside
 * cannot widen the result). Qualify columns with the table alias the query documents (e.g. `jobs.branch_id`).
 */
/** A permission scope (see scope.ts); `columns` names columns of condition fields such as `recordedOn`. */
export type ScopeFn = (qb: Knex.QueryBuilder, columns?: Partial<Record<string, string>>) => void;

export interface ActorRef {
  userId: number;
  organisationId: number;
}

/** SQLite returns 0/1 for booleans, PostgreSQL true/false. */
export function toBool(value: unknown): boolean {
  return value === true || value === 1 || value === "1" || value === "t" || value === "true";
}

export function toBoolOrNull(value: unknown): boolean | null {
  return value === null || value === undefined ? null : toBool(value);
}

/**
 * A stored value read back for comparing with (or recording beside) a new `like` value: a boolean
 * column comes back from SQLite as 0/1 and from PostgreSQL as true/false, so when the new value is a
 * boolean a 0/1 read becomes a boolean too. Anything else is returned as read.
 */
export function storedLike(stored: unknown, like: unknown): unknown {
  return typeof like === "boolean" && (stored === 0 || stored === 1) ? stored === 1 : stored;
}

export function toNumOrNull(value: unknown): number | null {
  return value === null || value === undefined ? null : Number(value);
}

/** Escapes LIKE wildcards so user text matches literally (used with `escape '\'`). */
export function likePattern(text: string): string {
  return `%${text.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/**
 * Orders by a column that may hold NULL with SQLite's placing of NULL in both dialects: NULL sorts
 * before every value (first ascending, last descending). PostgreSQL puts NULL after every value
 * unless told otherwise, so it gets NULLS FIRST / NULLS LAST; SQLite's ORDER BY stays as it was
 * (knex's own `nulls` option would order SQLite by the NULL test alone). Use it only for nullable
 * columns: on PostgreSQL a non-default NULLS order cannot walk a plain index.
 */
export function orderByNullable(qb: Knex.QueryBuilder, column: string, dir: "asc" | "desc"): Knex.QueryBuilder {
  const client = (qb as unknown as { client?: { config?: { client?: unknown } } }).client?.config?.client;
  if (client === "pg" || client === "postgres" || client === "postgresql") return qb.orderBy(column, dir, dir === "asc" ? "first" : "last");
  return qb.orderBy(column, dir);
}
