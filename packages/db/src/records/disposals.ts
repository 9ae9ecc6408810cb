import type { Knex } from "knex";
import {
  isSmallAppliance,
  toGrams,
  type ApplianceCategory,
  type DisposalListQuery,
  type DisposalRecordAmendmentInput,
  type DisposalRecordInput,
  type DisposalStatementAmendmentInput,
  type DisposalStatementInput,
  type MassDisplayUnit,
  type ShopDisposalBatchInput,
} from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { amendRecord, listAmendments, voidRecord, type AmendmentRecord } from "../amendments";
import { enteredAmount, type MassUnit } from "@coldtrail/core";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { insertJob } from "../jobs/write-job";
import { describeMass } from "../mass";
import { orderByNullable, toBool, toNumOrNull, type ActorRef, type ScopeFn } from "../types";
import { applyVoided, assertRecordDate, scoped, textOrNull, writableBranch, type RecordPage } from "./common";
import { countRows, whereContains } from "../paging";

/**
 * Disposal records (82.155(c), appliances of more than 5 and less than 50 lb) and signed statements
 * for small appliances (82.155(b)). Both are regulated records: corrected by amendment, voided with a
 * reason, never deleted. List scopes see the tables aliased `d` (`d.branch_id`, `d.organisation_id`),
 * and the record's date as `recordedOn` (`d.disposed_on` for records, `d.recovered_on` for statements).
 */

export interface DisposalListRow {
  id: number;
  type: "record" | "statement";
  branchId: number;
  branchName: string;
  branchMassUnit: MassDisplayUnit;
  applianceId: number;
  applianceTag: string;
  applianceDescription: string;
  applianceCategory: ApplianceCategory;
  jobId: number | null;
  /** Disposal date (records) or date of recovery (statements). */
  date: string;
  refrigerant: string | null;
  recoveredG: number | null;
  /** Records: company name; statements: who recovered the refrigerant. */
  who: string | null;
  /** Records: location of the appliance; statements: their address. */
  where: string | null;
  hasDocument: boolean;
  voidedAt: string | null;
}

const RECORD_SORT: Record<DisposalListQuery["sort"], string | null> = {
  date: "d.disposed_on",
  appliance: "appliance.tag",
  branch: "branch.name",
  refrigerant: "d.refrigerant",
  amount: "d.recovered_g",
};
const STATEMENT_SORT: Record<DisposalListQuery["sort"], string | null> = {
  date: "d.recovered_on",
  appliance: "appliance.tag",
  branch: "branch.name",
  refrigerant: "appliance.refrigerant",
  amount: null,
};

/** One page of disposal records or statements the scope allows. */
export async function listDisposals(db: Knex, opts: { scope: ScopeFn; query: DisposalListQuery }): Promise<RecordPage<DisposalListRow>> {
  const { query } = opts;
  const isRecord = query.type === "record";
  const table = isRecord ? "disposal_records" : "disposal_statements";
  const dateColumn = isRecord ? "d.disposed_on" : "d.recovered_on";
  const filtered = (qb: Knex.QueryBuilder) => {
    scoped(qb, opts.scope, { recordedOn: dateColumn });
    applyVoided(qb, "d.voided_at", query.voided);
    if (query.branchId) qb.where("d.branch_id", query.branchId);
    if (query.from) qb.where(dateColumn, ">=", query.from);
    if (query.to) qb.where(dateColumn, "<=", query.to);
    if (query.q) whereContains(qb, query.q, ["appliance.tag", "appliance.description"]);
    return qb;
  };
  const joined = () =>
    db(`${table} as d`)
      .join("appliances as appliance", "appliance.id", "d.appliance_id")
      .join("branches as branch", "branch.id", "d.branch_id");
  const total = await countRows(filtered(joined()));
  const page = query.page;
  const pageSize = query.pageSize;
  const dir = query.dir === "asc" ? "asc" : "desc";
  const rowsQuery = filtered(joined()).select(
    "d.id",
    "d.branch_id",
    "branch.name as branch_name",
    "branch.mass_unit as branch_mass_unit",
    "d.appliance_id",
    "appliance.tag as appliance_tag",
    "appliance.description as appliance_description",
    "appliance.category as appliance_category",
    "appliance.refrigerant as appliance_refrigerant",
    "d.job_id",
    "d.voided_at",
    ...(isRecord
      ? ["d.disposed_on as date", "d.refrigerant", "d.recovered_g", "d.company_name as who", "d.appliance_location as where_text"]
      : ["d.recovered_on as date", "d.recovered_by_name as who", "d.recovered_by_address as where_text", "d.document_file_key"]),
  );
  const column = (isRecord ? RECORD_SORT : STATEMENT_SORT)[query.sort] ?? dateColumn;
  // A record's refrigerant and amount may be NULL; they sort as in SQLite in both dialects.
  if (column === "d.refrigerant" || column === "d.recovered_g") orderByNullable(rowsQuery, column, dir);
  else rowsQuery.orderBy(column, dir);
  rowsQuery.orderBy("d.id", dir);
  const rows: any[] = await rowsQuery.limit(pageSize).offset((page - 1) * pageSize);
  return {
    total,
    page,
    pageSize,
    rows: rows.map((r) => ({
      id: Number(r.id),
      type: query.type,
      branchId: Number(r.branch_id),
      branchName: r.branch_name,
      branchMassUnit: r.branch_mass_unit,
      applianceId: Number(r.appliance_id),
      applianceTag: r.appliance_tag,
      applianceDescription: r.appliance_description,
      applianceCategory: r.appliance_category,
      jobId: toNumOrNull(r.job_id),
      date: r.date,
      refrigerant: isRecord ? (r.refrigerant ?? null) : r.appliance_refrigerant,
      recoveredG: isRecord ? toNumOrNull(r.recovered_g) : null,
      who: r.who ?? null,
      where: r.where_text ?? null,
      hasDocument: !isRecord && Boolean(r.document_file_key),
      voidedAt: r.voided_at ?? null,
    })),
  };
}

