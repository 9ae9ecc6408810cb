import type { Knex } from "knex";
import {
  checkCylinderFill,
  enteredAmount,
  type MassUnit,
  REGISTER_LABELS,
  addDays,
  fahrenheitToCelsius,
  fillPercent,
  formatMass,
  maxCylinderFill,
  remainingCapacityG,
  requalificationDueOn,
  toGrams,
  type AuditSettings,
  type CylinderInput,
  type CylinderListQuery,
  type CylinderPurpose,
  type CylinderStatus,
  type CylinderUpdateInput,
  type CylinderWeighingAmendInput,
  type CylinderWeighingInput,
  type FillBasis,
  type MassDisplayUnit,
  type RegisterHistoryQuery,
} from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { assertRecordDate } from "../records/common";
import { amendRecord, voidRecord } from "../amendments";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { toBool, toNumOrNull, type ActorRef, type ScopeFn } from "../types";
import {
  DUE_SOON_DAYS,
  applyScope,
  branchToday,
  changedColumns,
  describeColumns,
  dueState,
  isUniqueViolation,
  lastDoneCutoff,
  loadOrganisationSettings,
  loadWritableBranch,
  updateWithActivity,
  type DueState,
  type RegisterPage,
} from "./common";
import { countRows, sortedPage, whereContains } from "../paging";

export interface CylinderFill {
  /** Maximum net contents for the refrigerant (AHRI Guideline K: 80 % of WC × SG), grams. */
  maxNetG: number;
  maxGrossG: number;
  /** Current net contents as a share of the maximum, % (may exceed 100). */
  percent: number;
  /** Room left before the maximum (negative when overfilled), grams. */
  remainingG: number;
  basis: FillBasis;
  /** The organisation's strict setting: liquid density at 130 °F instead of 77 °F. */
  strict130F: boolean;
  refrigerant: string;
}

export interface CylinderWeighingSummary {
  id: number;
  on: string;
  /** When it was recorded: on the day of a movement, a weighing recorded after it is the later word. */
  createdAt: string;
  grossG: number;
  netG: number;
  refrigerant: string | null;
}

export interface CylinderRow {
  id: number;
  organisationId: number;
  branchId: number;
  branchName: string;
  branchCode: string;
  massUnit: MassDisplayUnit;
  timeZone: string;
  serial: string;
  specification: string | null;
  purpose: CylinderPurpose;
  waterCapacityG: number;
  tareG: number;
  manufacturedOn: string | null;
  lastRequalifiedOn: string | null;
  status: CylinderStatus;
  unregistered: boolean;
  /** Contents by the records (fills − draws − shipments). */
  recordedContentsG: number;
  lastMovementOn: string | null;
  lastWeighing: CylinderWeighingSummary | null;
  /**
   * What the cylinder holds now: the latest weighing when nothing moved in or out after it (a later
   * day, or later the same day), else the records. A weighing sets the contents, as in the audit.
   */
  netG: number;
  netSource: "records" | "weighing";
  refrigerant: string | null;
  fill: CylinderFill | null;
  requalification: { dueOn: string | null; state: DueState; years: number; today: string };
  createdAt: string;
  updatedAt: string;
}

const LAST_MOVEMENT_SQL =
  "(select m.id from refrigerant_movements m where m.cylinder_id = cylinders.id and m.voided_at is null order by m.moved_on desc, m.id desc limit 1) as last_movement_id";
const LAST_WEIGHING_SQL =
  "(select w.id from cylinder_weighings w where w.cylinder_id = cylinders.id and w.voided_at is null order by w.weighed_on desc, w.id desc limit 1) as last_weighing_id";

function withJoins(db: Knex): Knex.QueryBuilder {
  return db("cylinders as cylinders").join("branches as branch", "branch.id", "cylinders.branch_id");
}

function columns(db: Knex) {
  return [
    "cylinders.*",
    "branch.name as branch_name",
    "branch.code as branch_code",
    "branch.mass_unit as branch_mass_unit",
    "branch.time_zone as branch_time_zone",
    db.raw(LAST_MOVEMENT_SQL),
    db.raw(LAST_WEIGHING_SQL),
  ];
}

