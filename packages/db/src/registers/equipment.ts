import type { Knex } from "knex";
import {
  REGISTER_LABELS,
  equipmentEra,
  type EquipmentCertificationState,
  type EquipmentEra,
  type EquipmentInput,
  type EquipmentListQuery,
  type EquipmentStatus,
  type EquipmentUpdateInput,
  type MassDisplayUnit,
} from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { amendRecord } from "../amendments";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { toBool, type ActorRef, type ScopeFn } from "../types";
import {
  applyScope,
  changedColumns,
  describeColumns,
  isUniqueViolation,
  loadWritableBranch,
  updateWithActivity,
  type RegisterPage,
} from "./common";
import { countRows, sortedPage, whereContains } from "../paging";

export interface EquipmentRow {
  id: number;
  organisationId: number;
  branchId: number;
  branchName: string;
  branchCode: string;
  massUnit: MassDisplayUnit;
  timeZone: string;
  serial: string;
  makeModel: string | null;
  manufacturedOn: string | null;
  /** Which column of 40 CFR 82.156 Table 1 applies; an unknown date counts as the stricter, later one. */
  era: EquipmentEra;
  certificationState: EquipmentCertificationState;
  certifiedBy: string | null;
  hasEvidence: boolean;
  /** What the evidence file is (from the type checked at upload, kept in the key's extension). */
  evidenceType: "image" | "pdf" | null;
  smallApplianceOnly: boolean;
  systemDependent: boolean;
  status: EquipmentStatus;
  /** A placeholder a job named but the register lacked. */
  unregistered: boolean;
  createdAt: string;
  updatedAt: string;
}

function withJoins(db: Knex): Knex.QueryBuilder {
  return db("recovery_equipment as recovery_equipment").join("branches as branch", "branch.id", "recovery_equipment.branch_id");
}

const COLUMNS = [
  "recovery_equipment.*",
  "branch.name as branch_name",
  "branch.code as branch_code",
  "branch.mass_unit as branch_mass_unit",
  "branch.time_zone as branch_time_zone",
];

