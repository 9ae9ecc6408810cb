import type { Knex } from "knex";
import {
  BRANCH_ROLES,
  ROLE_LABELS,
  ROLE_RANK,
  type ActivityListQuery,
  type CertificationState,
  type CertificationType,
  type PeopleListQuery,
  type PersonAccessInput,
  type PersonStatus,
  type Role,
} from "@coldtrail/core";
import { appendActivity } from "../activity";
import { endUserSessions } from "../sessions";
import { ActionForbiddenError, InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { toBool, type ActorRef, type ScopeFn } from "../types";
import { countRows, whereContains } from "../paging";

/**
 * Who may see a person is decided by the ability on "User" (and on "Certification" for their cards),
 * whose conditions name the organisation and the branch. A person belongs to a branch through each
 * membership, and to the organisation as a whole; this derived table has one row per membership plus
 * one organisation-wide row per user, as `pb(user_id, organisation_id, branch_id)`, so
 * `scopeByAbility(ability, "read", "User", "pb")` can be applied to it with an `exists`.
 * UNION ALL of two plain selects: the same SQL on SQLite and PostgreSQL.
 */
export function personBranchRows(db: Knex): Knex.QueryBuilder {
  return db
    .select("m.user_id", "m.organisation_id", "m.branch_id")
    .from("memberships as m")
    .unionAll(function orgRow(this: Knex.QueryBuilder) {
      this.select("u.id as user_id", "u.organisation_id", db.raw("null as branch_id")).from("users as u");
    });
}

/** Restricts `qb` to rows whose `userColumn` is a person the scope (applied to `pb`) allows. */
export function wherePersonInScope(db: Knex, qb: Knex.QueryBuilder, userColumn: string, scope: ScopeFn): void {
  qb.whereExists(function visible(this: Knex.QueryBuilder) {
    this.select(db.raw("1"))
      .from(personBranchRows(db).as("pb"))
      .whereRaw(`pb.user_id = ${userColumn}`)
      .where((w) => scope(w));
  });
}

export interface PersonBranch {
  id: number;
  name: string;
  code: string;
  archived: boolean;
}

export interface PersonMembership {
  role: Role;
  branchId: number | null;
}

export interface PersonRow {
  id: number;
  organisationId: number;
  name: string;
  email: string;
  status: PersonStatus;
  roles: Role[];
  branches: PersonBranch[];
  memberships: PersonMembership[];
  createdAt: string;
  deactivatedAt: string | null;
}

export interface PeoplePage {
  rows: PersonRow[];
  total: number;
  page: number;
  pageSize: number;
}

export interface PendingInvitation {
  id: number;
  createdAt: string;
  expiresAt: string;
  expired: boolean;
  invitedByName: string;
}

export interface PersonDetail extends PersonRow {
  invitation: PendingInvitation | null;
}

const SORT_COLUMNS: Record<PeopleListQuery["sort"], string> = {
  name: "u.name",
  email: "u.email",
  createdAt: "u.created_at",
};

export function personStatus(row: { active: unknown; password_hash?: string | null; has_password?: unknown }): PersonStatus {
  if (!toBool(row.active)) return "deactivated";
  const hasPassword = row.has_password !== undefined ? toBool(row.has_password) : Boolean(row.password_hash);
  return hasPassword ? "active" : "invited";
}

const PERSON_COLUMNS = ["u.id", "u.organisation_id", "u.name", "u.email", "u.active", "u.created_at", "u.deactivated_at"];

/** Roles and branches of the given users, in role rank order. */
async function membershipsOf(db: Knex, userIds: number[]) {
  if (userIds.length === 0) return new Map<number, { memberships: PersonMembership[]; branches: PersonBranch[] }>();
  const rows = await db("memberships as m")
    .leftJoin("branches as b", "b.id", "m.branch_id")
    .whereIn("m.user_id", userIds)
    .orderBy([{ column: "m.user_id" }, { column: "b.name" }, { column: "m.id" }])
    .select("m.user_id", "m.role", "m.branch_id", "b.name as branch_name", "b.code as branch_code", "b.archived_at as branch_archived_at");
  const out = new Map<number, { memberships: PersonMembership[]; branches: PersonBranch[] }>();
  for (const r of rows) {
    const uid = Number(r.user_id);
    const entry = out.get(uid) ?? { memberships: [], branches: [] };
    const branchId = r.branch_id === null ? null : Number(r.branch_id);
    entry.memberships.push({ role: r.role as Role, branchId });
    if (branchId !== null && !entry.branches.some((b) => b.id === branchId)) {
      entry.branches.push({ id: branchId, name: r.branch_name, code: r.branch_code, archived: Boolean(r.branch_archived_at) });
    }
    out.set(uid, entry);
  }
  return out;
}

function rolesIn(memberships: PersonMembership[]): Role[] {
  const roles = [...new Set(memberships.map((m) => m.role))];
  return roles.sort((a, b) => ROLE_RANK[b] - ROLE_RANK[a]);
}

function toPerson(r: any, m?: { memberships: PersonMembership[]; branches: PersonBranch[] }): PersonRow {
  const memberships = m?.memberships ?? [];
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    name: r.name,
    email: r.email,
    status: personStatus(r),
    roles: rolesIn(memberships),
    branches: m?.branches ?? [],
    memberships,
    createdAt: r.created_at,
    deactivatedAt: r.deactivated_at ?? null,
  };
}

