import type { Knex } from "knex";
import {
  IMPORT_FIELDS,
  IMPORT_KIND_LABELS,
  checkImportMapping,
  toLocalDate,
  type ImportIssuesQuery,
  type ImportKind,
  type ImportListQuery,
  type ImportMapping,
  type ImportState,
  type MassDisplayUnit,
} from "@coldtrail/core";
import { recordsBeginOn } from "../records/common";
import { appendActivity, rowId } from "../activity";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import type { ActorRef, ScopeFn } from "../types";
import { createRowProcessor, type ImportBranch, type RowOutcome } from "./row-processor";

/**
 * Spreadsheet imports, in steps the page follows:
 * 1. `createImport`: the file is stored (by the app) and its headings and first rows recorded, with
 *    a suggested column mapping; state `mapping`.
 * 2. `setImportMapping`: the person confirms the mapping; state `checking`.
 * 3. `checkImportRows` (background): every row is read, checked and its problems recorded
 *    (row, field, why); progress is written as it goes; state `checked` (or `failed`).
 * 4. `commitImportRows` (background): the rows are read again, checked again against the records
 *    as they are now, and the valid ones written in ONE transaction with their activity rows;
 *    state `imported`. Any failure rolls everything back: state `failed`, nothing written.
 * The file's rows arrive as an async iterable the app reads from the stored file (XLSX or CSV), so
 * the database layer never holds a whole file.
 */

/** One row of the spreadsheet: its number as the spreadsheet shows it, and its cells' text. */
export interface SheetRow {
  rowNumber: number;
  cells: string[];
}

export interface RowSource {
  rows: AsyncIterable<SheetRow>;
  /** How much of the file has been read, 0–1 (for the progress bar). */
  fraction?: () => number;
}

/** A problem with the file itself (damaged, unreadable): its message is shown as is. */
export class ImportFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ImportFileError";
  }
}

export interface ImportProgress {
  importId: number;
  state: "checking" | "importing";
  rowsRead: number;
  validRows: number;
  invalidRows: number;
  /** 0–100 */
  progress: number;
}

export const IMPORT_MAX_ROWS = 1_000_000;
/** Problems kept per import for the preview; the counts stay exact beyond it. */
export const IMPORT_MAX_STORED_ISSUES = 100_000;
const PREVIEW_ROWS = 25;
const BATCH = 250;

export interface ImportRef {
  id: number;
  organisationId: number;
  branchId: number;
  kind: ImportKind;
  state: ImportState;
  createdBy: number;
}

export interface ImportPreviewRow {
  rowNumber: number;
  ok: boolean;
  summary: string;
  issues: Array<{ field: string | null; message: string }>;
}

export interface ImportDetail extends ImportRef {
  branchName: string;
  branchMassUnit: MassDisplayUnit;
  fileLabel: string;
  fileFormat: "xlsx" | "csv";
  fileSize: number;
  headings: string[];
  sample: string[][];
  mapping: ImportMapping | null;
  preview: ImportPreviewRow[];
  totalRows: number;
  validRows: number;
  invalidRows: number;
  importedRows: number;
  progress: number;
  progressNote: string | null;
  error: string | null;
  createdByName: string;
  createdAt: string;
  updatedAt: string;
  checkedAt: string | null;
  finishedAt: string | null;
}

export interface ImportListRow {
  id: number;
  kind: ImportKind;
  state: ImportState;
  branchId: number;
  branchName: string;
  fileLabel: string;
  totalRows: number;
  validRows: number;
  invalidRows: number;
  importedRows: number;
  progress: number;
  createdByName: string;
  createdAt: string;
}

const parseJson = <T>(text: string | null | undefined, fallback: T): T => {
  if (!text) return fallback;
  try {
    return JSON.parse(text) as T;
  } catch {
    return fallback;
  }
};