/** Maximum fill by the rules core; a refrigerant without a catalogued density falls back to SG 1 (and says so). */
export function cylinderFill(opts: {
  waterCapacityG: number;
  tareG: number;
  refrigerant: string | null;
  netG: number;
  strict130F: boolean;
}): CylinderFill | null {
  if (!opts.refrigerant || !(opts.waterCapacityG > 0)) return null;
  let max: { maxNetG: number; maxGrossG: number; basis: FillBasis };
  try {
    max = maxCylinderFill({
      waterCapacityG: opts.waterCapacityG,
      tareG: opts.tareG,
      refrigerant: opts.refrigerant,
      strict130F: opts.strict130F,
    });
  } catch {
    const fallback = maxCylinderFill({
      waterCapacityG: opts.waterCapacityG,
      tareG: opts.tareG,
      refrigerant: opts.refrigerant,
      specificGravity: 1,
    });
    max = { ...fallback, basis: "legacy_sg_1" };
  }
  return {
    maxNetG: max.maxNetG,
    maxGrossG: max.maxGrossG,
    percent: max.maxNetG > 0 ? fillPercent(opts.netG, max.maxNetG) : 0,
    remainingG: remainingCapacityG(opts.netG + opts.tareG, max.maxGrossG),
    basis: max.basis,
    strict130F: opts.strict130F,
    refrigerant: opts.refrigerant,
  };
}

/** Requalification due date and where it stands today (49 CFR 180.209; period from the settings). */
export function cylinderRequalification(lastRequalifiedOn: string | null, years: number, today: string): CylinderRow["requalification"] {
  const dueOn = lastRequalifiedOn ? requalificationDueOn(lastRequalifiedOn, years) : null;
  return { dueOn, state: dueState(dueOn, today), years, today };
}

interface LastMovement {
  movedOn: string;
  createdAt: string;
}

/** Whether the weighing is the latest word on the contents (nothing recorded moved after it). */
function weighingIsLatest(weighing: CylinderWeighingSummary | null, movement: LastMovement | null): weighing is CylinderWeighingSummary {
  if (!weighing) return false;
  if (!movement) return true;
  if (weighing.on !== movement.movedOn) return weighing.on > movement.movedOn;
  return weighing.createdAt > movement.createdAt;
}

