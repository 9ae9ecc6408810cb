import type { Knex } from "knex";
import {
  checkCylinderFill,
  defaultRecordsBeginOn,
  recordDateProblem,
  resolveSettings,
  type AuditSettings,
  type IsoDate,
  type MassDisplayUnit,
  type VoidedFilter,
} from "@coldtrail/core";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import type { ScopeFn } from "../types";

/** One page of a record list. */
export interface RecordPage<T> {
  rows: T[];
  total: number;
  page: number;
  pageSize: number;
}

export type Db = Knex | Knex.Transaction;

/** ANDs the caller's permission scope into a query as one parenthesised block; `columns` as in ScopeFn. */
export function scoped(qb: Knex.QueryBuilder, scope: ScopeFn, columns?: Partial<Record<string, string>>): Knex.QueryBuilder {
  return qb.where(function inScope(this: Knex.QueryBuilder) {
    scope(this, columns);
  });
}

/** Leaves voided rows out (default), keeps them, or keeps only them. */
export function applyVoided(qb: Knex.QueryBuilder, column: string, voided: VoidedFilter | undefined): void {
  if (voided === "include") return;
  if (voided === "only") qb.whereNotNull(column);
  else qb.whereNull(column);
}

export interface WritableBranch {
  id: number;
  name: string;
  code: string;
  address: string | null;
  timeZone: string;
  massUnit: MassDisplayUnit;
}

/** The branch a record goes into: in the actor's organisation and not archived. */
export async function writableBranch(db: Db, organisationId: number, branchId: number): Promise<WritableBranch> {
  const row = await db("branches")
    .where({ id: branchId, organisation_id: organisationId })
    .first("id", "name", "code", "address", "time_zone", "mass_unit", "archived_at");
  if (!row) throw new RecordNotFoundError("That branch does not exist", "branchId");
  if (row.archived_at) throw new RecordConflictError("That branch is archived", "branchId");
  return {
    id: Number(row.id),
    name: row.name,
    code: row.code,
    address: row.address ?? null,
    timeZone: row.time_zone,
    massUnit: row.mass_unit,
  };
}

/** The organisation's rule settings (leak-rate method, strict fill, requalification years …). */
export async function organisationSettings(db: Db, organisationId: number): Promise<AuditSettings> {
  const row = await db("organisations").where({ id: organisationId }).first("settings");
  let stored: Partial<AuditSettings>;
  try {
    stored = row?.settings ? (JSON.parse(row.settings) as Partial<AuditSettings>) : {};
  } catch {
    stored = {};
  }
  return resolveSettings(stored);
}

/** The first date a dated record may carry: the organisation's setting, or 1 January three years before it joined. */
export async function recordsBeginOn(db: Db, organisationId: number): Promise<IsoDate> {
  const row = await db("organisations").where({ id: organisationId }).first("records_begin_on", "created_at");
  if (!row) throw new RecordNotFoundError("That organisation does not exist");
  return (row.records_begin_on as string | null) ?? defaultRecordsBeginOn(String(row.created_at));
}

/**
 * Refuses the date of an event (job, purchase, shipment, weighing, disposal) that is before the
 * company's records begin or after today in the branch's time zone, naming the field.
 */
export async function assertRecordDate(
  db: Db,
  opts: { organisationId: number; timeZone: string; date: string; field: string; what?: string; now?: Date },
): Promise<void> {
  const problem = recordDateProblem(opts.date, {
    recordsBeginOn: await recordsBeginOn(db, opts.organisationId),
    timeZone: opts.timeZone,
    now: opts.now,
    what: opts.what,
  });
  if (problem) throw new InvalidInputError(problem, opts.field);
}

/** The field a person ticks to save a cylinder above its safe fill; the forms show it when the server asks for it. */
export const CONFIRM_OVER_FILL_FIELD = "confirmOverFill";

/** Empty text becomes null; text is kept trimmed. */
export function textOrNull(value: string | null | undefined): string | null {
  if (value === undefined || value === null) return null;
  const t = value.trim();
  return t.length ? t : null;
}

/**
 * Applies a change to a cylinder's recorded contents (+ fills, − draws) inside the caller's
 * transaction. Refuses to go below zero (that would mean refrigerant drawn that the records never
 * put in). An emptied cylinder holds no refrigerant; an empty one takes the incoming refrigerant.
 * A fill that would hold more than the cylinder can (liquid-full) is refused; one above the safe
 * fill needs `confirmedOverFill` (the person ticked that they know, e.g. to record what happened).
 */
export async function moveCylinderContents(
  trx: Knex.Transaction,
  opts: {
    cylinderId: number;
    deltaG: number;
    refrigerant: string;
    at: string;
    field: string;
    describe: (g: number) => string;
    confirmedOverFill?: boolean;
  },
): Promise<void> {
  // FOR UPDATE: PostgreSQL runs writers side by side, so two jobs on one cylinder could both read the
  // old contents and the later write would lose the earlier one; the row lock makes the second wait
  // and read the first one's result. SQLite serialises writers; knex leaves the clause out there.
  const c = await trx("cylinders")
    .where({ id: opts.cylinderId })
    .forUpdate()
    .first("id", "organisation_id", "serial", "contents_g", "refrigerant", "water_capacity_g", "tare_g");
  if (!c) throw new RecordNotFoundError("That cylinder does not exist", opts.field);
  const before = Number(c.contents_g);
  const after = before + opts.deltaG;
  if (after < 0) {
    throw new RecordConflictError(
      `Cylinder ${c.serial} holds ${opts.describe(before)} on record, so ${opts.describe(-opts.deltaG)} cannot come out of it`,
      opts.field,
    );
  }
  if (opts.deltaG > 0) {
    const settings = await organisationSettings(trx, Number(c.organisation_id));
    const fill = checkCylinderFill({
      contentsG: after,
      waterCapacityG: Number(c.water_capacity_g),
      tareG: Number(c.tare_g),
      refrigerant: opts.refrigerant,
      strict130F: settings.strictFill130F,
    });
    if (fill.kind === "impossible") {
      throw new InvalidInputError(
        `Cylinder ${c.serial} cannot hold that: it would contain ${opts.describe(after)}, more than the ${opts.describe(fill.liquidFullG)} of liquid that fills it completely. Check the amount and its unit`,
        opts.field,
      );
    }
    if (fill.kind === "over_safe_fill" && !opts.confirmedOverFill) {
      throw new InvalidInputError(
        `Cylinder ${c.serial} would hold ${opts.describe(after)}, above its safe fill of ${opts.describe(fill.maxNetG)}. An overfilled cylinder can burst when it warms: move the excess to another cylinder, or tick the box to confirm this record is what happened`,
        CONFIRM_OVER_FILL_FIELD,
      );
    }
  }
  const update: Record<string, unknown> = { contents_g: after, updated_at: opts.at };
  if (after === 0) update.refrigerant = null;
  else if (before <= 0 || c.refrigerant === null) update.refrigerant = opts.refrigerant;
  await trx("cylinders").where({ id: opts.cylinderId }).update(update);
}