interface DisposalBase {
  id: number;
  organisationId: number;
  branchId: number;
  branchName: string;
  branchMassUnit: MassDisplayUnit;
  applianceId: number;
  applianceTag: string;
  applianceDescription: string;
  applianceCategory: ApplianceCategory;
  applianceRefrigerant: string;
  applianceFullChargeG: number;
  jobId: number | null;
  createdBy: number;
  createdByName: string;
  createdAt: string;
  voidedAt: string | null;
  voidReason: string | null;
  amendments: AmendmentRecord[];
}

export interface DisposalRecordDetail extends DisposalBase {
  type: "record";
  disposedOn: string;
  disposalPath: "on_site" | "shop";
  companyName: string | null;
  applianceLocation: string | null;
  recoveredOn: string | null;
  recoveredByName: string | null;
  refrigerant: string | null;
  recoveredG: number | null;
  /** The quantity as it was typed, while it still matches the grams. */
  recoveredEntered: { amount: number; unit: MassUnit } | null;
  sentTo: string | null;
}

export interface DisposalStatementDetail extends DisposalBase {
  type: "statement";
  recoveredByName: string;
  recoveredByAddress: string;
  recoveredOn: string;
  signedByName: string | null;
  signedOn: string | null;
  contractReference: string | null;
  /** A signed document is on file (fetched through its own route, never by key from the browser). */
  hasDocument: boolean;
  documentMime: string | null;
}

async function base(db: Knex, r: any, subjectType: string): Promise<DisposalBase> {
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchMassUnit: r.branch_mass_unit,
    applianceId: Number(r.appliance_id),
    applianceTag: r.appliance_tag,
    applianceDescription: r.appliance_description,
    applianceCategory: r.appliance_category,
    applianceRefrigerant: r.appliance_refrigerant,
    applianceFullChargeG: Number(r.appliance_full_charge_g),
    jobId: toNumOrNull(r.job_id),
    createdBy: Number(r.created_by),
    createdByName: r.created_by_name,
    createdAt: r.created_at,
    voidedAt: r.voided_at ?? null,
    voidReason: r.void_reason ?? null,
    amendments: await listAmendments(db, { organisationId: Number(r.organisation_id), subjectType, subjectId: Number(r.id) }),
  };
}

function detailQuery(db: Knex, table: string, id: number, scope: ScopeFn) {
  const q = db(`${table} as d`)
    .join("appliances as appliance", "appliance.id", "d.appliance_id")
    .join("branches as branch", "branch.id", "d.branch_id")
    .join("users as creator", "creator.id", "d.created_by")
    .where("d.id", id)
    .select(
      "d.*",
      "branch.name as branch_name",
      "branch.mass_unit as branch_mass_unit",
      "appliance.tag as appliance_tag",
      "appliance.description as appliance_description",
      "appliance.category as appliance_category",
      "appliance.refrigerant as appliance_refrigerant",
      "appliance.full_charge_g as appliance_full_charge_g",
      "creator.name as created_by_name",
    );
  scoped(q, scope, { recordedOn: table === "disposal_records" ? "d.disposed_on" : "d.recovered_on" });
  return q.first();
}