function toRow(
  r: any,
  weighing: CylinderWeighingSummary | null,
  movement: LastMovement | null,
  settings: AuditSettings,
  now: Date,
): CylinderRow {
  const recordedContentsG = Number(r.contents_g);
  const lastMovementOn: string | null = movement?.movedOn ?? null;
  const useWeighing = weighingIsLatest(weighing, movement);
  const netG = useWeighing ? weighing.netG : recordedContentsG;
  const refrigerant = (useWeighing ? (weighing.refrigerant ?? r.refrigerant) : r.refrigerant) ?? null;
  const waterCapacityG = Number(r.water_capacity_g);
  const tareG = Number(r.tare_g);
  const today = branchToday(r.branch_time_zone, now);
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchCode: r.branch_code,
    massUnit: r.branch_mass_unit,
    timeZone: r.branch_time_zone,
    serial: r.serial,
    specification: r.specification ?? null,
    purpose: r.purpose,
    waterCapacityG,
    tareG,
    manufacturedOn: r.manufactured_on ?? null,
    lastRequalifiedOn: r.last_requalified_on ?? null,
    status: r.status,
    unregistered: toBool(r.unregistered),
    recordedContentsG,
    lastMovementOn,
    lastWeighing: weighing,
    netG,
    netSource: useWeighing ? "weighing" : "records",
    refrigerant,
    fill: cylinderFill({ waterCapacityG, tareG, refrigerant, netG, strict130F: settings.strictFill130F }),
    requalification: cylinderRequalification(r.last_requalified_on ?? null, settings.requalificationYears, today),
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

async function latestWeighings(db: Knex, ids: number[]): Promise<Map<number, CylinderWeighingSummary>> {
  const map = new Map<number, CylinderWeighingSummary>();
  if (ids.length === 0) return map;
  const rows = await db("cylinder_weighings")
    .whereIn("id", ids)
    .select("id", "weighed_on", "gross_g", "net_g", "refrigerant", "created_at");
  for (const w of rows) {
    map.set(Number(w.id), {
      id: Number(w.id),
      on: w.weighed_on,
      createdAt: w.created_at,
      grossG: Number(w.gross_g),
      netG: Number(w.net_g),
      refrigerant: w.refrigerant ?? null,
    });
  }
  return map;
}

async function latestMovements(db: Knex, ids: number[]): Promise<Map<number, LastMovement>> {
  const map = new Map<number, LastMovement>();
  if (ids.length === 0) return map;
  for (const m of await db("refrigerant_movements").whereIn("id", ids).select("id", "moved_on", "created_at")) {
    map.set(Number(m.id), { movedOn: m.moved_on, createdAt: m.created_at });
  }
  return map;
}

/** Both "latest" lookups of a page of cylinders, two queries in all. */
async function latestOf(db: Knex, rows: any[]) {
  const ids = (key: string) => rows.map((r) => toNumOrNull(r[key])).filter((x): x is number => x !== null);
  const [weighings, movements] = await Promise.all([
    latestWeighings(db, ids("last_weighing_id")),
    latestMovements(db, ids("last_movement_id")),
  ]);
  return (r: any) => ({
    weighing: weighings.get(Number(r.last_weighing_id)) ?? null,
    movement: movements.get(Number(r.last_movement_id)) ?? null,
  });
}

const SORT_COLUMNS: Record<CylinderListQuery["sort"], string> = {
  serial: "cylinders.serial",
  branch: "branch.name",
  refrigerant: "cylinders.refrigerant",
  contents: "cylinders.contents_g",
  lastRequalifiedOn: "cylinders.last_requalified_on",
  status: "cylinders.status",
};
/** Sort columns that may hold NULL (ordered as SQLite does in both dialects). */
const NULLABLE_SORTS = new Set(["cylinders.refrigerant", "cylinders.last_requalified_on"]);

/**
 * One page of the cylinder register with each cylinder's fill and requalification computed by the
 * rules core. The scope sees the table as `cylinders`. The requalification filter compares dates
 * in each branch's own time zone.
 */
export async function listCylinders(
  db: Knex,
  opts: { scope: ScopeFn; organisationId: number; query: CylinderListQuery; now?: Date },
): Promise<RegisterPage<CylinderRow>> {
  const { query } = opts;
  const now = opts.now ?? new Date();
  const page = query.page ?? 1;
  const pageSize = query.pageSize ?? 25;
  const settings = await loadOrganisationSettings(db, opts.organisationId);
  const years = settings.requalificationYears;
  const branches = query.requalification
    ? await db("branches").where({ organisation_id: opts.organisationId }).select("id", "time_zone")
    : [];

  const filtered = (qb: Knex.QueryBuilder) => {
    applyScope(qb, opts.scope);
    if (query.branchId) qb.where("cylinders.branch_id", query.branchId);
    if (query.status) qb.where("cylinders.status", query.status);
    if (query.refrigerant) qb.where("cylinders.refrigerant", query.refrigerant);
    if (query.q) whereContains(qb, query.q, ["cylinders.serial", "coalesce(cylinders.specification, '')"]);
    if (query.requalification === "unknown") qb.whereNull("cylinders.last_requalified_on");
    else if (query.requalification) {
      const filter = query.requalification;
      qb.where((any) => {
        any.whereRaw("1 = 0");
        for (const b of branches) {
          const today = branchToday(b.time_zone, now);
          const overdueUpTo = lastDoneCutoff(today, years);
          const soonUpTo = lastDoneCutoff(addDays(today, DUE_SOON_DAYS), years);
          any.orWhere((w) => {
            w.where("cylinders.branch_id", Number(b.id)).whereNotNull("cylinders.last_requalified_on");
            if (filter === "overdue") w.where("cylinders.last_requalified_on", "<=", overdueUpTo);
            if (filter === "due_soon")
              w.where("cylinders.last_requalified_on", ">", overdueUpTo).where("cylinders.last_requalified_on", "<=", soonUpTo);
            if (filter === "current") w.where("cylinders.last_requalified_on", ">", soonUpTo);
          });
        }
      });
    }
    return qb;
  };

  const total = await countRows(filtered(db("cylinders as cylinders")));
  const dir = query.dir === "desc" ? "desc" : "asc";
  const rows: any[] = await sortedPage(filtered(withJoins(db)).select(columns(db)), {
    column: SORT_COLUMNS[query.sort ?? "serial"],
    dir,
    nullable: NULLABLE_SORTS,
    id: "cylinders.id",
    page,
    pageSize,
  });
  const latest = await latestOf(db, rows);
  return {
    rows: rows.map((r) => {
      const { weighing, movement } = latest(r);
      return toRow(r, weighing, movement, settings, now);
    }),
    total,
    page,
    pageSize,
  };
}

/** One cylinder the scope allows, or undefined. */
export async function getCylinder(db: Knex, opts: { scope: ScopeFn; id: number; now?: Date }): Promise<CylinderRow | undefined> {
  const qb = withJoins(db).where("cylinders.id", opts.id);
  applyScope(qb, opts.scope);
  const r = await qb.first(columns(db));
  if (!r) return undefined;
  const settings = await loadOrganisationSettings(db, Number(r.organisation_id));
  const { weighing, movement } = (await latestOf(db, [r]))(r);
  return toRow(r, weighing, movement, settings, opts.now ?? new Date());
}

async function refuseDuplicateSerial(trx: Knex.Transaction, organisationId: number, serial: string, exceptId?: number): Promise<void> {
  const qb = trx("cylinders").where({ organisation_id: organisationId }).whereRaw("lower(serial) = ?", [serial.toLowerCase()]);
  if (exceptId !== undefined) qb.whereNot("id", exceptId);
  if (await qb.first("id")) throw new RecordConflictError(`A cylinder with serial ${serial} is already registered`, "serial");
}

function columnsOf(input: CylinderInput | CylinderUpdateInput) {
  const waterCapacityG = toGrams(input.waterCapacityAmount, input.waterCapacityUnit);
  const tareG = toGrams(input.tareAmount, input.tareUnit);
  if (tareG <= 0) throw new InvalidInputError("The tare weight must be more than zero", "tareAmount");
  if (waterCapacityG <= 0) throw new InvalidInputError("The water capacity must be more than zero", "waterCapacityAmount");
  return {
    serial: input.serial,
    specification: input.specification ?? null,
    purpose: input.purpose ?? "recovery",
    water_capacity_g: waterCapacityG,
    tare_g: tareG,
    manufactured_on: input.manufacturedOn ?? null,
    last_requalified_on: input.lastRequalifiedOn ?? null,
    status: input.status ?? "in_service",
  };
}

/** Adds an (empty) cylinder to a branch's register; jobs and weighings fill in its contents. */
export async function createCylinder(db: Knex, opts: { actor: ActorRef; input: CylinderInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  try {
    return await db.transaction(async (trx) => {
      const branch = await loadWritableBranch(trx, actor.organisationId, input.branchId);
      await refuseDuplicateSerial(trx, actor.organisationId, input.serial);
      const cols = columnsOf(input);
      const [row] = await trx("cylinders")
        .insert({
          organisation_id: actor.organisationId,
          branch_id: branch.id,
          ...cols,
          refrigerant: null,
          contents_g: 0,
          unregistered: false,
          created_at: at,
          updated_at: at,
        })
        .returning("id");
      const id = rowId(row);
      await appendActivity(trx, {
        organisationId: actor.organisationId,
        actorId: actor.userId,
        branchId: branch.id,
        action: "cylinder.created",
        subjectType: "Cylinder",
        subjectId: id,
        summary: `Added cylinder ${input.serial} to ${branch.name}: water capacity ${formatMass(cols.water_capacity_g, branch.massUnit)}, tare ${formatMass(cols.tare_g, branch.massUnit)}`,
        at,
      });
      return id;
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new RecordConflictError(`A cylinder with serial ${input.serial} is already registered`, "serial");
    throw err;
  }
}

/** The stamped figures the fill and requalification rules use: corrections are amendments. */
export const CYLINDER_REGULATED_COLUMNS = ["water_capacity_g", "tare_g", "last_requalified_on"] as const;

const WORDS: Record<string, string> = {
  serial: "serial",
  specification: "specification",
  purpose: "use",
  water_capacity_g: "water capacity",
  tare_g: "tare weight",
  manufactured_on: "manufacture date",
  last_requalified_on: "last requalification date",
  status: "status",
};

/**
 * Edits a cylinder. A new water capacity, tare or requalification date needs a reason and is kept as
 * an amendment; other changes (status included: cylinders are retired, never deleted) are written
 * with an activity row listing the previous and next values.
 */
export async function updateCylinder(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: CylinderUpdateInput; now?: Date },
): Promise<{ amendmentId: number | null; changed: string[] }> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  try {
    return await db.transaction(async (trx) => {
      const row = await trx("cylinders").where({ id: opts.id, organisation_id: actor.organisationId }).first();
      if (!row) throw new RecordNotFoundError("No such cylinder");
      const branch = await loadWritableBranch(trx, actor.organisationId, Number(row.branch_id));
      if (input.serial.toLowerCase() !== String(row.serial).toLowerCase())
        await refuseDuplicateSerial(trx, actor.organisationId, input.serial, opts.id);
      const { previous, next } = changedColumns(row, columnsOf(input));
      const changed = Object.keys(next);
      if (changed.length === 0) throw new InvalidInputError("Nothing was changed", "serial");
      const regulated = changed.filter((c) => (CYLINDER_REGULATED_COLUMNS as readonly string[]).includes(c));
      const statusWords =
        "status" in next
          ? `: ${REGISTER_LABELS.cylinderStatus[previous.status as CylinderStatus] ?? previous.status} → ${REGISTER_LABELS.cylinderStatus[next.status as CylinderStatus]}`
          : "";
      if (regulated.length > 0) {
        if (!input.reason || input.reason.trim().length < 3) {
          throw new InvalidInputError(
            `Say why the ${describeColumns(regulated, WORDS)} ${regulated.length > 1 ? "are" : "is"} corrected; the previous values are kept`,
            "reason",
          );
        }
        const amendmentId = await amendRecord(trx, {
          table: "cylinders",
          subjectType: "Cylinder",
          id: opts.id,
          organisationId: actor.organisationId,
          actorId: actor.userId,
          reason: input.reason,
          changes: next,
          summary: `Corrected the ${describeColumns(changed, WORDS)} of cylinder ${input.serial}${statusWords}`,
          at,
        });
        return { amendmentId, changed };
      }
      await updateWithActivity(trx, {
        table: "cylinders",
        id: opts.id,
        organisationId: actor.organisationId,
        branchId: branch.id,
        actorId: actor.userId,
        subjectType: "Cylinder",
        action: "cylinder.updated",
        previous,
        next,
        summary: `Updated the ${describeColumns(changed, WORDS)} of cylinder ${input.serial}${statusWords}`,
        at,
      });
      return { amendmentId: null, changed };
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new RecordConflictError(`A cylinder with serial ${input.serial} is already registered`, "serial");
    throw err;
  }
}

// ---------------------------------------------------------------------------------------------
// Weighings
// ---------------------------------------------------------------------------------------------

export interface CylinderWeighingRow {
  id: number;
  weighedOn: string;
  grossG: number;
  /** The scale reading as it was typed, while it still matches the grams. */
  grossEntered: { amount: number; unit: MassUnit } | null;
  netG: number;
  refrigerant: string | null;
  pressurePsig: number | null;
  temperatureC: number | null;
  weighedByName: string;
  notes: string | null;
  jobId: number | null;
  voidedAt: string | null;
  voidReason: string | null;
  amendmentCount: number;
  createdAt: string;
}

/** A cylinder's weighings, newest first, voided ones included (marked). */
export async function listCylinderWeighings(
  db: Knex,
  opts: { cylinderId: number; query: RegisterHistoryQuery },
): Promise<RegisterPage<CylinderWeighingRow>> {
  const page = opts.query.page ?? 1;
  const pageSize = opts.query.pageSize ?? 10;
  const dir = opts.query.dir === "asc" ? "asc" : "desc";
  const countRow = await db("cylinder_weighings").where({ cylinder_id: opts.cylinderId }).count({ n: "*" }).first();
  const rows = await db("cylinder_weighings as w")
    .join("users as u", "u.id", "w.weighed_by")
    .where("w.cylinder_id", opts.cylinderId)
    .orderBy("w.weighed_on", dir)
    .orderBy("w.id", dir)
    .limit(pageSize)
    .offset((page - 1) * pageSize)
    .select(
      "w.*",
      "u.name as weighed_by_name",
      db.raw("(select count(*) from amendments a where a.subject_type = 'CylinderWeighing' and a.subject_id = w.id) as amendment_count"),
    );
  return {
    rows: rows.map((w) => ({
      id: Number(w.id),
      weighedOn: w.weighed_on,
      grossG: Number(w.gross_g),
      grossEntered: enteredAmount(Number(w.gross_g), toNumOrNull(w.gross_entered), w.gross_unit),
      netG: Number(w.net_g),
      refrigerant: w.refrigerant ?? null,
      pressurePsig: toNumOrNull(w.pressure_psig),
      temperatureC: toNumOrNull(w.temperature_c),
      weighedByName: w.weighed_by_name,
      notes: w.notes ?? null,
      jobId: toNumOrNull(w.job_id),
      voidedAt: w.voided_at ?? null,
      voidReason: w.void_reason ?? null,
      amendmentCount: Number(w.amendment_count ?? 0),
      createdAt: w.created_at,
    })),
    total: Number(countRow?.n ?? 0),
    page,
    pageSize,
  };
}

function weighingColumns(
  input: CylinderWeighingInput,
  cylinder: { serial: string; tare_g: number; water_capacity_g: number; refrigerant: string | null },
  massUnit: MassDisplayUnit,
) {
  const grossG = toGrams(input.grossAmount, input.grossUnit);
  const tareG = Number(cylinder.tare_g);
  if (grossG < tareG) {
    throw new InvalidInputError(
      `The reading is lighter than the empty cylinder (tare ${formatMass(tareG, massUnit)}); check the scale and the unit`,
      "grossAmount",
    );
  }
  const netG = grossG - tareG;
  const refrigerant = input.refrigerant ?? cylinder.refrigerant ?? null;
  if (netG > 0 && !refrigerant) throw new InvalidInputError("Say which refrigerant the cylinder holds", "refrigerant");
  // A reading is what the cylinder holds, so above the safe fill is recorded as it is (the audit
  // raises it); only a net weight no cylinder could hold is refused.
  if (netG > 0 && refrigerant) {
    const fill = checkCylinderFill({
      contentsG: netG,
      waterCapacityG: Number(cylinder.water_capacity_g),
      tareG,
      refrigerant,
    });
    if (fill.kind === "impossible")
      throw new InvalidInputError(
        `Cylinder ${cylinder.serial} cannot hold ${formatMass(netG, massUnit)} net: ${formatMass(fill.liquidFullG, massUnit)} of liquid fills it completely. Check the reading and its unit`,
        "grossAmount",
      );
  }
  const temperatureC =
    input.temperatureValue === undefined
      ? null
      : input.temperatureUnit === "C"
        ? input.temperatureValue
        : Math.round(fahrenheitToCelsius(input.temperatureValue) * 100) / 100;
  return {
    weighed_on: input.weighedOn,
    gross_g: grossG,
    gross_entered: input.grossAmount,
    gross_unit: input.grossUnit,
    net_g: netG,
    refrigerant: netG > 0 ? refrigerant : (input.refrigerant ?? null),
    pressure_psig: input.pressurePsig ?? null,
    temperature_c: temperatureC,
    notes: input.notes ?? null,
  };
}

async function loadCylinderForWrite(trx: Knex.Transaction, organisationId: number, cylinderId: number) {
  const cylinder = await trx("cylinders")
    .where({ id: cylinderId, organisation_id: organisationId })
    .first("id", "branch_id", "serial", "tare_g", "refrigerant", "water_capacity_g");
  if (!cylinder) throw new RecordNotFoundError("No such cylinder");
  const branch = await loadWritableBranch(trx, organisationId, Number(cylinder.branch_id));
  return { cylinder, branch };
}

/**
 * Records a scale reading of a cylinder: net contents = reading − tare. The weighing is a regulated
 * record (corrected only by amendment). It does not rewrite the cylinder's recorded movements; the
 * register shows the weighed contents when the weighing is the latest word.
 */
export async function recordCylinderWeighing(
  db: Knex,
  opts: { actor: ActorRef; cylinderId: number; input: CylinderWeighingInput; now?: Date },
): Promise<{ id: number; netG: number }> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const { cylinder, branch } = await loadCylinderForWrite(trx, actor.organisationId, opts.cylinderId);
    await assertRecordDate(trx, {
      organisationId: actor.organisationId,
      timeZone: branch.timeZone,
      date: input.weighedOn,
      field: "weighedOn",
      what: "The date of the weighing",
      now: opts.now,
    });
    const cols = weighingColumns(input, cylinder, branch.massUnit);
    const [row] = await trx("cylinder_weighings")
      .insert({
        organisation_id: actor.organisationId,
        branch_id: branch.id,
        cylinder_id: opts.cylinderId,
        job_id: null,
        weighed_by: actor.userId,
        created_at: at,
        ...cols,
      })
      .returning("id");
    const id = rowId(row);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch.id,
      action: "cylinder.weighed",
      subjectType: "CylinderWeighing",
      subjectId: id,
      summary: `Weighed cylinder ${cylinder.serial}: ${formatMass(cols.gross_g, branch.massUnit)} on the scale, ${formatMass(cols.net_g, branch.massUnit)} net${cols.refrigerant ? ` ${cols.refrigerant}` : ""}`,
      data: { cylinderId: opts.cylinderId, grossG: cols.gross_g, netG: cols.net_g },
      at,
    });
    return { id, netG: cols.net_g };
  });
}

