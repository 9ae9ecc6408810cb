import type { Knex } from "knex";
import type { MassDisplayUnit, ReclaimShipmentInput, ShipmentAmendmentInput, ShipmentListQuery } from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { amendRecord, listAmendments, voidRecord, type AmendmentRecord } from "../amendments";
import { RecordConflictError, RecordNotFoundError } from "../errors";
import { describeMass } from "../mass";
import { toBool, toNumOrNull, type ActorRef, type ScopeFn } from "../types";
import { applyVoided, assertRecordDate, moveCylinderContents, scoped, textOrNull, writableBranch, type RecordPage } from "./common";
import { countRows, whereContains } from "../paging";

/**
 * Reclaim shipments: recovered refrigerant sent to a reclaimer. Each cylinder ships its recorded
 * contents; a `shipped_for_reclaim` movement empties it. List scopes see the table as `s`.
 */

export interface ShipmentListRow {
  id: number;
  branchId: number;
  branchName: string;
  branchMassUnit: MassDisplayUnit;
  shippedOn: string;
  reclaimerName: string;
  reference: string | null;
  cylinderCount: number;
  totalG: number;
  /** Quantity by refrigerant, largest first. */
  byRefrigerant: { refrigerant: string; massG: number }[];
  voidedAt: string | null;
}

const SORT: Record<ShipmentListQuery["sort"], string | null> = {
  date: "s.shipped_on",
  branch: "branch.name",
  reclaimer: "s.reclaimer_name",
  amount: null,
};

export async function listShipments(db: Knex, opts: { scope: ScopeFn; query: ShipmentListQuery }): Promise<RecordPage<ShipmentListRow>> {
  const { query } = opts;
  const filtered = (qb: Knex.QueryBuilder) => {
    scoped(qb, opts.scope);
    applyVoided(qb, "s.voided_at", query.voided);
    if (query.branchId) qb.where("s.branch_id", query.branchId);
    if (query.from) qb.where("s.shipped_on", ">=", query.from);
    if (query.to) qb.where("s.shipped_on", "<=", query.to);
    if (query.q) whereContains(qb, query.q, ["s.reclaimer_name", "s.reference"]);
    return qb;
  };
  const total = await countRows(filtered(db("reclaim_shipments as s")));
  const dir = query.dir === "asc" ? "asc" : "desc";
  const rowsQuery = filtered(db("reclaim_shipments as s").join("branches as branch", "branch.id", "s.branch_id")).select(
    "s.id",
    "s.branch_id",
    "branch.name as branch_name",
    "branch.mass_unit as branch_mass_unit",
    "s.shipped_on",
    "s.reclaimer_name",
    "s.reference",
    "s.voided_at",
    db.raw("(select coalesce(sum(l.mass_g), 0) from reclaim_shipment_lines l where l.shipment_id = s.id) as total_g"),
  );
  const column = SORT[query.sort];
  if (column) rowsQuery.orderBy(column, dir);
  else rowsQuery.orderByRaw(`total_g ${dir}`);
  rowsQuery.orderBy("s.id", dir);
  const rows: any[] = await rowsQuery.limit(query.pageSize).offset((query.page - 1) * query.pageSize);
  const ids = rows.map((r) => Number(r.id));
  // Ordered so each shipment's refrigerants come out in the same order on SQLite and PostgreSQL.
  const lines = ids.length
    ? await db("reclaim_shipment_lines")
        .whereIn("shipment_id", ids)
        .orderBy("id")
        .select("shipment_id", "refrigerant", "mass_g", "cylinder_id")
    : [];
  return {
    total,
    page: query.page,
    pageSize: query.pageSize,
    rows: rows.map((r) => {
      const mine = lines.filter((l) => Number(l.shipment_id) === Number(r.id));
      const by = new Map<string, number>();
      for (const l of mine) by.set(l.refrigerant, (by.get(l.refrigerant) ?? 0) + Number(l.mass_g));
      return {
        id: Number(r.id),
        branchId: Number(r.branch_id),
        branchName: r.branch_name,
        branchMassUnit: r.branch_mass_unit,
        shippedOn: r.shipped_on,
        reclaimerName: r.reclaimer_name,
        reference: r.reference ?? null,
        cylinderCount: new Set(mine.map((l) => l.cylinder_id)).size,
        totalG: Number(r.total_g),
        byRefrigerant: [...by.entries()].map(([refrigerant, massG]) => ({ refrigerant, massG })).sort((a, b) => b.massG - a.massG),
        voidedAt: r.voided_at ?? null,
      };
    }),
  };
}