export async function getDisposalRecord(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<DisposalRecordDetail | undefined> {
  const r = await detailQuery(db, "disposal_records", opts.id, opts.scope);
  if (!r) return undefined;
  return {
    ...(await base(db, r, "DisposalRecord")),
    type: "record",
    disposedOn: r.disposed_on,
    disposalPath: r.disposal_path,
    companyName: r.company_name ?? null,
    applianceLocation: r.appliance_location ?? null,
    recoveredOn: r.recovered_on ?? null,
    recoveredByName: r.recovered_by_name ?? null,
    refrigerant: r.refrigerant ?? null,
    recoveredG: toNumOrNull(r.recovered_g),
    recoveredEntered:
      r.recovered_g === null ? null : enteredAmount(Number(r.recovered_g), toNumOrNull(r.recovered_entered), r.recovered_unit),
    sentTo: r.sent_to ?? null,
  };
}

export async function getDisposalStatement(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<DisposalStatementDetail | undefined> {
  const r = await detailQuery(db, "disposal_statements", opts.id, opts.scope);
  if (!r) return undefined;
  return {
    ...(await base(db, r, "DisposalStatement")),
    type: "statement",
    recoveredByName: r.recovered_by_name,
    recoveredByAddress: r.recovered_by_address,
    recoveredOn: r.recovered_on,
    signedByName: r.signed_by_name ?? null,
    signedOn: r.signed_on ?? null,
    contractReference: r.contract_reference ?? null,
    hasDocument: Boolean(r.document_file_key),
    documentMime: r.document_mime ?? null,
  };
}

/** Where a statement's signed document is stored, for the download route (after its permission check). */
export async function getStatementDocument(
  db: Knex,
  opts: { scope: ScopeFn; id: number },
): Promise<{ key: string; mime: string } | undefined> {
  const q = db("disposal_statements as d").where("d.id", opts.id).whereNotNull("d.document_file_key");
  scoped(q, opts.scope, { recordedOn: "d.recovered_on" });
  const r = await q.first("d.document_file_key", "d.document_mime");
  return r ? { key: r.document_file_key, mime: r.document_mime ?? "application/octet-stream" } : undefined;
}

/** Where a disposal record or statement belongs, for permission checks before a write. */
export async function getDisposalRef(
  db: Knex,
  opts: { organisationId: number; type: "record" | "statement"; id: number },
): Promise<{ id: number; organisationId: number; branchId: number } | undefined> {
  const r = await db(opts.type === "record" ? "disposal_records" : "disposal_statements")
    .where({ id: opts.id, organisation_id: opts.organisationId })
    .first("id", "organisation_id", "branch_id");
  return r ? { id: Number(r.id), organisationId: Number(r.organisation_id), branchId: Number(r.branch_id) } : undefined;
}

async function disposalAppliance(trx: Knex.Transaction, organisationId: number, applianceId: number) {
  const a = await trx("appliances")
    .where({ id: applianceId, organisation_id: organisationId })
    .first("id", "branch_id", "tag", "status", "refrigerant", "full_charge_g", "factory_sealed");
  if (!a) throw new RecordNotFoundError("That appliance does not exist", "applianceId");
  return a;
}

/** The disposal job a record or statement documents: on the same appliance and not voided. */
async function disposalJob(
  trx: Knex.Transaction,
  organisationId: number,
  applianceId: number,
  jobId: number | undefined,
): Promise<number | null> {
  if (jobId !== undefined) {
    const job = await trx("jobs")
      .where({ id: jobId, organisation_id: organisationId, appliance_id: applianceId })
      .whereIn("kind", ["disposal", "recovery"])
      .whereNull("voided_at")
      .first("id");
    if (!job) throw new RecordNotFoundError("That disposal job is not on record for this appliance", "jobId");
    return Number(job.id);
  }
  const latest = await trx("jobs")
    .where({ organisation_id: organisationId, appliance_id: applianceId, kind: "disposal" })
    .whereNull("voided_at")
    .orderBy([
      { column: "performed_on", order: "desc" },
      { column: "id", order: "desc" },
    ])
    .first("id");
  return latest ? Number(latest.id) : null;
}

function requireDisposed(appliance: { status: string; tag: string }) {
  if (appliance.status === "in_service") {
    throw new RecordConflictError(`${appliance.tag} is still in service: log its disposal job (with the recovery) first`, "applianceId");
  }
}

/** Records the 82.155(c) disposal record for an appliance; one live record per appliance. */
export async function createDisposalRecord(db: Knex, opts: { actor: ActorRef; input: DisposalRecordInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const appliance = await disposalAppliance(trx, actor.organisationId, input.applianceId);
    const branch = await writableBranch(trx, actor.organisationId, Number(appliance.branch_id));
    for (const [field, date, what] of [
      ["disposedOn", input.disposedOn, "The disposal date"],
      ["recoveredOn", input.recoveredOn, "The date of recovery"],
    ] as const)
      await assertRecordDate(trx, { organisationId: actor.organisationId, timeZone: branch.timeZone, date, field, what, now: opts.now });
    requireDisposed(appliance);
    const existing = await trx("disposal_records").where({ appliance_id: appliance.id }).whereNull("voided_at").first("id");
    if (existing)
      throw new RecordConflictError(
        `${appliance.tag} already has a disposal record (#${existing.id}); correct that one instead`,
        "applianceId",
      );
    const jobId = await disposalJob(trx, actor.organisationId, appliance.id, input.jobId);
    const grams = toGrams(input.recoveredAmount, input.recoveredUnit);
    const user = await trx("users").where({ id: actor.userId }).first("name");
    const [row] = await trx("disposal_records")
      .insert({
        organisation_id: actor.organisationId,
        branch_id: branch.id,
        appliance_id: appliance.id,
        job_id: jobId,
        disposed_on: input.disposedOn,
        disposal_path: input.disposalPath,
        company_name: input.companyName,
        appliance_location: input.applianceLocation,
        recovered_on: input.recoveredOn,
        recovered_by_user_id: actor.userId,
        recovered_by_name: user?.name ?? null,
        refrigerant: input.refrigerant,
        recovered_g: grams,
        recovered_entered: input.recoveredAmount,
        recovered_unit: input.recoveredUnit,
        sent_to: textOrNull(input.sentTo),
        created_by: actor.userId,
        created_at: at,
        updated_at: at,
      })
      .returning("id");
    const id = rowId(row);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch.id,
      action: "disposal_record.created",
      subjectType: "DisposalRecord",
      subjectId: id,
      at,
      summary: `Disposal record for ${appliance.tag}: ${describeMass(grams, branch.massUnit)} ${input.refrigerant} recovered on ${input.recoveredOn}`,
      data: { applianceId: appliance.id, jobId },
    });
    return id;
  });
}

