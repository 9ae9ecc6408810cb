import type { Knex } from "knex";
import { toGrams, type MassDisplayUnit, type PurchaseAmendmentInput, type PurchaseInput, type PurchaseListQuery } from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { amendRecord, listAmendments, voidRecord, type AmendmentRecord } from "../amendments";
import { RecordNotFoundError } from "../errors";
import { describeMass } from "../mass";
import { toNumOrNull, type ActorRef, type ScopeFn } from "../types";
import { enteredAmount, type MassUnit } from "@coldtrail/core";
import { applyVoided, assertRecordDate, scoped, textOrNull, writableBranch, type RecordPage } from "./common";
import { countRows, whereContains } from "../paging";

/** Refrigerant bought by a branch; each purchase has one `purchased` movement. List scopes see the table as `p`. */

export interface PurchaseRow {
  id: number;
  organisationId: number;
  branchId: number;
  branchName: string;
  branchMassUnit: MassDisplayUnit;
  purchasedOn: string;
  supplierName: string;
  refrigerant: string;
  massG: number;
  containerCount: number | null;
  invoiceReference: string | null;
  createdByName: string;
  createdAt: string;
  voidedAt: string | null;
  voidReason: string | null;
}

export interface PurchaseDetail extends PurchaseRow {
  amendments: AmendmentRecord[];
  /** The quantity as it was typed, while it still matches the grams. */
  enteredAmount: { amount: number; unit: MassUnit } | null;
}

const SORT: Record<PurchaseListQuery["sort"], string> = {
  date: "p.purchased_on",
  branch: "branch.name",
  supplier: "p.supplier_name",
  refrigerant: "p.refrigerant",
  amount: "p.mass_g",
};

const COLUMNS = [
  "p.id",
  "p.organisation_id",
  "p.branch_id",
  "branch.name as branch_name",
  "branch.mass_unit as branch_mass_unit",
  "p.purchased_on",
  "p.supplier_name",
  "p.refrigerant",
  "p.mass_g",
  "p.container_count",
  "p.invoice_reference",
  "creator.name as created_by_name",
  "p.created_at",
  "p.voided_at",
  "p.void_reason",
];

function toRow(r: any): PurchaseRow {
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchMassUnit: r.branch_mass_unit,
    purchasedOn: r.purchased_on,
    supplierName: r.supplier_name,
    refrigerant: r.refrigerant,
    massG: Number(r.mass_g),
    containerCount: toNumOrNull(r.container_count),
    invoiceReference: r.invoice_reference ?? null,
    createdByName: r.created_by_name,
    createdAt: r.created_at,
    voidedAt: r.voided_at ?? null,
    voidReason: r.void_reason ?? null,
  };
}

const joined = (db: Knex) =>
  db("purchases as p").join("branches as branch", "branch.id", "p.branch_id").join("users as creator", "creator.id", "p.created_by");

export async function listPurchases(db: Knex, opts: { scope: ScopeFn; query: PurchaseListQuery }): Promise<RecordPage<PurchaseRow>> {
  const { query } = opts;
  const filtered = (qb: Knex.QueryBuilder) => {
    scoped(qb, opts.scope);
    applyVoided(qb, "p.voided_at", query.voided);
    if (query.branchId) qb.where("p.branch_id", query.branchId);
    if (query.refrigerant) qb.where("p.refrigerant", query.refrigerant);
    if (query.from) qb.where("p.purchased_on", ">=", query.from);
    if (query.to) qb.where("p.purchased_on", "<=", query.to);
    if (query.q) whereContains(qb, query.q, ["p.supplier_name", "p.invoice_reference"]);
    return qb;
  };
  const total = await countRows(filtered(db("purchases as p")));
  const dir = query.dir === "asc" ? "asc" : "desc";
  const rows = await filtered(joined(db))
    .select(COLUMNS)
    .orderBy(SORT[query.sort], dir)
    .orderBy("p.id", dir)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { total, page: query.page, pageSize: query.pageSize, rows: rows.map(toRow) };
}