/** One page of the people the scope allows (scope applied to `pb`, see `personBranchRows`). */
export async function listPeople(db: Knex, opts: { scope: ScopeFn; query: PeopleListQuery }): Promise<PeoplePage> {
  const { query } = opts;
  const filtered = (qb: Knex.QueryBuilder) => {
    wherePersonInScope(db, qb, "u.id", opts.scope);
    if (query.q) {
      whereContains(qb, query.q, ["u.name", "u.email"]);
    }
    if (query.role || query.branchId) {
      qb.whereExists(function hasMembership(this: Knex.QueryBuilder) {
        this.select(db.raw("1")).from("memberships as fm").whereRaw("fm.user_id = u.id");
        if (query.role) this.where("fm.role", query.role);
        if (query.branchId) this.where("fm.branch_id", query.branchId);
      });
    }
    if (query.status === "deactivated") qb.where("u.active", false);
    if (query.status === "active") qb.where("u.active", true).whereNotNull("u.password_hash");
    if (query.status === "invited") qb.where("u.active", true).whereNull("u.password_hash");
    return qb;
  };
  const total = await countRows(filtered(db("users as u")));
  const rows: any[] = await filtered(db("users as u"))
    .select([...PERSON_COLUMNS, db.raw("case when u.password_hash is null then 0 else 1 end as has_password")])
    .orderBy(SORT_COLUMNS[query.sort], query.dir)
    .orderBy("u.id", query.dir)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  const m = await membershipsOf(
    db,
    rows.map((r) => Number(r.id)),
  );
  return {
    rows: rows.map((r) => toPerson(r, m.get(Number(r.id)))),
    total,
    page: query.page,
    pageSize: query.pageSize,
  };
}

/** One person the scope allows, with their pending invitation if any; undefined otherwise. */
export async function getPerson(db: Knex, opts: { scope: ScopeFn; id: number; now?: Date }): Promise<PersonDetail | undefined> {
  const qb = db("users as u").where("u.id", opts.id);
  wherePersonInScope(db, qb, "u.id", opts.scope);
  const r = await qb.first([...PERSON_COLUMNS, db.raw("case when u.password_hash is null then 0 else 1 end as has_password")]);
  if (!r) return undefined;
  const m = await membershipsOf(db, [Number(r.id)]);
  const person = toPerson(r, m.get(Number(r.id)));
  let invitation: PendingInvitation | null = null;
  if (person.status === "invited") {
    const inv = await db("invitations as i")
      .join("users as by", "by.id", "i.invited_by")
      .where("i.organisation_id", person.organisationId)
      .where("i.email", person.email)
      .whereNull("i.used_at")
      .whereNull("i.revoked_at")
      .orderBy("i.id", "desc")
      .first("i.id", "i.created_at", "i.expires_at", "by.name as invited_by_name");
    if (inv) {
      invitation = {
        id: Number(inv.id),
        createdAt: inv.created_at,
        expiresAt: inv.expires_at,
        expired: new Date(inv.expires_at).getTime() <= (opts.now ?? new Date()).getTime(),
        invitedByName: inv.invited_by_name,
      };
    }
  }
  return { ...person, invitation };
}

// ------------------------------------------------------------------------------------- describing

