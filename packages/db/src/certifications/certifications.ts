import type { Knex } from "knex";
import { subject } from "@casl/ability";
import {
  CERTIFICATION_TYPE_LABELS,
  type Action,
  type AppAbility,
  type CertificationCardInput,
  type CertificationCorrectionInput,
  type CertificationDecisionInput,
  type CertificationListQuery,
  type CertificationState,
  type CertificationType,
} from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { listAmendments, voidRecord, type AmendmentRecord } from "../amendments";
import { ActionForbiddenError, InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { orderByNullable, type ActorRef, type ScopeFn } from "../types";
import { createNotification } from "./notifications";
import { countRows, whereContains } from "../paging";

/**
 * Technicians' certification cards: upload (state pending), the officer's decision (verified or not
 * accepted, with a reason), corrections kept as amendments, withdrawal (void), lists and detail.
 *
 * A card belongs to a person, not a branch. Branch roles (managers, inspectors) see the cards of
 * the technicians who work in their branches: the permission scope is applied to the "reach" of a
 * card — one row per branch its holder works in as a technician (a null branch when none) — so
 * `scopeByAbility(ability, "read", "Certification", "certifications")` filters these rows.
 */

const typeOrder = (t: CertificationType) => ["type_i", "type_ii", "type_iii", "universal"].indexOf(t);
const sortTypes = (types: CertificationType[]) => [...new Set(types)].sort((a, b) => typeOrder(a) - typeOrder(b));
export const describeTypes = (types: CertificationType[]) =>
  sortTypes(types)
    .map((t) => CERTIFICATION_TYPE_LABELS[t])
    .join(" + ");

/** Each card with each branch its holder works in as a technician; the table the scope sees as `certifications`. */
function certificationReach(db: Knex): Knex.QueryBuilder {
  return db("certifications as c")
    .leftJoin("memberships as m", function joinTechnicianMemberships() {
      this.on("m.user_id", "=", "c.user_id").andOn("m.role", "=", db.raw("?", ["technician"]));
    })
    .select("c.id", "c.organisation_id", "c.user_id", "c.state", "m.branch_id");
}

/** Keeps the cards (aliased `cert`) that the scope allows through at least one of their reach rows. */
function whereReachable(db: Knex, qb: Knex.QueryBuilder, scope: ScopeFn): void {
  qb.whereExists(function reachable(this: Knex.QueryBuilder) {
    this.select(db.raw("1"))
      .from(certificationReach(db).as("certifications"))
      .whereRaw("certifications.id = cert.id")
      .where(function scoped(this: Knex.QueryBuilder) {
        scope(this);
      });
  });
}

/** What a record-level permission check needs to know about a card. */
export interface CertificationRef {
  id: number;
  organisationId: number;
  userId: number;
  state: CertificationState;
  /** Branches where the holder works as a technician. */
  branchIds: number[];
  voidedAt: string | null;
}

export async function getCertificationRef(db: Knex, opts: { organisationId: number; id: number }): Promise<CertificationRef | undefined> {
  const row = await db("certifications")
    .where({ id: opts.id, organisation_id: opts.organisationId })
    .first("id", "organisation_id", "user_id", "state", "voided_at");
  if (!row) return undefined;
  const branches = await db("memberships")
    .where({ user_id: row.user_id, role: "technician" })
    .whereNotNull("branch_id")
    .orderBy("branch_id")
    .select("branch_id");
  return {
    id: Number(row.id),
    organisationId: Number(row.organisation_id),
    userId: Number(row.user_id),
    state: row.state,
    branchIds: branches.map((b) => Number(b.branch_id)),
    voidedAt: row.voided_at ?? null,
  };
}

/** Whether the ability allows `action` on the card through any of the branches its holder works in. */
export function canOnCertification(ability: AppAbility, action: Action, ref: CertificationRef): boolean {
  const base = { id: ref.id, organisationId: ref.organisationId, userId: ref.userId, state: ref.state };
  const branches: Array<number | null> = ref.branchIds.length ? ref.branchIds : [null];
  return branches.some((branchId) => ability.can(action, subject("Certification", { ...base, branchId })));
}

// ---------------------------------------------------------------------------------------- upload

export interface CardFile {
  fileKey: string;
  mime: string;
  thumbnailKey: string | null;
}

/**
 * Records a card the technician (the actor) uploaded, pending verification, with its types, in one
 * transaction with the activity row and an in-app notice to each compliance officer. The file is
 * already stored under a key we made. Refuses a second copy of a card already on file.
 */
export async function createCertification(
  db: Knex,
  opts: { actor: ActorRef; input: CertificationCardInput; card: CardFile; now?: Date },
): Promise<number> {
  const { actor, input, card } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  if (input.types.length === 0) throw new InvalidInputError("Choose at least one certification type", "types");
  return db.transaction(async (trx) => {
    const holder = await trx("users").where({ id: actor.userId, organisation_id: actor.organisationId }).first("id", "name");
    if (!holder) throw new RecordNotFoundError("No such person");
    const duplicate = await trx("certifications")
      .where({ organisation_id: actor.organisationId, user_id: actor.userId })
      .whereNull("voided_at")
      .whereIn("state", ["pending", "verified"])
      .whereRaw("lower(certificate_number) = ?", [input.certificateNumber.toLowerCase()])
      .whereRaw("lower(certifying_organisation) = ?", [input.certifyingOrganisation.toLowerCase()])
      .first("id", "state");
    if (duplicate) {
      throw new RecordConflictError(
        duplicate.state === "verified"
          ? "This card is already on file and verified"
          : "This card is already on file, awaiting verification",
        "certificateNumber",
      );
    }
    const [row] = await trx("certifications")
      .insert({
        organisation_id: actor.organisationId,
        user_id: actor.userId,
        certifying_organisation: input.certifyingOrganisation,
        certificate_number: input.certificateNumber,
        issued_on: input.issuedOn ?? null,
        card_file_key: card.fileKey,
        card_mime: card.mime,
        card_thumbnail_key: card.thumbnailKey,
        state: "pending",
        verified_by: null,
        verified_at: null,
        rejection_reason: null,
        uploaded_at: at,
        updated_at: at,
      })
      .returning("id");
    const id = rowId(row);
    const types = sortTypes(input.types);
    await trx("certification_types").insert(types.map((type) => ({ certification_id: id, organisation_id: actor.organisationId, type })));

    const branch = await trx("memberships")
      .where({ user_id: actor.userId, role: "technician" })
      .whereNotNull("branch_id")
      .orderBy("branch_id")
      .first("branch_id");
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch ? Number(branch.branch_id) : null,
      action: "certification.uploaded",
      subjectType: "Certification",
      subjectId: id,
      summary: `${holder.name} uploaded a ${describeTypes(types)} certification card (${input.certifyingOrganisation}, no. ${input.certificateNumber}) for verification`,
      data: { types, mime: card.mime },
      at,
    });

    const officers = await trx("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where({ "m.organisation_id": actor.organisationId, "m.role": "compliance_officer" })
      .where("u.active", true)
      .whereNot("u.id", actor.userId)
      .distinct("u.id")
      .orderBy("u.id"); // ordered: DISTINCT rows come back in the planner's order, which differs between SQLite and PostgreSQL
    for (const o of officers) {
      await createNotification(trx, {
        organisationId: actor.organisationId,
        userId: Number(o.id),
        kind: "certification.awaiting_verification",
        title: `${holder.name} uploaded a certification card to verify`,
        body: `${describeTypes(types)} · ${input.certifyingOrganisation} · no. ${input.certificateNumber}`,
        link: `/certifications/${id}`,
        subjectType: "Certification",
        subjectId: id,
        at,
      });
    }
    return id;
  });
}