/** Records an uploaded file waiting for its column mapping; returns the import id. */
export async function createImport(
  db: Knex,
  opts: {
    actor: ActorRef;
    branchId: number;
    kind: ImportKind;
    file: { key: string; format: "xlsx" | "csv"; label: string; size: number };
    headings: string[];
    sample: string[][];
    mapping: ImportMapping;
    now?: Date;
  },
): Promise<number> {
  const { actor } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const branch = await trx("branches")
      .where({ id: opts.branchId, organisation_id: actor.organisationId })
      .first("id", "name", "archived_at");
    if (!branch) throw new RecordNotFoundError("That branch does not exist", "branchId");
    if (branch.archived_at) throw new RecordConflictError("That branch is archived", "branchId");
    const [row] = await trx("imports")
      .insert({
        organisation_id: actor.organisationId,
        branch_id: opts.branchId,
        kind: opts.kind,
        state: "mapping",
        file_key: opts.file.key,
        file_format: opts.file.format,
        file_label: opts.file.label.slice(0, 200),
        file_size: opts.file.size,
        headings: JSON.stringify(opts.headings),
        sample: JSON.stringify(opts.sample),
        mapping: JSON.stringify(opts.mapping),
        preview: JSON.stringify([]),
        created_by: actor.userId,
        created_at: at,
        updated_at: at,
      })
      .returning("id");
    const id = rowId(row);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: opts.branchId,
      action: "import.uploaded",
      subjectType: "Import",
      subjectId: id,
      summary: `Uploaded a spreadsheet of ${IMPORT_KIND_LABELS[opts.kind].toLowerCase()} (${opts.file.label}) to import into ${branch.name}`,
      data: { format: opts.file.format, size: opts.file.size, columns: opts.headings.length },
      at,
    });
    return id;
  });
}

export async function getImportRef(db: Knex, opts: { organisationId: number; id: number }): Promise<ImportRef | undefined> {
  const r = await db("imports")
    .where({ id: opts.id, organisation_id: opts.organisationId })
    .first("id", "organisation_id", "branch_id", "kind", "state", "created_by");
  if (!r) return undefined;
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    kind: r.kind,
    state: r.state,
    createdBy: Number(r.created_by),
  };
}

/** One import the scope allows (the scope sees the table as `imports`). */
export async function getImport(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<ImportDetail | undefined> {
  const qb = db("imports as imports")
    .join("branches as branch", "branch.id", "imports.branch_id")
    .join("users as creator", "creator.id", "imports.created_by")
    .where("imports.id", opts.id)
    .where(function scoped(this: Knex.QueryBuilder) {
      opts.scope(this);
    });
  const r = await qb.first(
    "imports.*",
    "branch.name as branch_name",
    "branch.mass_unit as branch_mass_unit",
    "creator.name as creator_name",
  );
  if (!r) return undefined;
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchMassUnit: r.branch_mass_unit,
    kind: r.kind,
    state: r.state,
    createdBy: Number(r.created_by),
    createdByName: r.creator_name,
    fileLabel: r.file_label,
    fileFormat: r.file_format,
    fileSize: Number(r.file_size),
    headings: parseJson<string[]>(r.headings, []),
    sample: parseJson<string[][]>(r.sample, []),
    mapping: parseJson<ImportMapping | null>(r.mapping, null),
    preview: parseJson<ImportPreviewRow[]>(r.preview, []),
    totalRows: Number(r.total_rows),
    validRows: Number(r.valid_rows),
    invalidRows: Number(r.invalid_rows),
    importedRows: Number(r.imported_rows),
    progress: Number(r.progress),
    progressNote: r.progress_note ?? null,
    error: r.error ?? null,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    checkedAt: r.checked_at ?? null,
    finishedAt: r.finished_at ?? null,
  };
}

/** Where the stored file is, for the background steps. */
export async function getImportFile(
  db: Knex,
  opts: { id: number },
): Promise<{ key: string; format: "xlsx" | "csv"; size: number } | undefined> {
  const r = await db("imports").where({ id: opts.id }).first("file_key", "file_format", "file_size");
  return r ? { key: r.file_key, format: r.file_format, size: Number(r.file_size) } : undefined;
}