export interface ShipmentDetail {
  id: number;
  organisationId: number;
  branchId: number;
  branchName: string;
  branchMassUnit: MassDisplayUnit;
  shippedOn: string;
  reclaimerName: string;
  reclaimerAddress: string | null;
  reference: string | null;
  notes: string | null;
  createdByName: string;
  createdAt: string;
  voidedAt: string | null;
  voidReason: string | null;
  lines: { id: number; cylinderId: number | null; cylinderSerial: string | null; refrigerant: string; massG: number }[];
  amendments: AmendmentRecord[];
}

export async function getShipment(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<ShipmentDetail | undefined> {
  const q = db("reclaim_shipments as s")
    .join("branches as branch", "branch.id", "s.branch_id")
    .join("users as creator", "creator.id", "s.created_by")
    .where("s.id", opts.id);
  scoped(q, opts.scope);
  const r = await q.first("s.*", "branch.name as branch_name", "branch.mass_unit as branch_mass_unit", "creator.name as created_by_name");
  if (!r) return undefined;
  const lines = await db("reclaim_shipment_lines as l")
    .leftJoin("cylinders as c", "c.id", "l.cylinder_id")
    .where("l.shipment_id", opts.id)
    .orderBy("l.id")
    .select("l.id", "l.cylinder_id", "c.serial", "l.refrigerant", "l.mass_g");
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchMassUnit: r.branch_mass_unit,
    shippedOn: r.shipped_on,
    reclaimerName: r.reclaimer_name,
    reclaimerAddress: r.reclaimer_address ?? null,
    reference: r.reference ?? null,
    notes: r.notes ?? null,
    createdByName: r.created_by_name,
    createdAt: r.created_at,
    voidedAt: r.voided_at ?? null,
    voidReason: r.void_reason ?? null,
    lines: lines.map((l) => ({
      id: Number(l.id),
      cylinderId: toNumOrNull(l.cylinder_id),
      cylinderSerial: l.serial ?? null,
      refrigerant: l.refrigerant,
      massG: Number(l.mass_g),
    })),
    amendments: await listAmendments(db, { organisationId: Number(r.organisation_id), subjectType: "ReclaimShipment", subjectId: opts.id }),
  };
}

export async function getShipmentRef(
  db: Knex,
  opts: { organisationId: number; id: number },
): Promise<{ id: number; organisationId: number; branchId: number } | undefined> {
  const r = await db("reclaim_shipments")
    .where({ id: opts.id, organisation_id: opts.organisationId })
    .first("id", "organisation_id", "branch_id");
  return r ? { id: Number(r.id), organisationId: Number(r.organisation_id), branchId: Number(r.branch_id) } : undefined;
}

/** Records a shipment: one line and one movement per cylinder, each cylinder emptied. */
export async function createShipment(db: Knex, opts: { actor: ActorRef; input: ReclaimShipmentInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const branch = await writableBranch(trx, actor.organisationId, input.branchId);
    await assertRecordDate(trx, {
      organisationId: actor.organisationId,
      timeZone: branch.timeZone,
      date: input.shippedOn,
      field: "shippedOn",
      what: "The shipping date",
      now: opts.now,
    });
    const cylinders = await trx("cylinders")
      .whereIn("id", input.cylinderIds)
      .where({ organisation_id: actor.organisationId })
      .select("id", "branch_id", "serial", "refrigerant", "contents_g", "unregistered", "status");
    const byId = new Map(cylinders.map((c) => [Number(c.id), c]));
    for (const id of input.cylinderIds) {
      const c = byId.get(id);
      if (!c) throw new RecordNotFoundError("That cylinder does not exist", "cylinderIds");
      if (Number(c.branch_id) !== branch.id) throw new RecordConflictError(`Cylinder ${c.serial} belongs to another branch`, "cylinderIds");
      if (toBool(c.unregistered) || c.status === "retired")
        throw new RecordConflictError(`Cylinder ${c.serial} is not in service`, "cylinderIds");
      if (Number(c.contents_g) <= 0 || !c.refrigerant)
        throw new RecordConflictError(`Cylinder ${c.serial} is empty on record`, "cylinderIds");
    }
    const [row] = await trx("reclaim_shipments")
      .insert({
        organisation_id: actor.organisationId,
        branch_id: branch.id,
        shipped_on: input.shippedOn,
        reclaimer_name: input.reclaimerName,
        reclaimer_address: textOrNull(input.reclaimerAddress),
        reference: textOrNull(input.reference),
        notes: textOrNull(input.notes),
        created_by: actor.userId,
        created_at: at,
      })
      .returning("id");
    const id = rowId(row);
    let total = 0;
    for (const cylinderId of input.cylinderIds) {
      const c = byId.get(cylinderId)!;
      const grams = Number(c.contents_g);
      total += grams;
      await trx("reclaim_shipment_lines").insert({
        organisation_id: actor.organisationId,
        shipment_id: id,
        cylinder_id: cylinderId,
        refrigerant: c.refrigerant,
        mass_g: grams,
      });
      await trx("refrigerant_movements").insert({
        organisation_id: actor.organisationId,
        branch_id: branch.id,
        reclaim_shipment_id: id,
        cylinder_id: cylinderId,
        direction: "shipped_for_reclaim",
        refrigerant: c.refrigerant,
        mass_g: grams,
        moved_on: input.shippedOn,
        created_at: at,
      });
      await moveCylinderContents(trx, {
        cylinderId,
        deltaG: -grams,
        refrigerant: c.refrigerant,
        at,
        field: "cylinderIds",
        describe: (g) => describeMass(g, branch.massUnit),
      });
    }
    const n = input.cylinderIds.length;
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch.id,
      action: "reclaim_shipment.created",
      subjectType: "reclaim_shipment",
      subjectId: id,
      at,
      summary: `Shipped ${n} cylinder${n === 1 ? "" : "s"} (${describeMass(total, branch.massUnit)}) to ${input.reclaimerName} for reclaim`,
      data: { cylinderIds: input.cylinderIds, totalG: total },
    });
    return id;
  });
}