/** Records a small appliance's signed statement, with its signed document's storage key if uploaded. */
export async function createDisposalStatement(
  db: Knex,
  opts: { actor: ActorRef; input: DisposalStatementInput; document?: { key: string; mime: string }; now?: Date },
): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const appliance = await disposalAppliance(trx, actor.organisationId, input.applianceId);
    const branch = await writableBranch(trx, actor.organisationId, Number(appliance.branch_id));
    for (const [field, date, what] of [
      ["recoveredOn", input.recoveredOn, "The date of recovery"],
      ["signedOn", input.signedOn, "The date signed"],
    ] as const)
      await assertRecordDate(trx, { organisationId: actor.organisationId, timeZone: branch.timeZone, date, field, what, now: opts.now });
    requireDisposed(appliance);
    const existing = await trx("disposal_statements").where({ appliance_id: appliance.id }).whereNull("voided_at").first("id");
    if (existing)
      throw new RecordConflictError(
        `${appliance.tag} already has a signed statement (#${existing.id}); correct that one instead`,
        "applianceId",
      );
    const jobId = await disposalJob(trx, actor.organisationId, appliance.id, input.jobId);
    const [row] = await trx("disposal_statements")
      .insert({
        organisation_id: actor.organisationId,
        branch_id: branch.id,
        appliance_id: appliance.id,
        job_id: jobId,
        recovered_by_name: input.recoveredByName,
        recovered_by_address: input.recoveredByAddress,
        recovered_on: input.recoveredOn,
        signed_by_name: input.signedByName,
        signed_on: input.signedOn,
        contract_reference: textOrNull(input.contractReference),
        document_file_key: opts.document?.key ?? null,
        document_mime: opts.document?.mime ?? null,
        created_by: actor.userId,
        created_at: at,
        updated_at: at,
      })
      .returning("id");
    const id = rowId(row);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch.id,
      action: "disposal_statement.created",
      subjectType: "DisposalStatement",
      subjectId: id,
      at,
      summary: `Signed statement for ${appliance.tag}: refrigerant recovered by ${input.recoveredByName} on ${input.recoveredOn}${opts.document ? " (signed document attached)" : ""}`,
      data: { applianceId: appliance.id, jobId, document: Boolean(opts.document) },
    });
    return id;
  });
}