/** One page of the imports the scope allows, newest first. */
export async function listImports(
  db: Knex,
  opts: { scope: ScopeFn; query: ImportListQuery },
): Promise<{ rows: ImportListRow[]; total: number; page: number; pageSize: number }> {
  const { query } = opts;
  const base = () =>
    db("imports as imports").where(function scoped(this: Knex.QueryBuilder) {
      opts.scope(this);
    });
  const total = Number((await base().count({ n: "*" }).first())?.n ?? 0);
  const rows = await base()
    .join("branches as branch", "branch.id", "imports.branch_id")
    .join("users as creator", "creator.id", "imports.created_by")
    .orderBy([
      { column: "imports.created_at", order: "desc" },
      { column: "imports.id", order: "desc" },
    ])
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .select("imports.*", "branch.name as branch_name", "creator.name as creator_name");
  return {
    rows: rows.map((r) => ({
      id: Number(r.id),
      kind: r.kind,
      state: r.state,
      branchId: Number(r.branch_id),
      branchName: r.branch_name,
      fileLabel: r.file_label,
      totalRows: Number(r.total_rows),
      validRows: Number(r.valid_rows),
      invalidRows: Number(r.invalid_rows),
      importedRows: Number(r.imported_rows),
      progress: Number(r.progress),
      createdByName: r.creator_name,
      createdAt: r.created_at,
    })),
    total,
    page: query.page,
    pageSize: query.pageSize,
  };
}

export interface ImportIssueRow {
  id: number;
  rowNumber: number;
  field: string | null;
  fieldLabel: string | null;
  columnLabel: string | null;
  value: string | null;
  message: string;
}

/** One page of the problems found in an import's rows, in row order. */
export async function listImportIssues(
  db: Knex,
  opts: { organisationId: number; importId: number; kind: ImportKind; query: ImportIssuesQuery },
): Promise<{ rows: ImportIssueRow[]; total: number; page: number; pageSize: number }> {
  const base = () => db("import_row_issues").where({ import_id: opts.importId, organisation_id: opts.organisationId });
  const total = Number((await base().count({ n: "*" }).first())?.n ?? 0);
  const labels = new Map(IMPORT_FIELDS[opts.kind].map((f) => [f.key, f.label]));
  const rows = await base()
    .orderBy([{ column: "row_number" }, { column: "id" }])
    .limit(opts.query.pageSize)
    .offset((opts.query.page - 1) * opts.query.pageSize)
    .select("id", "row_number", "field", "column_label", "value", "message");
  return {
    rows: rows.map((r) => ({
      id: Number(r.id),
      rowNumber: Number(r.row_number),
      field: r.field ?? null,
      fieldLabel: r.field ? (labels.get(r.field) ?? r.field) : null,
      columnLabel: r.column_label ?? null,
      value: r.value ?? null,
      message: r.message,
    })),
    total,
    page: opts.query.page,
    pageSize: opts.query.pageSize,
  };
}

async function touchImport(db: Knex | Knex.Transaction, id: number, values: Record<string, unknown>): Promise<void> {
  await db("imports")
    .where({ id })
    .update({ ...values, updated_at: new Date().toISOString() });
}

/**
 * Confirms the column mapping and queues the check (state `checking`). Allowed while the import
 * waits for its mapping, or after a check (to change the mapping) or a failure.
 */