export async function getPurchase(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<PurchaseDetail | undefined> {
  const q = joined(db).where("p.id", opts.id);
  scoped(q, opts.scope);
  const r = await q.first([...COLUMNS, "p.amount_entered", "p.amount_unit"]);
  if (!r) return undefined;
  const row = toRow(r);
  return {
    ...row,
    enteredAmount: enteredAmount(row.massG, r.amount_entered === null ? null : Number(r.amount_entered), r.amount_unit),
    amendments: await listAmendments(db, { organisationId: row.organisationId, subjectType: "Purchase", subjectId: row.id }),
  };
}

export async function getPurchaseRef(
  db: Knex,
  opts: { organisationId: number; id: number },
): Promise<{ id: number; organisationId: number; branchId: number } | undefined> {
  const r = await db("purchases").where({ id: opts.id, organisation_id: opts.organisationId }).first("id", "organisation_id", "branch_id");
  return r ? { id: Number(r.id), organisationId: Number(r.organisation_id), branchId: Number(r.branch_id) } : undefined;
}

export async function createPurchase(db: Knex, opts: { actor: ActorRef; input: PurchaseInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const branch = await writableBranch(trx, actor.organisationId, input.branchId);
    await assertRecordDate(trx, {
      organisationId: actor.organisationId,
      timeZone: branch.timeZone,
      date: input.purchasedOn,
      field: "purchasedOn",
      what: "The purchase date",
      now: opts.now,
    });
    const grams = toGrams(input.amount, input.unit);
    const [row] = await trx("purchases")
      .insert({
        organisation_id: actor.organisationId,
        branch_id: branch.id,
        purchased_on: input.purchasedOn,
        supplier_name: input.supplierName,
        refrigerant: input.refrigerant,
        mass_g: grams,
        amount_entered: input.amount,
        amount_unit: input.unit,
        container_count: input.containerCount ?? null,
        invoice_reference: textOrNull(input.invoiceReference),
        created_by: actor.userId,
        created_at: at,
      })
      .returning("id");
    const id = rowId(row);
    await trx("refrigerant_movements").insert({
      organisation_id: actor.organisationId,
      branch_id: branch.id,
      purchase_id: id,
      cylinder_id: null,
      direction: "purchased",
      refrigerant: input.refrigerant,
      mass_g: grams,
      moved_on: input.purchasedOn,
      created_at: at,
    });
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch.id,
      action: "purchase.created",
      subjectType: "purchase",
      subjectId: id,
      at,
      summary: `Bought ${describeMass(grams, branch.massUnit)} ${input.refrigerant} from ${input.supplierName}`,
      data: { grams },
    });
    return id;
  });
}

/** Corrects a purchase; a new quantity or date replaces its movement (the old one is voided). */
export async function amendPurchase(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: PurchaseAmendmentInput; now?: Date },
): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const p = await trx("purchases").where({ id: opts.id, organisation_id: actor.organisationId }).first();
    if (!p) throw new RecordNotFoundError("No such purchase");
    const c = input.changes;
    const changes: Record<string, unknown> = {};
    if (c.purchasedOn !== undefined) {
      const branch = await trx("branches").where({ id: p.branch_id }).first("time_zone");
      await assertRecordDate(trx, {
        organisationId: actor.organisationId,
        timeZone: String(branch?.time_zone ?? "UTC"),
        date: c.purchasedOn,
        field: "changes.purchasedOn",
        what: "The purchase date",
        now: opts.now,
      });
      changes.purchased_on = c.purchasedOn;
    }
    if (c.supplierName !== undefined) changes.supplier_name = c.supplierName;
    if (c.amount !== undefined && c.unit !== undefined) {
      changes.mass_g = toGrams(c.amount, c.unit);
      changes.amount_entered = c.amount;
      changes.amount_unit = c.unit;
    }
    if (c.containerCount !== undefined) changes.container_count = c.containerCount;
    if (c.invoiceReference !== undefined) changes.invoice_reference = c.invoiceReference;
    const amendmentId = await amendRecord(trx, {
      table: "purchases",
      subjectType: "Purchase",
      id: opts.id,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: input.reason,
      changes,
      summary: `Corrected the purchase of ${p.refrigerant} from ${c.supplierName ?? p.supplier_name}`,
      at,
    });
    const grams = (changes.mass_g as number | undefined) ?? Number(p.mass_g);
    const movedOn = (changes.purchased_on as string | undefined) ?? p.purchased_on;
    if (grams !== Number(p.mass_g) || movedOn !== p.purchased_on) {
      await trx("refrigerant_movements").where({ purchase_id: opts.id }).whereNull("voided_at").update({ voided_at: at });
      await trx("refrigerant_movements").insert({
        organisation_id: actor.organisationId,
        branch_id: Number(p.branch_id),
        purchase_id: opts.id,
        cylinder_id: null,
        direction: "purchased",
        refrigerant: p.refrigerant,
        mass_g: grams,
        moved_on: movedOn,
        created_at: at,
      });
    }
    return amendmentId;
  });
}

export async function voidPurchase(db: Knex, opts: { actor: ActorRef; id: number; reason: string; now?: Date }): Promise<void> {
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const p = await trx("purchases")
      .where({ id: opts.id, organisation_id: opts.actor.organisationId })
      .first("id", "refrigerant", "supplier_name");
    if (!p) throw new RecordNotFoundError("No such purchase");
    await voidRecord(trx, {
      table: "purchases",
      subjectType: "Purchase",
      id: opts.id,
      organisationId: opts.actor.organisationId,
      actorId: opts.actor.userId,
      reason: opts.reason,
      summary: `Voided the purchase of ${p.refrigerant} from ${p.supplier_name}: ${opts.reason.trim()}`,
      at,
    });
    await trx("refrigerant_movements").where({ purchase_id: opts.id }).whereNull("voided_at").update({ voided_at: at });
  });
}