const RECORD_COLUMNS: Record<string, string> = {
  disposedOn: "disposed_on",
  companyName: "company_name",
  applianceLocation: "appliance_location",
  recoveredOn: "recovered_on",
  refrigerant: "refrigerant",
  sentTo: "sent_to",
};
const STATEMENT_COLUMNS: Record<string, string> = {
  recoveredByName: "recovered_by_name",
  recoveredByAddress: "recovered_by_address",
  recoveredOn: "recovered_on",
  signedByName: "signed_by_name",
  signedOn: "signed_on",
  contractReference: "contract_reference",
};

function columns(changes: Record<string, unknown>, map: Record<string, string>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [field, column] of Object.entries(map)) if (changes[field] !== undefined) out[column] = changes[field];
  return out;
}

export async function amendDisposalRecord(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: DisposalRecordAmendmentInput; now?: Date },
): Promise<number> {
  const { actor, input } = opts;
  return db.transaction(async (trx) => {
    const row = await trx("disposal_records as d")
      .join("appliances as a", "a.id", "d.appliance_id")
      .join("branches as b", "b.id", "d.branch_id")
      .where({ "d.id": opts.id, "d.organisation_id": actor.organisationId })
      .first("a.tag", "b.time_zone");
    if (!row) throw new RecordNotFoundError("No such disposal record");
    for (const [field, what] of [
      ["disposedOn", "The disposal date"],
      ["recoveredOn", "The date of recovery"],
    ] as const) {
      const date = input.changes[field];
      if (date !== undefined)
        await assertRecordDate(trx, {
          organisationId: actor.organisationId,
          timeZone: String(row.time_zone),
          date,
          field: `changes.${field}`,
          what,
          now: opts.now,
        });
    }
    const changes = columns(input.changes, RECORD_COLUMNS);
    if (input.changes.recoveredAmount !== undefined && input.changes.recoveredUnit) {
      changes.recovered_g = toGrams(input.changes.recoveredAmount, input.changes.recoveredUnit);
      changes.recovered_entered = input.changes.recoveredAmount;
      changes.recovered_unit = input.changes.recoveredUnit;
    }
    return amendRecord(trx, {
      table: "disposal_records",
      subjectType: "DisposalRecord",
      id: opts.id,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: input.reason,
      changes,
      summary: `Corrected the disposal record of ${row.tag}`,
      at: (opts.now ?? new Date()).toISOString(),
    });
  });
}

export async function amendDisposalStatement(
  db: Knex,
  opts: {
    actor: ActorRef;
    id: number;
    /** The changes may be empty when a signed document is attached. */
    input: { reason: string; changes: Partial<DisposalStatementAmendmentInput["changes"]> };
    document?: { key: string; mime: string };
    now?: Date;
  },
): Promise<number> {
  const { actor, input } = opts;
  return db.transaction(async (trx) => {
    const row = await trx("disposal_statements as d")
      .join("appliances as a", "a.id", "d.appliance_id")
      .join("branches as b", "b.id", "d.branch_id")
      .where({ "d.id": opts.id, "d.organisation_id": actor.organisationId })
      .first("a.tag", "d.recovered_on", "d.signed_on", "b.time_zone");
    if (!row) throw new RecordNotFoundError("No such signed statement");
    for (const [field, what] of [
      ["recoveredOn", "The date of recovery"],
      ["signedOn", "The date signed"],
    ] as const) {
      const date = input.changes[field];
      if (date !== undefined)
        await assertRecordDate(trx, {
          organisationId: actor.organisationId,
          timeZone: String(row.time_zone),
          date,
          field: `changes.${field}`,
          what,
          now: opts.now,
        });
    }
    const changes = columns(input.changes, STATEMENT_COLUMNS);
    if (opts.document) {
      changes.document_file_key = opts.document.key;
      changes.document_mime = opts.document.mime;
    }
    const recoveredOn = (changes.recovered_on as string | undefined) ?? row.recovered_on;
    const signedOn = (changes.signed_on as string | undefined) ?? row.signed_on;
    if (signedOn && recoveredOn && signedOn < recoveredOn)
      throw new RecordConflictError("The statement is signed on or after the date of recovery", "changes.signedOn");
    return amendRecord(trx, {
      table: "disposal_statements",
      subjectType: "DisposalStatement",
      id: opts.id,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: input.reason,
      changes,
      summary: opts.document
        ? `Attached the signed document to the statement of ${row.tag}`
        : `Corrected the signed statement of ${row.tag}`,
      at: (opts.now ?? new Date()).toISOString(),
    });
  });
}

