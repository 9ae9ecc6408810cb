import type { Knex } from "knex";
import {
  DEFAULT_SETTINGS,
  addDays,
  addYears,
  resolveSettings,
  toLocalDate,
  type AuditSettings,
  type MassDisplayUnit,
} from "@coldtrail/core";
import { appendActivity } from "../activity";
import { RecordConflictError, RecordNotFoundError } from "../errors";
import { storedLike, type ScopeFn } from "../types";

/** One page of a register list. */
export interface RegisterPage<T> {
  rows: T[];
  total: number;
  page: number;
  pageSize: number;
}

/** The branch a register record belongs to, as the screens need it. */
export interface RegisterBranch {
  id: number;
  name: string;
  code: string;
  timeZone: string;
  massUnit: MassDisplayUnit;
}

/** ANDs the caller's permission scope into a query as one parenthesised block. */
export function applyScope(qb: Knex.QueryBuilder, scope: ScopeFn): void {
  qb.where(function scoped(this: Knex.QueryBuilder) {
    scope(this);
  });
}

/** The branch where a new record goes: it must be in the actor's organisation and not archived. */
export async function loadWritableBranch(db: Knex | Knex.Transaction, organisationId: number, branchId: number): Promise<RegisterBranch> {
  const row = await db("branches")
    .where({ id: branchId, organisation_id: organisationId })
    .first("id", "name", "code", "time_zone", "mass_unit", "archived_at");
  if (!row) throw new RecordNotFoundError("That branch does not exist", "branchId");
  if (row.archived_at) throw new RecordConflictError("That branch is archived", "branchId");
  return { id: Number(row.id), name: row.name, code: row.code, timeZone: row.time_zone, massUnit: row.mass_unit };
}

/** The organisation's rule settings (requalification period, strict fill, leak-rate method …); unknown or mistyped keys fall back to the defaults. */
export async function loadOrganisationSettings(db: Knex | Knex.Transaction, organisationId: number): Promise<AuditSettings> {
  const row = await db("organisations").where({ id: organisationId }).first("settings");
  let stored: Record<string, unknown> = {};
  try {
    const parsed: unknown = row?.settings ? JSON.parse(row.settings) : {};
    if (parsed && typeof parsed === "object") stored = parsed as Record<string, unknown>;
  } catch {
    stored = {};
  }
  const chosen: Record<string, unknown> = {};
  for (const [key, fallback] of Object.entries(DEFAULT_SETTINGS)) {
    if (stored[key] !== undefined && typeof stored[key] === typeof fallback) chosen[key] = stored[key];
  }
  return resolveSettings(chosen);
}

/** Today's calendar date in a branch's time zone. */
export function branchToday(timeZone: string, now: Date = new Date()): string {
  return toLocalDate(now, timeZone);
}

/** Product choice: a requalification, repair or test falling due within this many days is "due soon". */
export const DUE_SOON_DAYS = 90;

export type DueState = "overdue" | "due_soon" | "current" | "unknown";

/** Where a due date stands today. Due on the day itself counts as overdue (the record is no longer current). */
export function dueState(dueOn: string | null, today: string, soonDays = DUE_SOON_DAYS): DueState {
  if (!dueOn) return "unknown";
  if (dueOn <= today) return "overdue";
  if (dueOn <= addDays(today, soonDays)) return "due_soon";
  return "current";
}

/**
 * The latest "last done" date whose next due date (`+ years`) has arrived by `today`. Month-end
 * clamping (29 Feb + 5 years = 28 Feb) is honoured, so the SQL filter agrees with `dueState`.
 */
export function lastDoneCutoff(today: string, years: number): string {
  let cutoff = addYears(today, -years);
  while (addYears(addDays(cutoff, 1), years) <= today) cutoff = addDays(cutoff, 1);
  return cutoff;
}

/** Unique-index violations on SQLite and PostgreSQL. */
export function isUniqueViolation(err: unknown): boolean {
  const code = (err as { code?: unknown })?.code;
  return code === "SQLITE_CONSTRAINT_UNIQUE" || code === "23505";
}

function sameValue(before: unknown, after: unknown): boolean {
  if (before === null || before === undefined) return after === null || after === undefined;
  if (after === null || after === undefined) return false;
  // SQLite gives booleans back as 0/1.
  if (typeof after === "boolean") return before === after || before === (after ? 1 : 0);
  if (typeof after === "number") return Number(before) === after;
  return before === after;
}

/** The columns that changed, with their previous and next values. */
export function changedColumns(
  row: Record<string, unknown>,
  next: Record<string, unknown>,
): { previous: Record<string, unknown>; next: Record<string, unknown> } {
  const prev: Record<string, unknown> = {};
  const nxt: Record<string, unknown> = {};
  for (const [column, value] of Object.entries(next)) {
    if (!sameValue(row[column], value)) {
      prev[column] = storedLike(row[column], value) ?? null; // a boolean is kept as a boolean in both dialects
      nxt[column] = value ?? null;
    }
  }
  return { previous: prev, next: nxt };
}

/** Writes plain (non-regulated) changes and says so in the activity history, with the values. */
export async function updateWithActivity(
  trx: Knex.Transaction,
  opts: {
    table: string;
    id: number;
    organisationId: number;
    branchId: number;
    actorId: number;
    subjectType: string;
    action: string;
    previous: Record<string, unknown>;
    next: Record<string, unknown>;
    summary: string;
    at: string;
  },
): Promise<void> {
  await trx(opts.table)
    .where({ id: opts.id, organisation_id: opts.organisationId })
    .update({ ...opts.next, updated_at: opts.at });
  await appendActivity(trx, {
    organisationId: opts.organisationId,
    actorId: opts.actorId,
    branchId: opts.branchId,
    action: opts.action,
    subjectType: opts.subjectType,
    subjectId: opts.id,
    summary: opts.summary,
    data: { previous: opts.previous, next: opts.next },
    at: opts.at,
  });
}

/** Column names in plain words, for activity summaries. */
export function describeColumns(columns: string[], words: Record<string, string>): string {
  return columns.map((c) => words[c] ?? c.replace(/_/g, " ")).join(", ");
}