/** "Branch manager (Tucson, Denver), Technician (Tucson)" — roles in rank order with their branches. */
export function describeAccess(memberships: PersonMembership[], branchNames: Map<number, string>): string {
  if (memberships.length === 0) return "no role";
  return rolesIn(memberships)
    .map((role) => {
      const branches = memberships
        .filter((m) => m.role === role && m.branchId !== null)
        .map((m) => branchNames.get(m.branchId as number) ?? `branch ${m.branchId}`)
        .sort();
      return branches.length ? `${ROLE_LABELS[role]} (${branches.join(", ")})` : ROLE_LABELS[role];
    })
    .join(", ");
}

export async function branchNamesOf(trx: Knex | Knex.Transaction, organisationId: number): Promise<Map<number, string>> {
  const rows = await trx("branches").where({ organisation_id: organisationId }).select("id", "name");
  return new Map(rows.map((b) => [Number(b.id), b.name as string]));
}

/** The memberships an access input stands for: organisation roles once, branch roles in each branch. */
export function membershipsFor(input: Pick<PersonAccessInput, "roles" | "branchIds">): PersonMembership[] {
  const out: PersonMembership[] = [];
  const branchIds = [...new Set(input.branchIds)].sort((a, b) => a - b);
  for (const role of input.roles) {
    if (BRANCH_ROLES.includes(role)) for (const branchId of branchIds) out.push({ role, branchId });
    else out.push({ role, branchId: null });
  }
  return out;
}

const key = (m: PersonMembership) => `${m.role}|${m.branchId ?? "org"}`;

/**
 * Branches named in an access change must be the organisation's; ones not held before must be open
 * (an archived branch keeps its people, but nobody new joins it).
 */
export async function checkBranches(
  trx: Knex.Transaction,
  organisationId: number,
  branchIds: number[],
  alreadyHeld: Set<number> = new Set(),
) {
  if (branchIds.length === 0) return;
  const rows = await trx("branches")
    .where({ organisation_id: organisationId })
    .whereIn("id", branchIds)
    .select("id", "name", "archived_at");
  if (rows.length !== new Set(branchIds).size) throw new InvalidInputError("Choose branches of your organisation", "branchIds");
  const archived = rows.find((b) => b.archived_at && !alreadyHeld.has(Number(b.id)));
  if (archived) throw new RecordConflictError(`${archived.name} is archived; nobody new can join it`, "branchIds");
}

/** The actor's highest role rank, read in the transaction. */
export async function actorRank(trx: Knex.Transaction, actor: ActorRef): Promise<number> {
  const rows = await trx("memberships").where({ user_id: actor.userId, organisation_id: actor.organisationId }).select("role");
  return Math.max(-1, ...rows.map((r) => ROLE_RANK[r.role as Role] ?? -1));
}

export function refuseAboveOwnRank(rank: number, roles: readonly Role[]): void {
  const highest = roles.reduce((m, r) => Math.max(m, ROLE_RANK[r]), -1);
  if (highest > rank) throw new ActionForbiddenError("You cannot give a role above your own", "roles");
}