export async function setImportMapping(db: Knex, opts: { actor: ActorRef; id: number; mapping: ImportMapping; now?: Date }): Promise<void> {
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const r = await trx("imports")
      .where({ id: opts.id, organisation_id: opts.actor.organisationId })
      .first("id", "kind", "state", "headings", "branch_id");
    if (!r) throw new RecordNotFoundError("No such import");
    if (!["mapping", "checked", "failed"].includes(r.state)) {
      throw new RecordConflictError(
        r.state === "imported" ? "This file was already imported" : "This import is busy or closed; wait for it or start a new one",
      );
    }
    const kind = r.kind as ImportKind;
    const headings = parseJson<string[]>(r.headings, []);
    const mapping: ImportMapping = {};
    for (const field of IMPORT_FIELDS[kind]) mapping[field.key] = opts.mapping[field.key] ?? null;
    for (const key of Object.keys(opts.mapping)) if (!(key in mapping)) mapping[key] = opts.mapping[key] ?? null;
    const problems = checkImportMapping(kind, mapping, headings.length);
    if (problems.length > 0) throw new InvalidInputError(problems[0]!.message, `mapping.${problems[0]!.field}`);

    await trx("import_row_issues").where({ import_id: r.id }).delete();
    await trx("imports")
      .where({ id: r.id })
      .update({
        mapping: JSON.stringify(mapping),
        state: "checking",
        preview: JSON.stringify([]),
        total_rows: 0,
        valid_rows: 0,
        invalid_rows: 0,
        progress: 0,
        progress_note: "Waiting to start",
        error: null,
        checked_at: null,
        updated_at: at,
      });
    await appendActivity(trx, {
      organisationId: opts.actor.organisationId,
      actorId: opts.actor.userId,
      branchId: Number(r.branch_id),
      action: "import.mapped",
      subjectType: "Import",
      subjectId: Number(r.id),
      summary: `Chose the columns of a spreadsheet of ${IMPORT_KIND_LABELS[kind].toLowerCase()} and started checking its rows`,
      data: { mapping },
      at,
    });
  });
}

/** Cancels an import that has not been written (nothing is imported). */
export async function cancelImport(db: Knex, opts: { actor: ActorRef; id: number; now?: Date }): Promise<void> {
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const r = await trx("imports")
      .where({ id: opts.id, organisation_id: opts.actor.organisationId })
      .first("id", "state", "branch_id", "kind");
    if (!r) throw new RecordNotFoundError("No such import");
    if (!["mapping", "checking", "checked", "failed"].includes(r.state)) {
      throw new RecordConflictError(r.state === "imported" ? "This file was already imported" : "This import cannot be cancelled now");
    }
    await trx("imports").where({ id: r.id }).update({ state: "cancelled", progress_note: null, updated_at: at, finished_at: at });
    await appendActivity(trx, {
      organisationId: opts.actor.organisationId,
      actorId: opts.actor.userId,
      branchId: Number(r.branch_id),
      action: "import.cancelled",
      subjectType: "Import",
      subjectId: Number(r.id),
      summary: `Cancelled the import of a spreadsheet of ${IMPORT_KIND_LABELS[r.kind as ImportKind].toLowerCase()}; nothing was imported`,
      at,
    });
  });
}

/** Marks an import failed with a plain-words reason (nothing was imported). */
export async function failImport(db: Knex, opts: { id: number; message: string }): Promise<void> {
  const r = await db("imports").where({ id: opts.id }).first("id", "organisation_id", "branch_id", "state", "created_by");
  if (!r || r.state === "imported" || r.state === "cancelled") return;
  const at = new Date().toISOString();
  await db.transaction(async (trx) => {
    await trx("imports")
      .where({ id: r.id })
      .update({ state: "failed", error: opts.message, progress_note: null, updated_at: at, finished_at: at });
    await appendActivity(trx, {
      organisationId: Number(r.organisation_id),
      actorId: null,
      branchId: Number(r.branch_id),
      action: "import.failed",
      subjectType: "Import",
      subjectId: Number(r.id),
      summary: `An import stopped: ${opts.message}`,
      at,
    });
  });
}

/**
 * Marks `checking`/`importing` imports whose work is no longer running (the server restarted) as
 * failed, so nobody waits forever. `running` holds the ids this process is working on.
 */
export async function failAbandonedImports(
  db: Knex,
  opts: { running: ReadonlySet<number>; olderThanMs: number; ids?: number[] },
): Promise<number> {
  const before = new Date(Date.now() - opts.olderThanMs).toISOString();
  const q = db("imports").whereIn("state", ["checking", "importing"]).where("updated_at", "<", before);
  if (opts.ids) q.whereIn("id", opts.ids);
  const stale = (await q.select("id")).map((r) => Number(r.id)).filter((id) => !opts.running.has(id));
  for (const id of stale)
    await failImport(db, {
      id,
      message: "The work on this file was interrupted (the server restarted). Nothing was imported; start the check again.",
    });
  return stale.length;
}