// ------------------------------------------------------------------------------------------ lists

export interface CertificationListRow {
  id: number;
  userId: number;
  technicianName: string;
  technicianEmail: string;
  branchNames: string[];
  types: CertificationType[];
  certifyingOrganisation: string;
  certificateNumber: string;
  issuedOn: string | null;
  state: CertificationState;
  uploadedAt: string;
  decidedAt: string | null;
  decidedByName: string | null;
  rejectionReason: string | null;
  cardMime: string | null;
  hasCard: boolean;
  hasThumbnail: boolean;
}

export interface CertificationListResult {
  rows: CertificationListRow[];
  total: number;
  page: number;
  pageSize: number;
}

const SORT_COLUMNS: Record<CertificationListQuery["sort"], string> = {
  uploadedAt: "cert.uploaded_at",
  technician: "holder.name",
  state: "cert.state",
  certifyingOrganisation: "cert.certifying_organisation",
  decidedAt: "cert.verified_at",
};

async function typesOf(db: Knex, ids: number[]): Promise<Map<number, CertificationType[]>> {
  const out = new Map<number, CertificationType[]>();
  if (ids.length === 0) return out;
  const rows = await db("certification_types").whereIn("certification_id", ids).select("certification_id", "type");
  for (const r of rows) {
    const id = Number(r.certification_id);
    out.set(id, sortTypes([...(out.get(id) ?? []), r.type]));
  }
  return out;
}