/** Active owners who can sign in, other than `exceptUserId`. */
async function otherOwners(trx: Knex.Transaction, organisationId: number, exceptUserId: number): Promise<number> {
  const row = await trx("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where({ "m.organisation_id": organisationId, "m.role": "owner", "u.active": true })
    .whereNotNull("u.password_hash")
    .whereNot("u.id", exceptUserId)
    .countDistinct({ n: "u.id" })
    .first();
  return Number(row?.n ?? 0);
}

async function loadTarget(trx: Knex.Transaction, organisationId: number, id: number) {
  const user = await trx("users").where({ id, organisation_id: organisationId }).first("id", "name", "email", "active", "password_hash");
  if (!user) throw new RecordNotFoundError("No such person");
  const memberships = (await trx("memberships").where({ user_id: id, organisation_id: organisationId }).select("role", "branch_id")).map(
    (m): PersonMembership => ({ role: m.role as Role, branchId: m.branch_id === null ? null : Number(m.branch_id) }),
  );
  return { user, memberships };
}

/**
 * Replaces a person's roles and branches. Guards: inspectors are managed under inspector access;
 * nobody gives a role above their own; nobody adds a role or a branch to themselves; the last owner
 * who can sign in keeps the owner role.
 */
export async function updatePersonAccess(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: PersonAccessInput; now?: Date },
): Promise<void> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const { user, memberships: current } = await loadTarget(trx, actor.organisationId, opts.id);
    if (current.some((m) => m.role === "inspector")) {
      throw new RecordConflictError("An inspector's access is given and withdrawn under Inspector access", "roles");
    }
    const next = membershipsFor(input);
    const currentKeys = new Set(current.map(key));
    const nextKeys = new Set(next.map(key));
    const added = next.filter((m) => !currentKeys.has(key(m)));
    const removed = current.filter((m) => !nextKeys.has(key(m)));
    if (added.length === 0 && removed.length === 0) return;

    // On yourself you may only remove roles or branches, or step down to a lower role: never widen.
    const rank = (ms: PersonMembership[]) => ms.reduce((m, x) => Math.max(m, ROLE_RANK[x.role]), -1);
    const ownBranches = new Set(current.map((m) => m.branchId));
    const widens = rank(next) >= rank(current) || added.some((m) => !ownBranches.has(m.branchId));
    if (opts.id === actor.userId && added.length > 0 && widens) {
      throw new ActionForbiddenError("You cannot raise your own role or add branches to yourself; ask another owner", "roles");
    }
    refuseAboveOwnRank(await actorRank(trx, actor), input.roles);
    const held = new Set(current.filter((m) => m.branchId !== null).map((m) => m.branchId as number));
    await checkBranches(
      trx,
      actor.organisationId,
      input.branchIds.filter((b) => next.some((m) => m.branchId === b)),
      held,
    );

    const losesOwner = current.some((m) => m.role === "owner") && !next.some((m) => m.role === "owner");
    if (losesOwner && toBool(user.active) && user.password_hash && (await otherOwners(trx, actor.organisationId, opts.id)) === 0) {
      throw new RecordConflictError(`${user.name} is the last owner; make someone else an owner first`, "roles");
    }

    for (const m of removed) {
      const q = trx("memberships").where({ user_id: opts.id, organisation_id: actor.organisationId, role: m.role });
      if (m.branchId === null) q.whereNull("branch_id");
      else q.where("branch_id", m.branchId);
      await q.delete();
    }
    if (added.length) {
      await trx("memberships").insert(
        added.map((m) => ({
          organisation_id: actor.organisationId,
          user_id: opts.id,
          branch_id: m.branchId,
          role: m.role,
          created_at: at,
        })),
      );
    }
    const names = await branchNamesOf(trx, actor.organisationId);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: "person.access_changed",
      subjectType: "User",
      subjectId: opts.id,
      summary: `Changed ${user.name}'s access from ${describeAccess(current, names)} to ${describeAccess(next, names)}`,
      data: { before: current, after: next },
      at,
    });
  });
}

/**
 * Deactivates a person (they can no longer sign in; their records and history stay) or lets them in
 * again. Nobody deactivates themselves, and the last owner who can sign in stays active.
 */
export async function setPersonActive(db: Knex, opts: { actor: ActorRef; id: number; active: boolean; now?: Date }): Promise<void> {
  const { actor } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const { user, memberships } = await loadTarget(trx, actor.organisationId, opts.id);
    const isActive = toBool(user.active);
    if (isActive === opts.active) {
      throw new RecordConflictError(opts.active ? `${user.name} can already sign in` : `${user.name} is already deactivated`);
    }
    if (!opts.active) {
      if (opts.id === actor.userId) throw new ActionForbiddenError("You cannot deactivate yourself; ask another owner");
      if (
        memberships.some((m) => m.role === "owner") &&
        user.password_hash &&
        (await otherOwners(trx, actor.organisationId, opts.id)) === 0
      ) {
        throw new RecordConflictError(`${user.name} is the last owner; make someone else an owner first`);
      }
    } else {
      refuseAboveOwnRank(
        await actorRank(trx, actor),
        memberships.map((m) => m.role),
      );
    }
    await trx("users")
      .where({ id: opts.id })
      .update({ active: opts.active, deactivated_at: opts.active ? null : at });
    if (!opts.active) {
      // Links already sent stop working with the account.
      await trx("invitations")
        .where({ organisation_id: actor.organisationId, email: user.email })
        .whereNull("used_at")
        .whereNull("revoked_at")
        .update({ revoked_at: at });
      await trx("password_reset_tokens").where({ user_id: opts.id }).whereNull("used_at").update({ used_at: at });
      await endUserSessions(trx, { userId: opts.id, reason: "deactivated", now: opts.now });
    }
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: opts.active ? "person.reactivated" : "person.deactivated",
      subjectType: "User",
      subjectId: opts.id,
      summary: opts.active
        ? `Let ${user.name} sign in again`
        : `Deactivated ${user.name}: they can no longer sign in; their records and history stay`,
      at,
    });
  });
}