export async function voidDisposal(
  db: Knex,
  opts: { actor: ActorRef; type: "record" | "statement"; id: number; reason: string; now?: Date },
): Promise<void> {
  const table = opts.type === "record" ? "disposal_records" : "disposal_statements";
  await db.transaction(async (trx) => {
    const row = await trx(`${table} as d`)
      .join("appliances as a", "a.id", "d.appliance_id")
      .where({ "d.id": opts.id, "d.organisation_id": opts.actor.organisationId })
      .first("a.tag");
    if (!row) throw new RecordNotFoundError(opts.type === "record" ? "No such disposal record" : "No such signed statement");
    await voidRecord(trx, {
      table,
      subjectType: opts.type === "record" ? "DisposalRecord" : "DisposalStatement",
      id: opts.id,
      organisationId: opts.actor.organisationId,
      actorId: opts.actor.userId,
      reason: opts.reason,
      summary: `Voided the ${opts.type === "record" ? "disposal record" : "signed statement"} of ${row.tag}: ${opts.reason.trim()}`,
      at: (opts.now ?? new Date()).toISOString(),
    });
  });
}

export interface MonthlyDisposalTotals {
  year: number;
  branchId: number;
  massUnit: MassDisplayUnit;
  /** 82.155(c)(2): refrigerant recovered from disposed appliances of more than 5 and less than 50 lb, by month and type. */
  recovered: { month: string; refrigerant: string; recoveredG: number; appliances: number }[];
  /** 82.155(c)(3): refrigerant transferred for reclamation, by month, type and reclaimer, with the date. */
  transfers: { shipmentId: number; shippedOn: string; month: string; refrigerant: string; shippedG: number; reclaimer: string }[];
}

const FIVE_LB_G = toGrams(5, "lb");
const FIFTY_LB_G = toGrams(50, "lb");

/**
 * The monthly quantities a disposal log keeps for one branch and year. The caller checks that the
 * person may read the branch's disposals. `substr` exists in SQLite and PostgreSQL alike.
 */
export async function monthlyDisposalTotals(
  db: Knex,
  opts: { organisationId: number; branchId: number; year: number },
): Promise<MonthlyDisposalTotals> {
  const branch = await db("branches").where({ id: opts.branchId, organisation_id: opts.organisationId }).first("id", "mass_unit");
  if (!branch) throw new RecordNotFoundError("That branch does not exist", "branchId");
  const from = `${opts.year}-01-01`;
  const to = `${opts.year}-12-31`;
  const recovered = await db("jobs as j")
    .join("appliances as a", "a.id", "j.appliance_id")
    .where({ "j.organisation_id": opts.organisationId, "j.branch_id": opts.branchId, "j.kind": "disposal" })
    .whereNull("j.voided_at")
    .whereBetween("j.performed_on", [from, to])
    .where("a.full_charge_g", ">", FIVE_LB_G)
    .where("a.full_charge_g", "<", FIFTY_LB_G)
    .groupByRaw("substr(j.performed_on, 1, 7), j.refrigerant")
    .orderByRaw("substr(j.performed_on, 1, 7), j.refrigerant")
    .select(
      db.raw("substr(j.performed_on, 1, 7) as month"),
      "j.refrigerant",
      db.raw("sum(j.recovered_g) as recovered_g"),
      db.raw("count(*) as appliances"),
    );
  const transfers = await db("reclaim_shipment_lines as l")
    .join("reclaim_shipments as s", "s.id", "l.shipment_id")
    .where({ "s.organisation_id": opts.organisationId, "s.branch_id": opts.branchId })
    .whereNull("s.voided_at")
    .whereBetween("s.shipped_on", [from, to])
    .groupBy("s.id", "s.shipped_on", "s.reclaimer_name", "l.refrigerant")
    .orderBy([{ column: "s.shipped_on" }, { column: "s.id" }, { column: "l.refrigerant" }])
    .select("s.id", "s.shipped_on", "s.reclaimer_name", "l.refrigerant", db.raw("sum(l.mass_g) as shipped_g"));
  return {
    year: opts.year,
    branchId: opts.branchId,
    massUnit: branch.mass_unit,
    recovered: recovered.map((r) => ({
      month: String(r.month),
      refrigerant: r.refrigerant,
      recoveredG: Number(r.recovered_g),
      appliances: Number(r.appliances),
    })),
    transfers: transfers.map((r) => ({
      shipmentId: Number(r.id),
      shippedOn: r.shipped_on,
      month: String(r.shipped_on).slice(0, 7),
      refrigerant: r.refrigerant,
      shippedG: Number(r.shipped_g),
      reclaimer: r.reclaimer_name,
    })),
  };
}

