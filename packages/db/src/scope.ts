import type { Knex } from "knex";
import { rulesToAST } from "@casl/ability/extra";
import type { Action, AppAbility, SubjectName } from "@coldtrail/core";

/** A restriction a caller applies to a list query (`qb.where(...)` calls). */
export type QueryScope = (qb: Knex.QueryBuilder) => void;

interface AstNode {
  operator: string;
  field?: string;
  value: unknown;
}

const snake = (field: string) => field.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);

function apply(qb: Knex.QueryBuilder, node: AstNode, table: string): void {
  const column = node.field ? `${table}.${snake(node.field)}` : "";
  switch (node.operator) {
    case "and":
      for (const child of node.value as AstNode[]) qb.where((sub) => apply(sub, child, table));
      return;
    case "or":
      qb.where((outer) => {
        for (const child of node.value as AstNode[]) outer.orWhere((sub) => apply(sub, child, table));
      });
      return;
    case "not":
      qb.whereNot((sub) => apply(sub, node.value as AstNode, table));
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
  return (qb) => {
    if (ast === null) {
      qb.whereRaw("1 = 0");
      return;
    }
    qb.where((sub) => apply(sub, ast, table));
  };
}