// -------------------------------------------------------------------------------- certifications

export interface PersonCertification {
  id: number;
  certifyingOrganisation: string;
  certificateNumber: string;
  issuedOn: string | null;
  types: CertificationType[];
  state: CertificationState;
  verifiedAt: string | null;
  verifiedByName: string | null;
  rejectionReason: string | null;
  uploadedAt: string;
}

/**
 * A person's certifications (voided ones left out) that the scope allows. The scope is the ability on
 * "Certification" applied to `pb` (see `personBranchRows`): a card is seen in its holder's branches.
 */
export async function listPersonCertifications(db: Knex, opts: { scope: ScopeFn; userId: number }): Promise<PersonCertification[]> {
  const qb = db("certifications as c")
    .leftJoin("users as v", "v.id", "c.verified_by")
    .where("c.user_id", opts.userId)
    .whereNull("c.voided_at");
  wherePersonInScope(db, qb, "c.user_id", opts.scope);
  const rows = await qb
    .orderBy([
      { column: "c.uploaded_at", order: "desc" },
      { column: "c.id", order: "desc" },
    ])
    .select(
      "c.id",
      "c.certifying_organisation",
      "c.certificate_number",
      "c.issued_on",
      "c.state",
      "c.verified_at",
      "v.name as verified_by_name",
      "c.rejection_reason",
      "c.uploaded_at",
    )
    .limit(200);
  const types = rows.length
    ? await db("certification_types")
        .whereIn(
          "certification_id",
          rows.map((r) => r.id),
        )
        .orderBy(["certification_id", "type"])
        .select("certification_id", "type") // same order in both dialects
    : [];
  return rows.map((r) => ({
    id: Number(r.id),
    certifyingOrganisation: r.certifying_organisation,
    certificateNumber: r.certificate_number,
    issuedOn: r.issued_on ?? null,
    types: types.filter((t) => Number(t.certification_id) === Number(r.id)).map((t) => t.type as CertificationType),
    state: r.state as CertificationState,
    verifiedAt: r.verified_at ?? null,
    verifiedByName: r.verified_by_name ?? null,
    rejectionReason: r.rejection_reason ?? null,
    uploadedAt: r.uploaded_at,
  }));
}

// ------------------------------------------------------------------------------------------ history

export interface ActivityRow {
  id: number;
  at: string;
  action: string;
  summary: string;
  actorName: string | null;
}

export interface ActivityPage {
  rows: ActivityRow[];
  total: number;
  page: number;
  pageSize: number;
}

/** One page of the history of one record, newest first; the scope sees the table as `activity`. */
export async function listRecordActivity(
  db: Knex,
  opts: { scope: ScopeFn; subjectType: string; subjectId: number; query: ActivityListQuery },
): Promise<ActivityPage> {
  const filtered = (qb: Knex.QueryBuilder) =>
    qb.where((w) => opts.scope(w)).where({ "activity.subject_type": opts.subjectType, "activity.subject_id": opts.subjectId });
  const countRow = await filtered(db("activity as activity")).count({ n: "*" }).first();
  const rows: any[] = await filtered(db("activity as activity").leftJoin("users as who", "who.id", "activity.actor_id"))
    .orderBy([
      { column: "activity.at", order: "desc" },
      { column: "activity.id", order: "desc" },
    ])
    .limit(opts.query.pageSize)
    .offset((opts.query.page - 1) * opts.query.pageSize)
    .select("activity.id", "activity.at", "activity.action", "activity.summary", "who.name as actor_name");
  return {
    rows: rows.map((r) => ({ id: Number(r.id), at: r.at, action: r.action, summary: r.summary, actorName: r.actor_name ?? null })),
    total: Number(countRow?.n ?? 0),
    page: opts.query.page,
    pageSize: opts.query.pageSize,
  };
}
