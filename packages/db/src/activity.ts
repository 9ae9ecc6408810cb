import type { Knex } from "knex";

export interface ActivityEntry {
  organisationId: number;
  /** null when the system acted (an audit run, a scheduled digest). */
  actorId: number | null;
  branchId?: number | null;
  /** Dotted verb, e.g. "job.recovery.created". */
  action: string;
  subjectType: string;
  subjectId?: number | null;
  /** Plain words, shown as is in the history. */
  summary: string;
  data?: unknown;
  /** ISO UTC timestamp; defaults to now. */
  at?: string;
}

/** Appends one row to the activity history. Call it inside the transaction of every write. */
export async function appendActivity(trx: Knex | Knex.Transaction, entry: ActivityEntry): Promise<number> {
  const [row] = await trx("activity")
    .insert({
      organisation_id: entry.organisationId,
      actor_id: entry.actorId,
      branch_id: entry.branchId ?? null,
      action: entry.action,
      subject_type: entry.subjectType,
      subject_id: entry.subjectId ?? null,
      at: entry.at ?? new Date().toISOString(),
      summary: entry.summary,
      data: entry.data === undefined ? null : JSON.stringify(entry.data),
    })
    .returning("id");
  return rowId(row);
}

/** Normalises what `insert … returning('id')` yields across drivers. */
export function rowId(row: unknown): number {
  if (typeof row === "number") return row;
  if (row && typeof row === "object" && "id" in row) return Number((row as { id: unknown }).id);
  throw new Error("Insert returned no id");
}