async function loadWeighing(trx: Knex.Transaction, organisationId: number, cylinderId: number, weighingId: number) {
  const w = await trx("cylinder_weighings")
    .where({ id: weighingId, organisation_id: organisationId, cylinder_id: cylinderId })
    .first("id", "voided_at", "refrigerant");
  if (!w) throw new RecordNotFoundError("No such weighing of this cylinder");
  return w;
}

/** Corrects a weighing by amendment (previous values and the reason are kept). */
export async function amendCylinderWeighing(
  db: Knex,
  opts: { actor: ActorRef; cylinderId: number; weighingId: number; input: CylinderWeighingAmendInput; now?: Date },
): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const { cylinder, branch } = await loadCylinderForWrite(trx, actor.organisationId, opts.cylinderId);
    const weighing = await loadWeighing(trx, actor.organisationId, opts.cylinderId, opts.weighingId);
    await assertRecordDate(trx, {
      organisationId: actor.organisationId,
      timeZone: branch.timeZone,
      date: input.weighedOn,
      field: "weighedOn",
      what: "The date of the weighing",
      now: opts.now,
    });
    // Without a refrigerant in the correction, the weighing keeps the one it recorded.
    const cols = weighingColumns(input, { ...cylinder, refrigerant: weighing.refrigerant ?? cylinder.refrigerant }, branch.massUnit);
    return amendRecord(trx, {
      table: "cylinder_weighings",
      subjectType: "CylinderWeighing",
      id: opts.weighingId,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: input.reason,
      changes: cols,
      summary: `Corrected the weighing of cylinder ${cylinder.serial} of ${input.weighedOn}: ${formatMass(cols.net_g, branch.massUnit)} net`,
      at,
    });
  });
}