export interface ShopQueueRow {
  id: number;
  branchId: number;
  branchName: string;
  massUnit: MassDisplayUnit;
  tag: string;
  description: string;
  category: ApplianceCategory;
  refrigerant: string;
  fullChargeG: number;
  smallAppliance: boolean;
  retiredOn: string | null;
  awaitingAtShop: boolean;
  /** What the disposal will need beside the recovery. */
  needs: "statement" | "record";
}

/**
 * Retired appliances not yet disposed of: the units waiting at the shop to be scrapped come first.
 * The scope sees the table as `appliances`.
 */
export async function listShopQueue(db: Knex, opts: { scope: ScopeFn; branchId?: number; limit?: number }): Promise<ShopQueueRow[]> {
  const q = db("appliances as appliances")
    .join("branches as branch", "branch.id", "appliances.branch_id")
    .where("appliances.status", "retired");
  scoped(q, opts.scope);
  if (opts.branchId) q.where("appliances.branch_id", opts.branchId);
  q.orderBy("appliances.awaiting_disposal_at_shop", "desc");
  orderByNullable(q, "appliances.retired_on", "asc"); // a retired unit may lack its date; sorts as in SQLite in both dialects
  const rows = await q
    .orderBy("appliances.tag")
    .limit(opts.limit ?? 100)
    .select(
      "appliances.id",
      "appliances.branch_id",
      "branch.name as branch_name",
      "branch.mass_unit",
      "appliances.tag",
      "appliances.description",
      "appliances.category",
      "appliances.refrigerant",
      "appliances.full_charge_g",
      "appliances.factory_sealed",
      "appliances.retired_on",
      "appliances.awaiting_disposal_at_shop",
    );
  return rows.map((r) => {
    const small = isSmallAppliance({ fullChargeG: Number(r.full_charge_g), factorySealed: toBool(r.factory_sealed) });
    return {
      id: Number(r.id),
      branchId: Number(r.branch_id),
      branchName: r.branch_name,
      massUnit: r.mass_unit,
      tag: r.tag,
      description: r.description,
      category: r.category,
      refrigerant: r.refrigerant,
      fullChargeG: Number(r.full_charge_g),
      smallAppliance: small,
      retiredOn: r.retired_on ?? null,
      awaitingAtShop: toBool(r.awaiting_disposal_at_shop),
      needs: small ? "statement" : "record",
    };
  });
}

export interface ShopBatchResult {
  jobIds: number[];
  recordIds: number[];
  statementIds: number[];
}

/**
 * The quick path for retired units at the shop: for each picked appliance, a disposal job (the
 * recovery into the chosen cylinder) and its record (more than 5 lb) or signed statement (small
 * appliance, signed by the technician who confirms the recovery). All or nothing: one transaction.
 */
