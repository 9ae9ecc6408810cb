import type { Knex } from "knex";

/**
 * Restricts a query to the rows the caller may see. It receives a grouped `where` builder, so its
 * conditions are ANDed with the query's own filters as one parenthesised block (an `orWhere` inside
 * cannot widen the result). Qualify columns with the table alias the query documents (e.g. `jobs.branch_id`).
 */
export type ScopeFn = (qb: Knex.QueryBuilder) => void;

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

export function toNumOrNull(value: unknown): number | null {
  return value === null || value === undefined ? null : Number(value);
}

/** Escapes LIKE wildcards so user text matches literally (used with `escape '\'`). */
export function likePattern(text: string): string {
  return `%${text.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}