/** Voids a weighing entered in error; the row and its history stay. */
export async function voidCylinderWeighing(
  db: Knex,
  opts: { actor: ActorRef; cylinderId: number; weighingId: number; reason: string; now?: Date },
): Promise<void> {
  const { actor } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const { cylinder } = await loadCylinderForWrite(trx, actor.organisationId, opts.cylinderId);
    await loadWeighing(trx, actor.organisationId, opts.cylinderId, opts.weighingId);
    await voidRecord(trx, {
      table: "cylinder_weighings",
      subjectType: "CylinderWeighing",
      id: opts.weighingId,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: opts.reason,
      summary: `Voided a weighing of cylinder ${cylinder.serial}`,
      at,
    });
  });
}

// ---------------------------------------------------------------------------------------------
// Movements and history
// ---------------------------------------------------------------------------------------------

export interface CylinderMovementRow {
  id: number;
  movedOn: string;
  direction: string;
  refrigerant: string;
  massG: number;
  jobId: number | null;
  jobKind: string | null;
  applianceTag: string | null;
  reclaimShipmentId: number | null;
  reclaimerName: string | null;
}

/**
 * Refrigerant that went into or out of a cylinder (fills, draws, shipments for reclaim), newest
 * first. Job details are only named when the reader may read the job (`jobScope`, table `jobs`).
 */
