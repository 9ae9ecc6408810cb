import type { Knex } from "knex";
import type { GrantListQuery, GrantState, InspectorGrantInput, PersonStatus } from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { toBool, type ActorRef, type ScopeFn } from "../types";
import { issueInvitation } from "./invitations";
import { checkBranches, personStatus } from "./people";

export interface GrantBranch {
  id: number;
  name: string;
}

export interface InspectorGrantRow {
  id: number;
  organisationId: number;
  userId: number;
  inspectorName: string;
  inspectorEmail: string;
  inspectorStatus: PersonStatus;
  branches: GrantBranch[];
  recordsFrom: string;
  recordsTo: string;
  expiresAt: string;
  revokedAt: string | null;
  revokedByName: string | null;
  grantedByName: string;
  note: string | null;
  createdAt: string;
  state: GrantState;
}

export interface InspectorGrantPage {
  rows: InspectorGrantRow[];
  total: number;
  page: number;
  pageSize: number;
}

export function grantState(row: { revoked_at?: string | null; expires_at: string }, now: Date): GrantState {
  if (row.revoked_at) return "revoked";
  return new Date(row.expires_at).getTime() <= now.getTime() ? "expired" : "active";
}

/** An access given "until 2027-03-31" ends when that day ends (UTC). */
export function grantExpiry(expiresOn: string): string {
  return `${expiresOn}T23:59:59.999Z`;
}

/** Which organisation an inspector access belongs to (for the record-level permission check). */
export async function getInspectorGrantRef(
  db: Knex,
  id: number,
): Promise<{ id: number; organisationId: number; userId: number } | undefined> {
  const row = await db("inspector_grants").where({ id }).first("id", "organisation_id", "user_id");
  return row ? { id: Number(row.id), organisationId: Number(row.organisation_id), userId: Number(row.user_id) } : undefined;
}

/** One page of inspector access the scope allows (the scope sees the table as `g`), newest first. */
export async function listInspectorGrants(
  db: Knex,
  opts: { scope: ScopeFn; query: GrantListQuery; now?: Date },
): Promise<InspectorGrantPage> {
  const { query } = opts;
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  const filtered = (qb: Knex.QueryBuilder) => {
    qb.where((w) => opts.scope(w));
    if (query.userId) qb.where("g.user_id", query.userId);
    if (query.state === "revoked") qb.whereNotNull("g.revoked_at");
    if (query.state === "active") qb.whereNull("g.revoked_at").where("g.expires_at", ">", at);
    if (query.state === "expired") qb.whereNull("g.revoked_at").where("g.expires_at", "<=", at);
    return qb;
  };
  const countRow = await filtered(db("inspector_grants as g")).count({ n: "*" }).first();
  const rows: any[] = await filtered(
    db("inspector_grants as g")
      .join("users as i", "i.id", "g.user_id")
      .join("users as by", "by.id", "g.granted_by")
      .leftJoin("users as rv", "rv.id", "g.revoked_by"),
  )
    .orderBy([
      { column: "g.created_at", order: "desc" },
      { column: "g.id", order: "desc" },
    ])
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .select(
      "g.*",
      "i.name as inspector_name",
      "i.email as inspector_email",
      "i.active as inspector_active",
      db.raw("case when i.password_hash is null then 0 else 1 end as inspector_has_password"),
      "by.name as granted_by_name",
      "rv.name as revoked_by_name",
    );
  const branches = rows.length
    ? await db("inspector_grant_branches as gb")
        .join("branches as b", "b.id", "gb.branch_id")
        .whereIn(
          "gb.grant_id",
          rows.map((r) => r.id),
        )
        .orderBy("b.name")
        .select("gb.grant_id", "b.id", "b.name")
    : [];
  return {
    rows: rows.map((r) => ({
      id: Number(r.id),
      organisationId: Number(r.organisation_id),
      userId: Number(r.user_id),
      inspectorName: r.inspector_name,
      inspectorEmail: r.inspector_email,
      inspectorStatus: personStatus({ active: r.inspector_active, has_password: r.inspector_has_password }),
      branches: branches.filter((b) => Number(b.grant_id) === Number(r.id)).map((b) => ({ id: Number(b.id), name: b.name })),
      recordsFrom: r.records_from,
      recordsTo: r.records_to,
      expiresAt: r.expires_at,
      revokedAt: r.revoked_at ?? null,
      revokedByName: r.revoked_by_name ?? null,
      grantedByName: r.granted_by_name,
      note: r.note ?? null,
      createdAt: r.created_at,
      state: grantState(r, now),
    })),
    total: Number(countRow?.n ?? 0),
    page: query.page,
    pageSize: query.pageSize,
  };
}

