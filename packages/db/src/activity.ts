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
  if (row && typeof row === "object" && "id" in row) return Number(row.id);
  throw new Error("Insert returned no id");
}

/** Record kinds whose changes can open or close audit findings. */
const AUDITED_SUBJECTS = [
  "Appliance",
  "Cylinder",
  "CylinderWeighing",
  "DisposalRecord",
  "DisposalStatement",
  "Import",
  "Job",
  "Purchase",
  "ReclaimShipment",
  "RecoveryEquipment",
  "Certification",
  "appliance",
  "job",
  "purchase",
];

/** The newest activity id (0 when empty); taken before a write to find what the write touched. */
export async function latestActivityId(db: Knex): Promise<number> {
  const row = await db("activity").max({ id: "id" }).first();
  return Number(row?.id ?? 0);
}

/** Branches whose audited records an actor changed after the activity row `afterId`. */
export async function branchesTouchedSince(db: Knex, opts: { afterId: number; actorId: number }): Promise<number[]> {
  const rows = await db("activity")
    .where("id", ">", opts.afterId)
    .andWhere("actor_id", opts.actorId)
    .whereIn("subject_type", AUDITED_SUBJECTS)
    .whereNotNull("branch_id")
    .distinct("branch_id");
  return rows.map((r) => Number(r.branch_id));
}