export async function listCylinderMovements(
  db: Knex,
  opts: { cylinderId: number; jobScope: ScopeFn; query: RegisterHistoryQuery },
): Promise<RegisterPage<CylinderMovementRow>> {
  const page = opts.query.page ?? 1;
  const pageSize = opts.query.pageSize ?? 10;
  const dir = opts.query.dir === "asc" ? "asc" : "desc";
  const countRow = await db("refrigerant_movements")
    .where({ cylinder_id: opts.cylinderId })
    .whereNull("voided_at")
    .count({ n: "*" })
    .first();
  const rows = await db("refrigerant_movements as mv")
    .leftJoin("jobs as jobs", "jobs.id", "mv.job_id")
    .leftJoin("appliances as appliance", "appliance.id", "jobs.appliance_id")
    .leftJoin("reclaim_shipments as shipment", "shipment.id", "mv.reclaim_shipment_id")
    .where("mv.cylinder_id", opts.cylinderId)
    .whereNull("mv.voided_at")
    .orderBy("mv.moved_on", dir)
    .orderBy("mv.id", dir)
    .limit(pageSize)
    .offset((page - 1) * pageSize)
    .select(
      "mv.id",
      "mv.moved_on",
      "mv.direction",
      "mv.refrigerant",
      "mv.mass_g",
      "mv.job_id",
      "jobs.kind as job_kind",
      "appliance.tag as appliance_tag",
      "mv.reclaim_shipment_id",
      "shipment.reclaimer_name",
    );
  const jobIds = rows.map((r) => toNumOrNull(r.job_id)).filter((x): x is number => x !== null);
  const readable = new Set<number>();
  if (jobIds.length) {
    const qb = db("jobs as jobs").whereIn("jobs.id", jobIds);
    applyScope(qb, opts.jobScope);
    for (const r of await qb.select("jobs.id")) readable.add(Number(r.id));
  }
  return {
    rows: rows.map((r) => {
      const jobId = toNumOrNull(r.job_id);
      const visible = jobId !== null && readable.has(jobId);
      return {
        id: Number(r.id),
        movedOn: r.moved_on,
        direction: r.direction,
        refrigerant: r.refrigerant,
        massG: Number(r.mass_g),
        jobId: visible ? jobId : null,
        jobKind: r.job_kind ?? null,
        applianceTag: visible ? (r.appliance_tag ?? null) : null,
        reclaimShipmentId: toNumOrNull(r.reclaim_shipment_id),
        reclaimerName: r.reclaimer_name ?? null,
      };
    }),
    total: Number(countRow?.n ?? 0),
    page,
    pageSize,
  };
}

