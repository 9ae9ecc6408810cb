import type { Knex } from "knex";
import { likePattern, orderByNullable } from "./types";

/**
 * Keeps the rows where any of `expressions` contains `text`, ignoring case, with LIKE wildcards in the
 * text matched literally. The expressions are SQL written in the code (columns, `coalesce(…)`), never
 * user input; the text is bound. Portable: `lower()` and `LIKE … ESCAPE` behave alike in SQLite and
 * PostgreSQL.
 */
export function whereContains(qb: Knex.QueryBuilder, text: string, expressions: readonly string[]): Knex.QueryBuilder {
  const pattern = likePattern(text);
  return qb.where((w) => {
    expressions.forEach((expression, i) => {
      if (i === 0) w.whereRaw(`lower(${expression}) like ? escape ?`, [pattern, "\\"]);
      else w.orWhereRaw(`lower(${expression}) like ? escape ?`, [pattern, "\\"]);
    });
  });
}

/** How many rows a (filtered, unordered) query matches. */
export async function countRows(qb: Knex.QueryBuilder): Promise<number> {
  const row = await qb.count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

/**
 * Orders a list by its sort column, then by `id` in the same direction (so pages never overlap), and
 * keeps one page (`page` counts from 1). A column listed in `nullable` may hold NULL and is ordered as
 * SQLite orders it, in both dialects (`orderByNullable`).
 */
export function sortedPage(
  qb: Knex.QueryBuilder,
  opts: { column: string; dir: "asc" | "desc"; nullable?: ReadonlySet<string>; id: string; page: number; pageSize: number },
): Knex.QueryBuilder {
  if (opts.nullable?.has(opts.column)) orderByNullable(qb, opts.column, opts.dir);
  else qb.orderBy(opts.column, opts.dir);
  return qb
    .orderBy(opts.id, opts.dir)
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize);
}