// -------------------------------------------------------------------------------- the row passes

interface PassContext {
  importId: number;
  organisationId: number;
  kind: ImportKind;
  branch: ImportBranch;
  mapping: ImportMapping;
  headings: string[];
}

async function loadPassContext(db: Knex | Knex.Transaction, importId: number): Promise<PassContext> {
  const r = await db("imports as i")
    .join("branches as b", "b.id", "i.branch_id")
    .where("i.id", importId)
    .first("i.*", "b.name as branch_name", "b.mass_unit", "b.time_zone");
  if (!r) throw new RecordNotFoundError("No such import");
  const mapping = parseJson<ImportMapping | null>(r.mapping, null);
  if (!mapping) throw new RecordConflictError("Choose the columns first");
  return {
    importId: Number(r.id),
    organisationId: Number(r.organisation_id),
    kind: r.kind,
    branch: {
      id: Number(r.branch_id),
      name: r.branch_name,
      massUnit: r.mass_unit,
      timeZone: r.time_zone,
      today: toLocalDate(new Date(), r.time_zone),
      recordsBeginOn: await recordsBeginOn(db, Number(r.organisation_id)),
    },
    mapping,
    headings: parseJson<string[]>(r.headings, []),
  };
}

function cellsFor(mapping: ImportMapping, cells: string[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, column] of Object.entries(mapping)) out[key] = column === null || column === undefined ? "" : (cells[column] ?? "");
  return out;
}

const isBlankRow = (cells: string[]) => cells.every((c) => c === undefined || c === null || String(c).trim() === "");

interface PassTotals {
  rowsRead: number;
  valid: number;
  invalid: number;
  storedIssues: number;
  preview: ImportPreviewRow[];
}

/**
 * Reads every row, checks it and (when `write`) writes the valid ones. Issues are stored in batches
 * through `store`. Returns the totals.
 */
async function runPass(
  q: Knex | Knex.Transaction,
  ctx: PassContext,
  source: RowSource,
  opts: {
    write: boolean;
    actor: ActorRef;
    at: string;
    onBatch: (totals: PassTotals) => Promise<boolean | void>;
    store: (issues: Array<Record<string, unknown>>) => Promise<void>;
  },
): Promise<PassTotals> {
  const processor = createRowProcessor(ctx.kind, q, {
    organisationId: ctx.organisationId,
    branch: ctx.branch,
    actor: opts.actor,
    at: opts.at,
    importId: ctx.importId,
  });
  const totals: PassTotals = { rowsRead: 0, valid: 0, invalid: 0, storedIssues: 0, preview: [] };
  let batch: SheetRow[] = [];

  const flush = async (): Promise<boolean> => {
    if (batch.length === 0) return true;
    const items = batch.map((row) => ({ rowNumber: row.rowNumber, cells: cellsFor(ctx.mapping, row.cells), raw: row.cells }));
    batch = [];
    const outcomes: RowOutcome[] = await processor.process(items, { write: opts.write });
    const issueRows: Array<Record<string, unknown>> = [];
    for (const [i, outcome] of outcomes.entries()) {
      if (outcome.issues.length === 0) totals.valid++;
      else totals.invalid++;
      if (totals.preview.length < PREVIEW_ROWS) {
        totals.preview.push({
          rowNumber: outcome.rowNumber,
          ok: outcome.issues.length === 0,
          summary: outcome.summary,
          issues: outcome.issues,
        });
      }
      for (const issue of outcome.issues) {
        if (totals.storedIssues >= IMPORT_MAX_STORED_ISSUES) break;
        totals.storedIssues++;
        const column = issue.field ? ctx.mapping[issue.field] : null;
        const value = column === null || column === undefined ? null : (items[i]!.raw[column] ?? null);
        issueRows.push({
          import_id: ctx.importId,
          organisation_id: ctx.organisationId,
          row_number: outcome.rowNumber,
          field: issue.field,
          column_label: column === null || column === undefined ? null : (ctx.headings[column] ?? `Column ${column + 1}`).slice(0, 200),
          value: value === null ? null : String(value).slice(0, 300),
          message: issue.message,
        });
      }
    }
    if (issueRows.length) await opts.store(issueRows);
    const keepGoing = await opts.onBatch(totals);
    return keepGoing !== false;
  };

  for await (const row of source.rows) {
    if (isBlankRow(row.cells)) continue;
    totals.rowsRead++;
    if (totals.rowsRead > IMPORT_MAX_ROWS) {
      throw new ImportFileError(`The file has more than ${IMPORT_MAX_ROWS.toLocaleString("en-US")} rows; split it into smaller files`);
    }
    batch.push(row);
    if (batch.length >= BATCH && !(await flush())) return totals;
  }
  await flush();
  if (totals.rowsRead === 0) throw new ImportFileError("The file has headings but no rows to import");
  return totals;
}

