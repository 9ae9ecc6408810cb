import type { Knex } from "knex";
import { rulesToAST } from "@casl/ability/extra";
import type { Action, AppAbility, SubjectName } from "@coldtrail/core";
import { whereFindingShowsIn } from "./audits/finding-branches";

/**
 * A restriction a caller applies to a list query (`qb.where(...)` calls). `columns` names the column of a
 * condition field the table does not spell the usual way (`recordedOn`: the record's own date column).
 */
export type QueryScope = (qb: Knex.QueryBuilder, columns?: ScopeColumns) => void;
export type ScopeColumns = Partial<Record<string, string>>;

interface AstNode {
  operator: string;
  field?: string;
  value: unknown;
}

const snake = (field: string) => field.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);

/** Condition fields that are no column of their own: the query must say which column they are. */
const VIRTUAL_FIELDS = new Set(["recordedOn"]);

function columnOf(field: string, table: string, columns: ScopeColumns): string {
  const named = columns[field];
  if (named) return named;
  // A virtual field the query did not name must never widen (or silently drop) a condition.
  if (VIRTUAL_FIELDS.has(field)) throw new Error(`Permission condition on "${field}" needs the query to name its column`);
  return `${table}.${snake(field)}`;
}

/**
 * Conditions that do not map to one column. A finding's `branchId` means "shows in that branch":
 * a person-level finding (a technician's card) is one finding shown in every branch whose audit
 * finds it (packages/db audits/finding-branches.ts).
 */
function special(qb: Knex.QueryBuilder, node: AstNode, table: string, subject: SubjectName): boolean {
  if (subject !== "Finding" || node.field !== "branchId") return false;
  if (node.operator === "in") whereFindingShowsIn(qb, node.value as number[], table);
  else if (node.operator === "eq") whereFindingShowsIn(qb, [node.value as number], table);
  else return false;
  return true;
}

function apply(qb: Knex.QueryBuilder, node: AstNode, table: string, subject: SubjectName, columns: ScopeColumns = {}): void {
  if (special(qb, node, table, subject)) return;
  const column = node.field ? columnOf(node.field, table, columns) : "";
  switch (node.operator) {
    case "and":
      for (const child of node.value as AstNode[]) qb.where((sub) => apply(sub, child, table, subject, columns));
      return;
    case "or":
      qb.where((outer) => {
        for (const child of node.value as AstNode[]) outer.orWhere((sub) => apply(sub, child, table, subject, columns));
      });
      return;
    case "not":
      qb.whereNot((sub) => apply(sub, node.value as AstNode, table, subject, columns));
      return;
    case "eq":
      if (node.value === null) qb.whereNull(column);
      else qb.where(column, node.value as Knex.Value);
      return;
    case "ne":
      if (node.value === null) qb.whereNotNull(column);
      else qb.whereNot(column, node.value as Knex.Value);
      return;
    case "in":
      qb.whereIn(column, node.value as Knex.Value[]);
      return;
    case "nin":
      qb.whereNotIn(column, node.value as Knex.Value[]);
      return;
    case "gt":
    case "gte":
    case "lt":
    case "lte": {
      const op = { gt: ">", gte: ">=", lt: "<", lte: "<=" }[node.operator];
      qb.where(column, op, node.value as Knex.Value);
      return;
    }
    default:
      // An operator we do not translate must never widen a query: refuse the whole list.
      throw new Error(`Permission condition "${node.operator}" cannot be turned into a query`);
  }
}

/**
 * Turns what `ability` allows for `action` on `subject` into knex where-clauses on `table`, so lists
 * are filtered by the same rules that guard single records. No rule → a clause that matches nothing.
 */
export function scopeByAbility(ability: AppAbility, action: Action, subject: SubjectName, table: string): QueryScope {
  const ast = rulesToAST(ability, action, subject) as AstNode | null;
  return (qb, columns) => {
    if (ast === null) {
      qb.whereRaw("1 = 0");
      return;
    }
    qb.where((sub) => apply(sub, ast, table, subject, columns));
  };
}