async function branchNamesOf(db: Knex, userIds: number[]): Promise<Map<number, string[]>> {
  const out = new Map<number, string[]>();
  if (userIds.length === 0) return out;
  const rows = await db("memberships as m")
    .join("branches as b", "b.id", "m.branch_id")
    .whereIn("m.user_id", userIds)
    .where("m.role", "technician")
    .orderBy("b.name")
    .select("m.user_id", "b.name");
  for (const r of rows) {
    const id = Number(r.user_id);
    out.set(id, [...(out.get(id) ?? []), r.name]);
  }
  return out;
}

/**
 * One page of the cards the scope allows (withdrawn ones left out), filtered and sorted on the server.
 * `actorUserId` serves the `mine` filter.
 */
export async function listCertifications(
  db: Knex,
  opts: { scope: ScopeFn; query: CertificationListQuery; actorUserId: number },
): Promise<CertificationListResult> {
  const { query } = opts;
  const filtered = () => {
    const qb = db("certifications as cert").join("users as holder", "holder.id", "cert.user_id").whereNull("cert.voided_at");
    whereReachable(db, qb, opts.scope);
    if (query.state) qb.where("cert.state", query.state);
    if (query.mine) qb.where("cert.user_id", opts.actorUserId);
    if (query.branchId) {
      qb.whereExists(function inBranch(this: Knex.QueryBuilder) {
        this.select(db.raw("1"))
          .from("memberships as bm")
          .whereRaw("bm.user_id = cert.user_id")
          .where({ "bm.role": "technician", "bm.branch_id": query.branchId });
      });
    }
    if (query.q) whereContains(qb, query.q, ["holder.name", "holder.email", "cert.certificate_number", "cert.certifying_organisation"]);
    return qb;
  };

  const total = await countRows(filtered());
  const dir = query.dir === "desc" ? "desc" : "asc";
  const sortColumn = SORT_COLUMNS[query.sort];
  const rowsQuery = filtered().leftJoin("users as decider", "decider.id", "cert.verified_by");
  // The decision time is NULL until a card is decided; it sorts as in SQLite in both dialects.
  if (sortColumn === "cert.verified_at") orderByNullable(rowsQuery, sortColumn, dir);
  else rowsQuery.orderBy(sortColumn, dir);
  const rows = await rowsQuery
    .orderBy("cert.id", dir)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .select(
      "cert.id",
      "cert.user_id",
      "holder.name as holder_name",
      "holder.email as holder_email",
      "cert.certifying_organisation",
      "cert.certificate_number",
      "cert.issued_on",
      "cert.state",
      "cert.uploaded_at",
      "cert.verified_at",
      "decider.name as decider_name",
      "cert.rejection_reason",
      "cert.card_mime",
      "cert.card_file_key",
      "cert.card_thumbnail_key",
    );
  const ids = rows.map((r) => Number(r.id));
  const types = await typesOf(db, ids);
  const branches = await branchNamesOf(db, [...new Set(rows.map((r) => Number(r.user_id)))]);
  return {
    rows: rows.map((r) => ({
      id: Number(r.id),
      userId: Number(r.user_id),
      technicianName: r.holder_name,
      technicianEmail: r.holder_email,
      branchNames: branches.get(Number(r.user_id)) ?? [],
      types: types.get(Number(r.id)) ?? [],
      certifyingOrganisation: r.certifying_organisation,
      certificateNumber: r.certificate_number,
      issuedOn: r.issued_on ?? null,
      state: r.state,
      uploadedAt: r.uploaded_at,
      decidedAt: r.state === "pending" ? null : (r.verified_at ?? null),
      decidedByName: r.state === "pending" ? null : (r.decider_name ?? null),
      rejectionReason: r.rejection_reason ?? null,
      cardMime: r.card_mime ?? null,
      hasCard: Boolean(r.card_file_key),
      hasThumbnail: Boolean(r.card_thumbnail_key),
    })),
    total,
    page: query.page,
    pageSize: query.pageSize,
  };
}