export interface CreatedGrant {
  grantId: number;
  userId: number;
  inspectorName: string;
  email: string;
  /** "invited": a new account with a link to set a password; "notified": an inspector who can already sign in. */
  kind: "invited" | "notified";
  token?: string;
  invitationExpiresAt?: string;
  organisationName: string;
  grantedByName: string;
  branchNames: string[];
  recordsFrom: string;
  recordsTo: string;
  expiresAt: string;
}

/**
 * Lets an outside inspector read chosen branches' records dated within a window, until an expiry.
 * A new address gets an account (inspector role, no password yet) and an invitation link that lasts
 * no longer than the access; an inspector who already has an account is notified. The company's own
 * people cannot be made inspectors, and an address of another organisation cannot be used.
 */
export async function createInspectorGrant(
  db: Knex,
  opts: { actor: ActorRef; input: InspectorGrantInput; now?: Date },
): Promise<CreatedGrant> {
  const { actor, input } = opts;
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  const expiresAt = grantExpiry(input.expiresOn);
  if (new Date(expiresAt).getTime() <= now.getTime()) throw new InvalidInputError("Access must end today or later", "expiresOn");
  if (input.recordsFrom > input.recordsTo)
    throw new InvalidInputError("The last date of records must be on or after the first", "recordsTo");

  return db.transaction(async (trx) => {
    const branchIds = [...new Set(input.branchIds)];
    // Archived branches may be reviewed: their records stay for past periods.
    await checkBranches(trx, actor.organisationId, branchIds, new Set(branchIds));

    let kind: CreatedGrant["kind"] = "notified";
    let user = await trx("users").where({ email: input.email }).first("id", "organisation_id", "name", "email", "active", "password_hash");
    if (user) {
      if (Number(user.organisation_id) !== actor.organisationId) {
        throw new RecordConflictError("That e-mail address already belongs to another Coldtrail account", "email");
      }
      const roles = (await trx("memberships").where({ user_id: user.id }).select("role")).map((m) => m.role as string);
      if (roles.some((r) => r !== "inspector")) {
        throw new RecordConflictError(`${user.name} works in your organisation; inspector access is for outside reviewers`, "email");
      }
      if (!toBool(user.active))
        throw new RecordConflictError(`${user.name}'s account is deactivated; ask the owner to let them sign in again`, "email");
      if (roles.length === 0) {
        await trx("memberships").insert({
          organisation_id: actor.organisationId,
          user_id: user.id,
          branch_id: null,
          role: "inspector",
          created_at: at,
        });
      }
      if (!user.password_hash) kind = "invited";
    } else {
      const [row] = await trx("users")
        .insert({
          organisation_id: actor.organisationId,
          email: input.email,
          name: input.name,
          password_hash: null,
          active: true,
          created_at: at,
          deactivated_at: null,
        })
        .returning("id");
      const id = rowId(row);
      await trx("memberships").insert({
        organisation_id: actor.organisationId,
        user_id: id,
        branch_id: null,
        role: "inspector",
        created_at: at,
      });
      user = { id, organisation_id: actor.organisationId, name: input.name, email: input.email, active: true, password_hash: null };
      kind = "invited";
    }
    const userId = Number(user.id);

    const [grantRow] = await trx("inspector_grants")
      .insert({
        organisation_id: actor.organisationId,
        user_id: userId,
        granted_by: actor.userId,
        records_from: input.recordsFrom,
        records_to: input.recordsTo,
        expires_at: expiresAt,
        revoked_at: null,
        revoked_by: null,
        note: input.note || null,
        created_at: at,
      })
      .returning("id");
    const grantId = rowId(grantRow);
    await trx("inspector_grant_branches").insert(
      branchIds.map((branchId) => ({ grant_id: grantId, branch_id: branchId, organisation_id: actor.organisationId })),
    );

    let issued: { token: string; expiresAt: string } | undefined;
    if (kind === "invited") {
      issued = await issueInvitation(trx, {
        organisationId: actor.organisationId,
        invitedBy: actor.userId,
        user: { id: userId, email: user.email, name: user.name },
        memberships: [{ role: "inspector", branchId: null }],
        inspectorGrantId: grantId,
        validUntil: new Date(expiresAt),
        now,
      });
    }

    const branchRows = await trx("branches").whereIn("id", branchIds).orderBy("name").select("name");
    const branchNames = branchRows.map((b) => b.name as string);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: "inspector_grant.created",
      subjectType: "InspectorGrant",
      subjectId: grantId,
      summary: `Gave ${user.name} <${user.email}> read access to ${branchNames.join(", ")}: records dated ${input.recordsFrom} to ${input.recordsTo}, until ${input.expiresOn}${kind === "invited" ? "; an invitation was sent" : ""}`,
      data: { userId, branchIds, recordsFrom: input.recordsFrom, recordsTo: input.recordsTo, expiresAt },
      at,
    });
    if (kind === "invited") {
      await appendActivity(trx, {
        organisationId: actor.organisationId,
        actorId: actor.userId,
        action: "person.invited",
        subjectType: "User",
        subjectId: userId,
        summary: `Invited ${user.name} <${user.email}> as Inspector (access ${grantId})`,
        data: { grantId },
        at,
      });
    }
    const org = await trx("organisations").where({ id: actor.organisationId }).first("name");
    const by = await trx("users").where({ id: actor.userId }).first("name");
    return {
      grantId,
      userId,
      inspectorName: user.name,
      email: user.email,
      kind,
      ...(issued && { token: issued.token, invitationExpiresAt: issued.expiresAt }),
      organisationName: org?.name ?? "",
      grantedByName: by?.name ?? "",
      branchNames,
      recordsFrom: input.recordsFrom,
      recordsTo: input.recordsTo,
      expiresAt,
    };
  });
}