function toRow(r: any): EquipmentRow {
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchCode: r.branch_code,
    massUnit: r.branch_mass_unit,
    timeZone: r.branch_time_zone,
    serial: r.serial,
    makeModel: r.make_model ?? null,
    manufacturedOn: r.manufactured_on ?? null,
    era: equipmentEra(r.manufactured_on ?? null),
    certificationState: r.certification_state,
    certifiedBy: r.certified_by ?? null,
    hasEvidence: Boolean(r.evidence_file_key),
    evidenceType: r.evidence_file_key ? (String(r.evidence_file_key).toLowerCase().endsWith(".pdf") ? "pdf" : "image") : null,
    smallApplianceOnly: toBool(r.small_appliance_only),
    systemDependent: toBool(r.system_dependent),
    status: r.status,
    unregistered: toBool(r.unregistered),
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

const SORT_COLUMNS: Record<EquipmentListQuery["sort"], string> = {
  serial: "recovery_equipment.serial",
  branch: "branch.name",
  makeModel: "recovery_equipment.make_model",
  manufacturedOn: "recovery_equipment.manufactured_on",
  certificationState: "recovery_equipment.certification_state",
  status: "recovery_equipment.status",
};
/** Sort columns that may hold NULL (ordered as SQLite does in both dialects). */
const NULLABLE_SORTS = new Set(["recovery_equipment.make_model", "recovery_equipment.manufactured_on"]);

/** One page of the recovery-equipment register. The scope sees the table as `recovery_equipment`. */
export async function listEquipment(db: Knex, opts: { scope: ScopeFn; query: EquipmentListQuery }): Promise<RegisterPage<EquipmentRow>> {
  const { query } = opts;
  const page = query.page ?? 1;
  const pageSize = query.pageSize ?? 25;
  const filtered = (qb: Knex.QueryBuilder) => {
    applyScope(qb, opts.scope);
    if (query.branchId) qb.where("recovery_equipment.branch_id", query.branchId);
    if (query.certificationState) qb.where("recovery_equipment.certification_state", query.certificationState);
    if (query.status) qb.where("recovery_equipment.status", query.status);
    if (query.q) whereContains(qb, query.q, ["recovery_equipment.serial", "coalesce(recovery_equipment.make_model, '')"]);
    return qb;
  };
  const total = await countRows(filtered(db("recovery_equipment as recovery_equipment")));
  const dir = query.dir === "desc" ? "desc" : "asc";
  const rows = await sortedPage(filtered(withJoins(db)).select(COLUMNS), {
    column: SORT_COLUMNS[query.sort ?? "serial"],
    dir,
    nullable: NULLABLE_SORTS,
    id: "recovery_equipment.id",
    page,
    pageSize,
  });
  return { rows: rows.map(toRow), total, page, pageSize };
}

/** One unit the scope allows, or undefined. */
export async function getEquipment(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<EquipmentRow | undefined> {
  const qb = withJoins(db).where("recovery_equipment.id", opts.id);
  applyScope(qb, opts.scope);
  const r = await qb.first(COLUMNS);
  return r ? toRow(r) : undefined;
}

/** The stored key of the unit's certification evidence (label photo or certificate), if any. */
export async function getEquipmentEvidenceKey(db: Knex, opts: { organisationId: number; id: number }): Promise<string | null> {
  const row = await db("recovery_equipment").where({ id: opts.id, organisation_id: opts.organisationId }).first("evidence_file_key");
  return row?.evidence_file_key ?? null;
}

async function refuseDuplicateSerial(trx: Knex.Transaction, organisationId: number, serial: string, exceptId?: number): Promise<void> {
  const qb = trx("recovery_equipment").where({ organisation_id: organisationId }).whereRaw("lower(serial) = ?", [serial.toLowerCase()]);
  if (exceptId !== undefined) qb.whereNot("id", exceptId);
  if (await qb.first("id")) throw new RecordConflictError(`Recovery equipment with serial ${serial} is already registered`, "serial");
}

function columnsOf(input: EquipmentInput | EquipmentUpdateInput) {
  return {
    serial: input.serial,
    make_model: input.makeModel ?? null,
    manufactured_on: input.manufacturedOn ?? null,
    certification_state: input.certificationState,
    certified_by: input.certifiedBy ?? null,
    small_appliance_only: input.smallApplianceOnly ?? false,
    system_dependent: input.systemDependent ?? false,
    status: input.status ?? "in_service",
  };
}

/** Adds a recovery unit to a branch's register. */
export async function createEquipment(db: Knex, opts: { actor: ActorRef; input: EquipmentInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  try {
    return await db.transaction(async (trx) => {
      const branch = await loadWritableBranch(trx, actor.organisationId, input.branchId);
      await refuseDuplicateSerial(trx, actor.organisationId, input.serial);
      const [row] = await trx("recovery_equipment")
        .insert({
          organisation_id: actor.organisationId,
          branch_id: branch.id,
          ...columnsOf(input),
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
        action: "recovery_equipment.created",
        subjectType: "RecoveryEquipment",
        subjectId: id,
        summary: `Added recovery equipment ${input.serial}${input.makeModel ? ` (${input.makeModel})` : ""} to ${branch.name}: ${REGISTER_LABELS.equipmentCertification[input.certificationState].toLowerCase()}`,
        at,
      });
      return id;
    });
  } catch (err) {
    if (isUniqueViolation(err))
      throw new RecordConflictError(`Recovery equipment with serial ${input.serial} is already registered`, "serial");
    throw err;
  }
}

/** The manufacture date and certification decide what the unit may be used to claim: corrections are amendments. */
export const EQUIPMENT_REGULATED_COLUMNS = ["manufactured_on", "certification_state"] as const;

const WORDS: Record<string, string> = {
  serial: "serial",
  make_model: "make and model",
  manufactured_on: "manufacture date",
  certification_state: "certification status",
  certified_by: "testing organisation",
  small_appliance_only: "small appliances only",
  system_dependent: "system-dependent",
  status: "status",
};

/**
 * Edits a recovery unit. A new manufacture date or certification status needs a reason and is kept
 * as an amendment; other changes (status included) are written with an activity row.
 */
export async function updateEquipment(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: EquipmentUpdateInput; now?: Date },
): Promise<{ amendmentId: number | null; changed: string[] }> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  try {
    return await db.transaction(async (trx) => {
      const row = await trx("recovery_equipment").where({ id: opts.id, organisation_id: actor.organisationId }).first();
      if (!row) throw new RecordNotFoundError("No such recovery equipment");
      const branch = await loadWritableBranch(trx, actor.organisationId, Number(row.branch_id));
      if (input.serial.toLowerCase() !== String(row.serial).toLowerCase())
        await refuseDuplicateSerial(trx, actor.organisationId, input.serial, opts.id);
      const { previous, next } = changedColumns(row, columnsOf(input));
      const changed = Object.keys(next);
      if (changed.length === 0) throw new InvalidInputError("Nothing was changed", "serial");
      const regulated = changed.filter((c) => (EQUIPMENT_REGULATED_COLUMNS as readonly string[]).includes(c));
      if (regulated.length > 0) {
        if (!input.reason || input.reason.trim().length < 3) {
          throw new InvalidInputError(
            `Say why the ${describeColumns(regulated, WORDS)} ${regulated.length > 1 ? "are" : "is"} changed; the previous values are kept`,
            "reason",
          );
        }
        const amendmentId = await amendRecord(trx, {
          table: "recovery_equipment",
          subjectType: "RecoveryEquipment",
          id: opts.id,
          organisationId: actor.organisationId,
          actorId: actor.userId,
          reason: input.reason,
          changes: next,
          summary: `Corrected the ${describeColumns(changed, WORDS)} of recovery equipment ${input.serial}`,
          at,
        });
        return { amendmentId, changed };
      }
      await updateWithActivity(trx, {
        table: "recovery_equipment",
        id: opts.id,
        organisationId: actor.organisationId,
        branchId: branch.id,
        actorId: actor.userId,
        subjectType: "RecoveryEquipment",
        action: "recovery_equipment.updated",
        previous,
        next,
        summary: `Updated the ${describeColumns(changed, WORDS)} of recovery equipment ${input.serial}`,
        at,
      });
      return { amendmentId: null, changed };
    });
  } catch (err) {
    if (isUniqueViolation(err))
      throw new RecordConflictError(`Recovery equipment with serial ${input.serial} is already registered`, "serial");
    throw err;
  }
}

/**
 * Records the stored evidence (label photo or certificate) of a unit's certification. The file is
 * already in object storage under a key the server made; the previous key stays in the history.
 */
export async function attachEquipmentEvidence(
  db: Knex,
  opts: { actor: ActorRef; id: number; fileKey: string; mime: string; bytes: number; now?: Date },
): Promise<void> {
  const { actor } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const row = await trx("recovery_equipment")
      .where({ id: opts.id, organisation_id: actor.organisationId })
      .first("id", "branch_id", "serial", "evidence_file_key");
    if (!row) throw new RecordNotFoundError("No such recovery equipment");
    await loadWritableBranch(trx, actor.organisationId, Number(row.branch_id));
    await trx("recovery_equipment").where({ id: opts.id }).update({ evidence_file_key: opts.fileKey, updated_at: at });
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: Number(row.branch_id),
      action: "recovery_equipment.evidence_attached",
      subjectType: "RecoveryEquipment",
      subjectId: opts.id,
      summary: `${row.evidence_file_key ? "Replaced" : "Attached"} the certification evidence of recovery equipment ${row.serial} (${opts.mime === "application/pdf" ? "PDF" : "photo"})`,
      data: { previousKey: row.evidence_file_key ?? null, key: opts.fileKey, mime: opts.mime, bytes: opts.bytes },
      at,
    });
  });
}