export async function recordShopDisposals(
  db: Knex,
  opts: { actor: ActorRef; branchId: number; input: ShopDisposalBatchInput; now?: Date },
): Promise<ShopBatchResult> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const branch = await writableBranch(trx, actor.organisationId, opts.branchId);
    const org = await trx("organisations").where({ id: actor.organisationId }).first("name");
    const user = await trx("users").where({ id: actor.userId }).first("name");
    const result: ShopBatchResult = { jobIds: [], recordIds: [], statementIds: [] };
    for (const [i, item] of input.items.entries()) {
      const field = (name: string) => `items.${i}.${name}`;
      const a = await trx("appliances as a")
        .leftJoin("sites as s", "s.id", "a.site_id")
        .leftJoin("customers as c", "c.id", "s.customer_id")
        .where({ "a.id": item.applianceId, "a.organisation_id": actor.organisationId })
        .first(
          "a.id",
          "a.branch_id",
          "a.tag",
          "a.status",
          "a.refrigerant",
          "a.full_charge_g",
          "a.factory_sealed",
          "c.name as customer_name",
        );
      if (!a) throw new RecordNotFoundError("That appliance does not exist", field("applianceId"));
      if (Number(a.branch_id) !== branch.id) throw new RecordConflictError(`${a.tag} belongs to another branch`, field("applianceId"));
      if (a.status !== "retired")
        throw new RecordConflictError(
          `${a.tag} is not waiting to be scrapped (status: ${String(a.status).replace("_", " ")})`,
          field("applianceId"),
        );
      let job;
      try {
        job = await insertJob(trx, {
          actor,
          branch,
          at,
          input: {
            kind: "disposal",
            applianceId: Number(a.id),
            performedOn: input.performedOn,
            refrigerant: a.refrigerant,
            recoveredAmount: item.recoveredAmount,
            recoveredUnit: item.recoveredUnit,
            cylinderId: input.cylinderId,
            equipmentId: input.equipmentId,
            evacuationValue: item.evacuationValue,
            evacuationUnit: item.evacuationUnit,
            accessMethod: input.accessMethod,
            temporaryAccessRemoved: input.temporaryAccessRemoved ?? null,
            compressorOperating: item.compressorOperating ?? null,
            notes: "Scrapped at the shop",
            disposalPath: "shop",
            confirmOverFill: input.confirmOverFill,
          },
          now: opts.now,
        });
      } catch (err) {
        // Name the row whose amount overflowed a cylinder, rather than the whole batch.
        if (err instanceof RecordConflictError && err.field === "recoveredAmount")
          throw new RecordConflictError(`${a.tag}: ${err.message}`, field("recoveredAmount"));
        if (err instanceof InvalidInputError && err.field === "recoveredAmount")
          throw new InvalidInputError(`${a.tag}: ${err.message}`, field("recoveredAmount"));
        throw err;
      }
      result.jobIds.push(job.id);
      const grams = toGrams(item.recoveredAmount, item.recoveredUnit);
      const small = isSmallAppliance({ fullChargeG: Number(a.full_charge_g), factorySealed: toBool(a.factory_sealed) });
      if (small) {
        const [row] = await trx("disposal_statements")
          .insert({
            organisation_id: actor.organisationId,
            branch_id: branch.id,
            appliance_id: a.id,
            job_id: job.id,
            recovered_by_name: user?.name ?? "",
            recovered_by_address: branch.address ?? branch.name,
            recovered_on: input.performedOn,
            signed_by_name: user?.name ?? null,
            signed_on: input.performedOn,
            created_by: actor.userId,
            created_at: at,
            updated_at: at,
          })
          .returning("id");
        const id = rowId(row);
        result.statementIds.push(id);
        await appendActivity(trx, {
          organisationId: actor.organisationId,
          actorId: actor.userId,
          branchId: branch.id,
          action: "disposal_statement.created",
          subjectType: "DisposalStatement",
          subjectId: id,
          at,
          summary: `Signed statement for ${a.tag}: refrigerant recovered by ${user?.name ?? "the technician"} on ${input.performedOn} at the shop`,
          data: { applianceId: Number(a.id), jobId: job.id },
        });
      } else {
        const [row] = await trx("disposal_records")
          .insert({
            organisation_id: actor.organisationId,
            branch_id: branch.id,
            appliance_id: a.id,
            job_id: job.id,
            disposed_on: input.performedOn,
            disposal_path: "shop",
            company_name: a.customer_name ?? org?.name ?? null,
            appliance_location: branch.address ?? branch.name,
            recovered_on: input.performedOn,
            recovered_by_user_id: actor.userId,
            recovered_by_name: user?.name ?? null,
            refrigerant: a.refrigerant,
            recovered_g: grams,
            sent_to: textOrNull(input.sentTo),
            created_by: actor.userId,
            created_at: at,
            updated_at: at,
          })
          .returning("id");
        const id = rowId(row);
        result.recordIds.push(id);
        await appendActivity(trx, {
          organisationId: actor.organisationId,
          actorId: actor.userId,
          branchId: branch.id,
          action: "disposal_record.created",
          subjectType: "DisposalRecord",
          subjectId: id,
          at,
          summary: `Disposal record for ${a.tag}: ${describeMass(grams, branch.massUnit)} ${a.refrigerant} recovered at the shop on ${input.performedOn}`,
          data: { applianceId: Number(a.id), jobId: job.id },
        });
      }
    }
    return result;
  });
}