/**
 * Withdraws an inspector's access at once. A link still waiting to be accepted for that access stops
 * working unless the inspector holds another open access.
 */
export async function revokeInspectorGrant(db: Knex, opts: { actor: ActorRef; id: number; now?: Date }): Promise<void> {
  const { actor } = opts;
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  await db.transaction(async (trx) => {
    const grant = await trx("inspector_grants as g")
      .join("users as i", "i.id", "g.user_id")
      .where({ "g.id": opts.id, "g.organisation_id": actor.organisationId })
      .first("g.*", "i.name as inspector_name", "i.email as inspector_email");
    if (!grant) throw new RecordNotFoundError("No such inspector access");
    const state = grantState(grant, now);
    if (state === "revoked") throw new RecordConflictError("This access was already withdrawn");
    if (state === "expired") throw new RecordConflictError("This access has already ended");

    const updated = await trx("inspector_grants")
      .where({ id: opts.id })
      .whereNull("revoked_at")
      .update({ revoked_at: at, revoked_by: actor.userId });
    if (updated !== 1) throw new RecordConflictError("This access was already withdrawn");
    const otherOpen = await trx("inspector_grants")
      .where({ user_id: grant.user_id, organisation_id: actor.organisationId })
      .whereNull("revoked_at")
      .where("expires_at", ">", at)
      .first("id");
    if (!otherOpen) {
      await trx("invitations")
        .where({ organisation_id: actor.organisationId, email: grant.inspector_email })
        .whereNull("used_at")
        .whereNull("revoked_at")
        .update({ revoked_at: at });
    }
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: "inspector_grant.revoked",
      subjectType: "InspectorGrant",
      subjectId: opts.id,
      summary: `Withdrew ${grant.inspector_name}'s access (records ${grant.records_from} to ${grant.records_to}); it ends at once`,
      at,
    });
  });
}