export interface RegisterAmendment {
  id: number;
  subjectType: string;
  subjectId: number;
  actorName: string;
  at: string;
  reason: string;
  previous: Record<string, unknown>;
  next: Record<string, unknown>;
}

/** Corrections of a cylinder and of its weighings, newest first. */
export async function listCylinderAmendments(db: Knex, opts: { organisationId: number; cylinderId: number }): Promise<RegisterAmendment[]> {
  const rows = await db("amendments as a")
    .join("users as u", "u.id", "a.actor_id")
    .where("a.organisation_id", opts.organisationId)
    .where((w) =>
      w
        .where((c) => c.where("a.subject_type", "Cylinder").where("a.subject_id", opts.cylinderId))
        .orWhere((c) =>
          c
            .where("a.subject_type", "CylinderWeighing")
            .whereIn("a.subject_id", db("cylinder_weighings").where({ cylinder_id: opts.cylinderId }).select("id")),
        ),
    )
    .orderBy([
      { column: "a.at", order: "desc" },
      { column: "a.id", order: "desc" },
    ])
    .limit(200)
    .select("a.id", "a.subject_type", "a.subject_id", "u.name as actor_name", "a.at", "a.reason", "a.previous", "a.next");
  return rows.map((r) => ({
    id: Number(r.id),
    subjectType: r.subject_type,
    subjectId: Number(r.subject_id),
    actorName: r.actor_name,
    at: r.at,
    reason: r.reason,
    previous: JSON.parse(r.previous),
    next: JSON.parse(r.next),
  }));
}