export async function amendShipment(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: ShipmentAmendmentInput; now?: Date },
): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const s = await trx("reclaim_shipments").where({ id: opts.id, organisation_id: actor.organisationId }).first("id", "reclaimer_name");
    if (!s) throw new RecordNotFoundError("No such shipment");
    const c = input.changes;
    const changes: Record<string, unknown> = {};
    if (c.shippedOn !== undefined) {
      const row = await trx("reclaim_shipments as s")
        .join("branches as b", "b.id", "s.branch_id")
        .where("s.id", opts.id)
        .first("b.time_zone");
      await assertRecordDate(trx, {
        organisationId: actor.organisationId,
        timeZone: String(row?.time_zone ?? "UTC"),
        date: c.shippedOn,
        field: "changes.shippedOn",
        what: "The shipping date",
        now: opts.now,
      });
      changes.shipped_on = c.shippedOn;
    }
    if (c.reclaimerName !== undefined) changes.reclaimer_name = c.reclaimerName;
    if (c.reclaimerAddress !== undefined) changes.reclaimer_address = c.reclaimerAddress;
    if (c.reference !== undefined) changes.reference = c.reference;
    if (c.notes !== undefined) changes.notes = c.notes;
    const amendmentId = await amendRecord(trx, {
      table: "reclaim_shipments",
      subjectType: "ReclaimShipment",
      id: opts.id,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: input.reason,
      changes,
      summary: `Corrected reclaim shipment #${opts.id} to ${c.reclaimerName ?? s.reclaimer_name}`,
      at,
    });
    if (c.shippedOn !== undefined) {
      await trx("refrigerant_movements").where({ reclaim_shipment_id: opts.id }).whereNull("voided_at").update({ moved_on: c.shippedOn });
    }
    return amendmentId;
  });
}

/**
 * Voids a shipment entered in error: its movements are voided and the cylinders get their contents
 * back. Refused when a cylinder has since taken another refrigerant.
 */
export async function voidShipment(db: Knex, opts: { actor: ActorRef; id: number; reason: string; now?: Date }): Promise<void> {
  const { actor } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const s = await trx("reclaim_shipments as s")
      .join("branches as b", "b.id", "s.branch_id")
      .where({ "s.id": opts.id, "s.organisation_id": actor.organisationId })
      .first("s.id", "s.reclaimer_name", "b.mass_unit");
    if (!s) throw new RecordNotFoundError("No such shipment");
    await voidRecord(trx, {
      table: "reclaim_shipments",
      subjectType: "ReclaimShipment",
      id: opts.id,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: opts.reason,
      summary: `Voided reclaim shipment #${opts.id} to ${s.reclaimer_name}: ${opts.reason.trim()}`,
      at,
    });
    const movements = await trx("refrigerant_movements").where({ reclaim_shipment_id: opts.id }).whereNull("voided_at").orderBy("id");
    for (const m of movements) {
      const c = await trx("cylinders").where({ id: m.cylinder_id }).first("serial", "refrigerant", "contents_g");
      if (c && Number(c.contents_g) > 0 && c.refrigerant && c.refrigerant !== m.refrigerant) {
        throw new RecordConflictError(
          `Cylinder ${c.serial} now holds ${c.refrigerant}; the ${m.refrigerant} shipped in it cannot be put back on record`,
          "reason",
        );
      }
      await trx("refrigerant_movements").where({ id: m.id }).update({ voided_at: at });
      if (m.cylinder_id !== null) {
        await moveCylinderContents(trx, {
          cylinderId: Number(m.cylinder_id),
          deltaG: Number(m.mass_g),
          refrigerant: m.refrigerant,
          at,
          field: "reason",
          describe: (g) => describeMass(g, s.mass_unit),
          // Putting back what the records held before: the contents were already on record once.
          confirmedOverFill: true,
        });
      }
    }
  });
}