async function insertIssues(q: Knex | Knex.Transaction, rows: Array<Record<string, unknown>>): Promise<void> {
  for (let i = 0; i < rows.length; i += 100) await q("import_row_issues").insert(rows.slice(i, i + 100));
}

function failureMessage(err: unknown): string {
  if (err instanceof ImportFileError) return `${err.message.replace(/\.$/, "")}. Nothing was imported.`;
  return "The file could not be read to the end; it may be damaged or not a spreadsheet. Nothing was imported.";
}

/**
 * Checks every row of an import (state `checking`) and records the problems; state `checked`
 * with the counts and a preview, or `failed` when the file cannot be read. Writes no records.
 * Progress goes to the imports row as it runs (and to `onProgress`).
 */
export async function checkImportRows(
  db: Knex,
  opts: { importId: number; actor: ActorRef; source: RowSource; onProgress?: (p: ImportProgress) => void },
): Promise<{ state: ImportState; validRows: number; invalidRows: number }> {
  const ctx = await loadPassContext(db, opts.importId);
  let lastWrite = 0;
  try {
    const totals = await runPass(db, ctx, opts.source, {
      write: false,
      actor: opts.actor,
      at: new Date().toISOString(),
      store: (rows) => insertIssues(db, rows),
      onBatch: async (t) => {
        const progress = Math.min(99, Math.floor((opts.source.fraction?.() ?? 0) * 100));
        opts.onProgress?.({
          importId: ctx.importId,
          state: "checking",
          rowsRead: t.rowsRead,
          validRows: t.valid,
          invalidRows: t.invalid,
          progress,
        });
        if (Date.now() - lastWrite < 400) return true;
        lastWrite = Date.now();
        const current = await db("imports").where({ id: ctx.importId }).first("state");
        if (current?.state !== "checking") return false; // cancelled meanwhile
        await touchImport(db, ctx.importId, {
          total_rows: t.rowsRead,
          valid_rows: t.valid,
          invalid_rows: t.invalid,
          progress,
          progress_note: `${t.rowsRead.toLocaleString("en-US")} rows checked`,
        });
        return true;
      },
    });
    const current = await db("imports").where({ id: ctx.importId }).first("state");
    if (current?.state !== "checking")
      return { state: current?.state ?? "cancelled", validRows: totals.valid, invalidRows: totals.invalid };
    const at = new Date().toISOString();
    await touchImport(db, ctx.importId, {
      state: "checked",
      total_rows: totals.rowsRead,
      valid_rows: totals.valid,
      invalid_rows: totals.invalid,
      preview: JSON.stringify(totals.preview),
      progress: 100,
      progress_note: null,
      checked_at: at,
    });
    return { state: "checked", validRows: totals.valid, invalidRows: totals.invalid };
  } catch (err) {
    await failImport(db, { id: ctx.importId, message: failureMessage(err) });
    if (!(err instanceof ImportFileError)) console.error(`import ${ctx.importId}: check failed`, err);
    return { state: "failed", validRows: 0, invalidRows: 0 };
  }
}