export interface CertificationDetail extends CertificationListRow {
  organisationId: number;
  branchIds: number[];
  voidedAt: string | null;
  voidReason: string | null;
  updatedAt: string;
  amendments: AmendmentRecord[];
}

/** One card the scope allows (withdrawn ones included), with its history of corrections; undefined otherwise. */
export async function getCertification(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<CertificationDetail | undefined> {
  const qb = db("certifications as cert")
    .join("users as holder", "holder.id", "cert.user_id")
    .leftJoin("users as decider", "decider.id", "cert.verified_by")
    .where("cert.id", opts.id);
  whereReachable(db, qb, opts.scope);
  const r = await qb.first("cert.*", "holder.name as holder_name", "holder.email as holder_email", "decider.name as decider_name");
  if (!r) return undefined;
  const id = Number(r.id);
  const types = await typesOf(db, [id]);
  const branchRows = await db("memberships")
    .where({ user_id: r.user_id, role: "technician" })
    .whereNotNull("branch_id")
    .orderBy("branch_id")
    .select("branch_id");
  const branches = await branchNamesOf(db, [Number(r.user_id)]);
  return {
    id,
    organisationId: Number(r.organisation_id),
    userId: Number(r.user_id),
    technicianName: r.holder_name,
    technicianEmail: r.holder_email,
    branchIds: branchRows.map((b) => Number(b.branch_id)),
    branchNames: branches.get(Number(r.user_id)) ?? [],
    types: types.get(id) ?? [],
    certifyingOrganisation: r.certifying_organisation,
    certificateNumber: r.certificate_number,
    issuedOn: r.issued_on ?? null,
    state: r.state,
    uploadedAt: r.uploaded_at,
    decidedAt: r.state === "pending" ? null : (r.verified_at ?? null),
    decidedByName: r.state === "pending" ? null : (r.decider_name ?? null),
    rejectionReason: r.rejection_reason ?? null,
    cardMime: r.card_mime ?? null,
    hasCard: Boolean(r.card_file_key),
    hasThumbnail: Boolean(r.card_thumbnail_key),
    voidedAt: r.voided_at ?? null,
    voidReason: r.void_reason ?? null,
    updatedAt: r.updated_at,
    amendments: await listAmendments(db, { organisationId: Number(r.organisation_id), subjectType: "Certification", subjectId: id }),
  };
}

/** The stored file keys of a card, for the file route (after its permission check). */
export async function getCertificationFileKeys(
  db: Knex,
  opts: { organisationId: number; id: number },
): Promise<{ cardKey: string | null; cardMime: string | null; thumbnailKey: string | null } | undefined> {
  const r = await db("certifications")
    .where({ id: opts.id, organisation_id: opts.organisationId })
    .first("card_file_key", "card_mime", "card_thumbnail_key");
  if (!r) return undefined;
  return { cardKey: r.card_file_key ?? null, cardMime: r.card_mime ?? null, thumbnailKey: r.card_thumbnail_key ?? null };
}

// --------------------------------------------------------------------------------------- decision

export interface CertificationDecisionResult {
  state: CertificationState;
  notificationId: number;
  holder: { id: number; name: string; email: string };
  types: CertificationType[];
  certifyingOrganisation: string;
  certificateNumber: string;
  reason: string | null;
}

/**
 * The officer's decision on a card awaiting verification: verified, or not accepted with a reason.
 * Only a pending card can be decided, and never by its own holder. Writes the state, the activity row
 * and the holder's in-app notification in one transaction; the caller sends the e-mail after it.
 */
export async function decideCertification(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: CertificationDecisionInput; now?: Date },
): Promise<CertificationDecisionResult> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const cert = await trx("certifications").where({ id: opts.id, organisation_id: actor.organisationId }).first();
    if (!cert) throw new RecordNotFoundError("No such certification card");
    if (cert.voided_at) throw new RecordConflictError("This card was withdrawn");
    if (Number(cert.user_id) === actor.userId) throw new ActionForbiddenError("Someone else must verify your own card");
    if (cert.state !== "pending") {
      throw new RecordConflictError(
        cert.state === "verified"
          ? "This card is already verified"
          : "This card was already not accepted; the technician uploads a new one",
      );
    }
    const holder = await trx("users").where({ id: cert.user_id }).first("id", "name", "email");
    const types = (await typesOf(trx, [Number(cert.id)])).get(Number(cert.id)) ?? [];
    const state: CertificationState = input.decision === "verify" ? "verified" : "rejected";
    const reason = input.decision === "reject" ? input.reason : null;
    // A concurrent decision loses here: the update only applies to a card still pending.
    const changed = await trx("certifications")
      .where({ id: cert.id, state: "pending" })
      .update({ state, verified_by: actor.userId, verified_at: at, rejection_reason: reason, updated_at: at });
    if (changed !== 1) throw new RecordConflictError("This card was decided by someone else a moment ago");

    const branch = await trx("memberships")
      .where({ user_id: cert.user_id, role: "technician" })
      .whereNotNull("branch_id")
      .orderBy("branch_id")
      .first("branch_id");
    const what = `${describeTypes(types)} card of ${holder.name} (${cert.certifying_organisation}, no. ${cert.certificate_number})`;
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch ? Number(branch.branch_id) : null,
      action: state === "verified" ? "certification.verified" : "certification.rejected",
      subjectType: "Certification",
      subjectId: Number(cert.id),
      summary: state === "verified" ? `Verified the ${what}` : `Did not accept the ${what}: ${reason}`,
      data: { state, reason, note: input.decision === "verify" ? (input.note ?? null) : null },
      at,
    });
    const notificationId = await createNotification(trx, {
      organisationId: actor.organisationId,
      userId: Number(cert.user_id),
      kind: state === "verified" ? "certification.verified" : "certification.rejected",
      title:
        state === "verified"
          ? `Your ${describeTypes(types)} certification card is verified`
          : `Your ${describeTypes(types)} certification card was not accepted`,
      body:
        state === "verified" ? "It now counts for the work you log." : `Reason: ${reason} Please upload a new photo or PDF of the card.`,
      link: `/certifications/${cert.id}`,
      subjectType: "Certification",
      subjectId: Number(cert.id),
      at,
    });
    return {
      state,
      notificationId,
      holder: { id: Number(holder.id), name: holder.name, email: holder.email },
      types,
      certifyingOrganisation: cert.certifying_organisation,
      certificateNumber: cert.certificate_number,
      reason,
    };
  });
}