export interface RegisterActivity {
  id: number;
  at: string;
  action: string;
  actorName: string | null;
  summary: string;
}

/** The activity history of one register record (and, for a cylinder, its weighings), newest first. */
export async function listRegisterActivity(
  db: Knex,
  opts: { organisationId: number; subjectType: "Appliance" | "Cylinder" | "RecoveryEquipment"; subjectId: number; limit?: number },
): Promise<RegisterActivity[]> {
  const qb = db("activity as a")
    .leftJoin("users as u", "u.id", "a.actor_id")
    .where("a.organisation_id", opts.organisationId)
    .where((w) => {
      w.where((c) => c.where("a.subject_type", opts.subjectType).where("a.subject_id", opts.subjectId));
      if (opts.subjectType === "Cylinder") {
        w.orWhere((c) =>
          c
            .where("a.subject_type", "CylinderWeighing")
            .whereIn("a.subject_id", db("cylinder_weighings").where({ cylinder_id: opts.subjectId }).select("id")),
        );
      }
    })
    .orderBy([
      { column: "a.at", order: "desc" },
      { column: "a.id", order: "desc" },
    ])
    .limit(opts.limit ?? 50)
    .select("a.id", "a.at", "a.action", "u.name as actor_name", "a.summary");
  return (await qb).map((r) => ({ id: Number(r.id), at: r.at, action: r.action, actorName: r.actor_name ?? null, summary: r.summary }));
}