/** Moves a checked import to `importing` (once: a second click finds it busy). */
export async function startImportCommit(db: Knex, opts: { actor: ActorRef; id: number }): Promise<void> {
  const r = await db("imports").where({ id: opts.id, organisation_id: opts.actor.organisationId }).first("state", "valid_rows");
  if (!r) throw new RecordNotFoundError("No such import");
  if (r.state !== "checked") {
    throw new RecordConflictError(
      r.state === "imported" ? "This file was already imported" : "Check the rows first; the import is not ready",
    );
  }
  if (Number(r.valid_rows) === 0)
    throw new RecordConflictError("No row of this file can be imported; correct the file and upload it again");
  const changed = await db("imports")
    .where({ id: opts.id, state: "checked" })
    .update({ state: "importing", progress: 0, progress_note: "Waiting to start", updated_at: new Date().toISOString() });
  if (changed !== 1) throw new RecordConflictError("This import has already started");
}

/**
 * Writes the valid rows of an import (state `importing`) in ONE transaction: every row is checked
 * again against the records as they are now, the valid ones are written with an activity row each,
 * the problems are recorded again, and the import is marked `imported` in the same transaction.
 * Any error rolls it all back and marks the import `failed` (nothing written).
 */
export async function commitImportRows(
  db: Knex,
  opts: { importId: number; actor: ActorRef; source: RowSource; onProgress?: (p: ImportProgress) => void; now?: Date },
): Promise<{ state: ImportState; importedRows: number; invalidRows: number }> {
  const at = (opts.now ?? new Date()).toISOString();
  try {
    return await db.transaction(async (trx) => {
      const ctx = await loadPassContext(trx, opts.importId);
      const state = await trx("imports").where({ id: ctx.importId }).first("state");
      if (state?.state !== "importing") throw new RecordConflictError("This import is not waiting to be written");
      await trx("import_row_issues").where({ import_id: ctx.importId }).delete();
      const totals = await runPass(trx, ctx, opts.source, {
        write: true,
        actor: opts.actor,
        at,
        store: (rows) => insertIssues(trx, rows),
        onBatch: async (t) => {
          opts.onProgress?.({
            importId: ctx.importId,
            state: "importing",
            rowsRead: t.rowsRead,
            validRows: t.valid,
            invalidRows: t.invalid,
            progress: Math.min(99, Math.floor((opts.source.fraction?.() ?? 0) * 100)),
          });
        },
      });
      await trx("imports")
        .where({ id: ctx.importId })
        .update({
          state: "imported",
          total_rows: totals.rowsRead,
          valid_rows: totals.valid,
          invalid_rows: totals.invalid,
          imported_rows: totals.valid,
          preview: JSON.stringify(totals.preview),
          progress: 100,
          progress_note: null,
          error: null,
          updated_at: at,
          finished_at: at,
        });
      const what = IMPORT_KIND_LABELS[ctx.kind].toLowerCase();
      await appendActivity(trx, {
        organisationId: ctx.organisationId,
        actorId: opts.actor.userId,
        branchId: ctx.branch.id,
        action: "import.completed",
        subjectType: "Import",
        subjectId: ctx.importId,
        summary:
          `Imported ${totals.valid.toLocaleString("en-US")} ${what} into ${ctx.branch.name} from a spreadsheet` +
          (totals.invalid ? `; ${totals.invalid.toLocaleString("en-US")} rows with problems were not imported` : ""),
        data: { imported: totals.valid, notImported: totals.invalid },
        at,
      });
      return { state: "imported" as ImportState, importedRows: totals.valid, invalidRows: totals.invalid };
    });
  } catch (err) {
    await failImport(db, { id: opts.importId, message: failureMessage(err) });
    if (!(err instanceof ImportFileError)) console.error(`import ${opts.importId}: writing failed`, err);
    return { state: "failed", importedRows: 0, invalidRows: 0 };
  }
}