// ------------------------------------------------------------------------------------ corrections

/**
 * Corrects a card's details as an amendment (who, when, why, previous and next values), types
 * included, in one transaction with the activity row. A withdrawn card cannot be corrected.
 */
export async function correctCertification(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: CertificationCorrectionInput; now?: Date },
): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const cert = await trx("certifications").where({ id: opts.id, organisation_id: actor.organisationId }).first();
    if (!cert) throw new RecordNotFoundError("No such certification card");
    if (cert.voided_at) throw new RecordConflictError("A withdrawn card cannot be corrected", "reason");

    const previous: Record<string, unknown> = {};
    const next: Record<string, unknown> = {};
    const columns: Array<[keyof CertificationCorrectionInput, string]> = [
      ["certifyingOrganisation", "certifying_organisation"],
      ["certificateNumber", "certificate_number"],
      ["issuedOn", "issued_on"],
    ];
    for (const [field, column] of columns) {
      const value = input[field];
      if (value === undefined) continue;
      if ((cert[column] ?? null) !== (value ?? null)) {
        previous[column] = cert[column] ?? null;
        next[column] = value ?? null;
      }
    }
    const currentTypes = (await typesOf(trx, [Number(cert.id)])).get(Number(cert.id)) ?? [];
    let newTypes: CertificationType[] | null = null;
    if (input.types !== undefined) {
      const wanted = sortTypes(input.types);
      if (wanted.join(",") !== currentTypes.join(",")) {
        previous.types = currentTypes;
        next.types = wanted;
        newTypes = wanted;
      }
    }
    if (Object.keys(next).length === 0) throw new InvalidInputError("Nothing was changed", "reason");

    const update: Record<string, unknown> = { updated_at: at };
    for (const [column, value] of Object.entries(next)) if (column !== "types") update[column] = value;
    await trx("certifications").where({ id: cert.id }).update(update);
    if (newTypes) {
      await trx("certification_types").where({ certification_id: cert.id }).delete();
      await trx("certification_types").insert(
        newTypes.map((type) => ({ certification_id: cert.id, organisation_id: actor.organisationId, type })),
      );
    }
    const branch = await trx("memberships")
      .where({ user_id: cert.user_id, role: "technician" })
      .whereNotNull("branch_id")
      .orderBy("branch_id")
      .first("branch_id");
    const branchId = branch ? Number(branch.branch_id) : null;
    const [inserted] = await trx("amendments")
      .insert({
        organisation_id: actor.organisationId,
        branch_id: branchId,
        subject_type: "Certification",
        subject_id: Number(cert.id),
        actor_id: actor.userId,
        at,
        reason: input.reason,
        previous: JSON.stringify(previous),
        next: JSON.stringify(next),
      })
      .returning("id");
    const amendmentId = rowId(inserted);
    const holder = await trx("users").where({ id: cert.user_id }).first("name");
    const words: Record<string, string> = {
      certifying_organisation: "certifying organisation",
      certificate_number: "certificate number",
      issued_on: "issue date",
      types: "certification type",
    };
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId,
      action: "certification.amended",
      subjectType: "Certification",
      subjectId: Number(cert.id),
      summary: `Corrected the ${Object.keys(next)
        .map((k) => words[k] ?? k)
        .join(", ")} of ${holder?.name ?? "a technician"}'s certification card: ${input.reason}`,
      data: { amendmentId, fields: Object.keys(next), reason: input.reason },
      at,
    });
    return amendmentId;
  });
}

/** Withdraws a card entered in error (voided with a reason; the row and its history stay). */
export async function withdrawCertification(db: Knex, opts: { actor: ActorRef; id: number; reason: string; now?: Date }): Promise<void> {
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const cert = await trx("certifications as c")
      .join("users as u", "u.id", "c.user_id")
      .where({ "c.id": opts.id, "c.organisation_id": opts.actor.organisationId })
      .first("c.id", "u.name", "c.certificate_number");
    if (!cert) throw new RecordNotFoundError("No such certification card");
    await voidRecord(trx, {
      table: "certifications",
      subjectType: "Certification",
      id: opts.id,
      organisationId: opts.actor.organisationId,
      actorId: opts.actor.userId,
      reason: opts.reason,
      summary: `Withdrew ${cert.name}'s certification card no. ${cert.certificate_number}: ${opts.reason.trim()}`,
      at,
    });
  });
}
