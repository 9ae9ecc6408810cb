import type { Knex } from "knex";
import { appendActivity, rowId } from "./activity";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "./errors";
import { storedLike } from "./types";

/**
 * Regulated records (jobs, disposals, certifications, cylinder weighings …) are never silently
 * overwritten or deleted. A correction is an amendment: who, when, why, and the previous and next
 * values of the fields that changed, kept in the append-only `amendments` table. A record entered in
 * error is voided with a reason (its row stays; lists leave it out).
 */

export interface AmendOptions {
  /** Table of the regulated record, e.g. "jobs". */
  table: string;
  /** Subject name kept in the history, e.g. "Job". */
  subjectType: string;
  id: number;
  organisationId: number;
  actorId: number;
  reason: string;
  /** Column → new value (snake_case column names). Unchanged columns are ignored. */
  changes: Record<string, unknown>;
  /** Plain words for the activity history, e.g. "Corrected the amount recovered on COL-RTU-07". */
  summary: string;
  at?: string;
}

export interface AmendmentRecord {
  id: number;
  actorId: number;
  actorName: string;
  at: string;
  reason: string;
  previous: Record<string, unknown>;
  next: Record<string, unknown>;
}

const same = (a: unknown, b: unknown) => (a ?? null) === (b ?? null) || JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

/**
 * Applies a correction inside `trx` and records it. Refuses an empty reason, a voided record, and a
 * change that changes nothing. Returns the amendment id. Call it inside the caller's transaction so
 * dependent updates (cylinder contents …) commit together.
 */
export async function amendRecord(trx: Knex.Transaction, opts: AmendOptions): Promise<number> {
  const reason = opts.reason.trim();
  if (reason.length < 3) throw new InvalidInputError("Say why the record is being corrected", "reason");
  const row = await trx(opts.table).where({ id: opts.id, organisation_id: opts.organisationId }).first();
  if (!row) throw new RecordNotFoundError(`No such ${opts.subjectType.toLowerCase()}`);
  if ("voided_at" in row && row.voided_at) throw new RecordConflictError("A voided record cannot be corrected", "reason");

  const previous: Record<string, unknown> = {};
  const next: Record<string, unknown> = {};
  for (const [column, value] of Object.entries(opts.changes)) {
    if (!(column in row)) throw new InvalidInputError(`Unknown field ${column}`, column);
    // Booleans read back as 0/1 on SQLite and true/false on PostgreSQL: compare and keep them as booleans.
    const stored = storedLike(row[column], value);
    if (!same(stored, value)) {
      previous[column] = stored ?? null;
      next[column] = value ?? null;
    }
  }
  if (Object.keys(next).length === 0) throw new InvalidInputError("Nothing was changed", "reason");

  const at = opts.at ?? new Date().toISOString();
  const update: Record<string, unknown> = { ...next };
  if ("updated_at" in row) update.updated_at = at;
  await trx(opts.table).where({ id: opts.id }).update(update);

  const [inserted] = await trx("amendments")
    .insert({
      organisation_id: opts.organisationId,
      branch_id: row.branch_id ?? null,
      subject_type: opts.subjectType,
      subject_id: opts.id,
      actor_id: opts.actorId,
      at,
      reason,
      previous: JSON.stringify(previous),
      next: JSON.stringify(next),
    })
    .returning("id");
  const amendmentId = rowId(inserted);
  await appendActivity(trx, {
    organisationId: opts.organisationId,
    actorId: opts.actorId,
    branchId: row.branch_id ?? null,
    action: `${opts.subjectType.toLowerCase()}.amended`,
    subjectType: opts.subjectType,
    subjectId: opts.id,
    summary: opts.summary,
    data: { amendmentId, fields: Object.keys(next), reason },
    at,
  });
  return amendmentId;
}

/** Marks a regulated record as entered in error. The row and its history stay. */
export async function voidRecord(
  trx: Knex.Transaction,
  opts: {
    table: string;
    subjectType: string;
    id: number;
    organisationId: number;
    actorId: number;
    reason: string;
    summary: string;
    at?: string;
  },
): Promise<void> {
  const reason = opts.reason.trim();
  if (reason.length < 3) throw new InvalidInputError("Say why the record is being voided", "reason");
  const row = await trx(opts.table).where({ id: opts.id, organisation_id: opts.organisationId }).first();
  if (!row) throw new RecordNotFoundError(`No such ${opts.subjectType.toLowerCase()}`);
  if (!("voided_at" in row)) throw new RecordConflictError(`${opts.subjectType} records cannot be voided`);
  if (row.voided_at) throw new RecordConflictError("This record is already voided");
  const at = opts.at ?? new Date().toISOString();
  const update: Record<string, unknown> = { voided_at: at, void_reason: reason };
  if ("voided_by" in row) update.voided_by = opts.actorId;
  if ("updated_at" in row) update.updated_at = at;
  await trx(opts.table).where({ id: opts.id }).update(update);
  await appendActivity(trx, {
    organisationId: opts.organisationId,
    actorId: opts.actorId,
    branchId: row.branch_id ?? null,
    action: `${opts.subjectType.toLowerCase()}.voided`,
    subjectType: opts.subjectType,
    subjectId: opts.id,
    summary: opts.summary,
    data: { reason },
    at,
  });
}

/** A record's corrections, oldest first, for its history panel. */
export async function listAmendments(
  db: Knex,
  opts: { organisationId: number; subjectType: string; subjectId: number },
): Promise<AmendmentRecord[]> {
  const rows = await db("amendments as a")
    .join("users as u", "u.id", "a.actor_id")
    .where({ "a.organisation_id": opts.organisationId, "a.subject_type": opts.subjectType, "a.subject_id": opts.subjectId })
    .orderBy([{ column: "a.at" }, { column: "a.id" }])
    .select("a.id", "a.actor_id", "u.name as actor_name", "a.at", "a.reason", "a.previous", "a.next");
  return rows.map((r) => ({
    id: Number(r.id),
    actorId: Number(r.actor_id),
    actorName: r.actor_name,
    at: r.at,
    reason: r.reason,
    previous: JSON.parse(r.previous),
    next: JSON.parse(r.next),
  }));
}
