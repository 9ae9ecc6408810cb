import type { Knex } from "knex";
import { INVITATION_VALID_DAYS, ROLE_LABELS, type AcceptInvitationInput, type InvitationInput, type Role } from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { RecordConflictError, RecordNotFoundError } from "../errors";
import { hashPassword } from "../passwords";
import { endUserSessions } from "../sessions";
import { toBool, type ActorRef } from "../types";
import {
  actorRank,
  branchNamesOf,
  checkBranches,
  describeAccess,
  membershipsFor,
  refuseAboveOwnRank,
  type PersonMembership,
} from "./people";
import { addMinutes, hashLinkToken, linkState, newLinkToken, type LinkState } from "./tokens";

/** What the invitation e-mail needs; the token exists only here and in the e-mail. */
export interface IssuedInvitation {
  userId: number;
  invitationId: number;
  token: string;
  email: string;
  name: string;
  expiresAt: string;
  organisationName: string;
  invitedByName: string;
  /** "Branch manager (Tucson)" */
  access: string;
}

async function organisationName(trx: Knex.Transaction | Knex, organisationId: number): Promise<string> {
  const org = await trx("organisations").where({ id: organisationId }).first("name");
  return org?.name ?? "your organisation";
}

async function actorName(trx: Knex.Transaction | Knex, userId: number): Promise<string> {
  const u = await trx("users").where({ id: userId }).first("name");
  return u?.name ?? "Someone";
}

/** An e-mail address that already has a Coldtrail account cannot be invited again. */
export async function refuseTakenEmail(trx: Knex.Transaction, organisationId: number, email: string): Promise<void> {
  const existing = await trx("users").where({ email }).first("id", "organisation_id", "name", "active");
  if (!existing) return;
  if (Number(existing.organisation_id) === organisationId) {
    throw new RecordConflictError(
      toBool(existing.active)
        ? `${existing.name} already has an account with this address; change their roles instead`
        : `${existing.name} has a deactivated account with this address; let them sign in again instead`,
      "email",
    );
  }
  throw new RecordConflictError("That e-mail address already belongs to another Coldtrail account", "email");
}

/**
 * Writes a new invitation link for a user who has not set a password yet; earlier links still open
 * for that address are withdrawn, so only the newest works.
 */
export async function issueInvitation(
  trx: Knex.Transaction,
  opts: {
    organisationId: number;
    invitedBy: number;
    user: { id: number; email: string; name: string };
    memberships: PersonMembership[];
    inspectorGrantId?: number | null;
    validUntil?: Date;
    now: Date;
  },
): Promise<{ invitationId: number; token: string; expiresAt: string }> {
  const at = opts.now.toISOString();
  await trx("invitations")
    .where({ organisation_id: opts.organisationId, email: opts.user.email })
    .whereNull("used_at")
    .whereNull("revoked_at")
    .update({ revoked_at: at });
  const token = newLinkToken();
  let expires = addMinutes(opts.now, INVITATION_VALID_DAYS * 24 * 60);
  if (opts.validUntil && opts.validUntil.getTime() < expires.getTime()) expires = opts.validUntil;
  const [row] = await trx("invitations")
    .insert({
      organisation_id: opts.organisationId,
      email: opts.user.email,
      name: opts.user.name,
      memberships: JSON.stringify(opts.memberships),
      inspector_grant_id: opts.inspectorGrantId ?? null,
      invited_by: opts.invitedBy,
      token_hash: hashLinkToken(token),
      expires_at: expires.toISOString(),
      used_at: null,
      revoked_at: null,
      accepted_user_id: null,
      created_at: at,
    })
    .returning("id");
  return { invitationId: rowId(row), token, expiresAt: expires.toISOString() };
}

/**
 * Invites a person: their account (without a password, so it cannot sign in yet), their roles and
 * branches, and a single-use link that expires. The returned token goes into the e-mail only.
 */
export async function createInvitation(db: Knex, opts: { actor: ActorRef; input: InvitationInput; now?: Date }): Promise<IssuedInvitation> {
  const { actor, input } = opts;
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  return db.transaction(async (trx) => {
    await refuseTakenEmail(trx, actor.organisationId, input.email);
    refuseAboveOwnRank(await actorRank(trx, actor), input.roles);
    const memberships = membershipsFor(input);
    await checkBranches(trx, actor.organisationId, [
      ...new Set(memberships.filter((m) => m.branchId !== null).map((m) => m.branchId as number)),
    ]);

    const [userRow] = await trx("users")
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
    const userId = rowId(userRow);
    await trx("memberships").insert(
      memberships.map((m) => ({
        organisation_id: actor.organisationId,
        user_id: userId,
        branch_id: m.branchId,
        role: m.role,
        created_at: at,
      })),
    );
    const issued = await issueInvitation(trx, {
      organisationId: actor.organisationId,
      invitedBy: actor.userId,
      user: { id: userId, email: input.email, name: input.name },
      memberships,
      now,
    });
    const access = describeAccess(memberships, await branchNamesOf(trx, actor.organisationId));
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: "person.invited",
      subjectType: "User",
      subjectId: userId,
      summary: `Invited ${input.name} <${input.email}> as ${access}; the link expires ${issued.expiresAt.slice(0, 16).replace("T", " ")} UTC`,
      data: { memberships, invitationId: issued.invitationId },
      at,
    });
    return {
      userId,
      invitationId: issued.invitationId,
      token: issued.token,
      email: input.email,
      name: input.name,
      expiresAt: issued.expiresAt,
      organisationName: await organisationName(trx, actor.organisationId),
      invitedByName: await actorName(trx, actor.userId),
      access,
    };
  });
}

async function invitedTarget(trx: Knex.Transaction, organisationId: number, userId: number) {
  const user = await trx("users")
    .where({ id: userId, organisation_id: organisationId })
    .first("id", "email", "name", "active", "password_hash");
  if (!user) throw new RecordNotFoundError("No such person");
  if (user.password_hash) throw new RecordConflictError(`${user.name} has already set a password and can sign in`);
  return user;
}

/** Sends a fresh link to someone who has not accepted yet (the old link stops working). */
export async function resendInvitation(db: Knex, opts: { actor: ActorRef; userId: number; now?: Date }): Promise<IssuedInvitation> {
  const { actor } = opts;
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  return db.transaction(async (trx) => {
    const user = await invitedTarget(trx, actor.organisationId, opts.userId);
    if (!toBool(user.active)) throw new RecordConflictError(`${user.name} is deactivated; let them sign in again first`);
    const memberships = (await trx("memberships").where({ user_id: user.id }).select("role", "branch_id")).map((m): PersonMembership => ({
      role: m.role as Role,
      branchId: m.branch_id === null ? null : Number(m.branch_id),
    }));
    // An inspector's link lasts no longer than their latest open grant.
    let grant: { id: number; expires_at: string } | undefined;
    if (memberships.some((m) => m.role === "inspector")) {
      grant = await trx("inspector_grants")
        .where({ user_id: user.id, organisation_id: actor.organisationId })
        .whereNull("revoked_at")
        .where("expires_at", ">", at)
        .orderBy("expires_at", "desc")
        .first("id", "expires_at");
      if (!grant) throw new RecordConflictError(`${user.name} has no open inspector access; give access first`);
    }
    const issued = await issueInvitation(trx, {
      organisationId: actor.organisationId,
      invitedBy: actor.userId,
      user: { id: Number(user.id), email: user.email, name: user.name },
      memberships,
      inspectorGrantId: grant ? Number(grant.id) : null,
      validUntil: grant ? new Date(grant.expires_at) : undefined,
      now,
    });
    const access = describeAccess(memberships, await branchNamesOf(trx, actor.organisationId));
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: "person.invitation_resent",
      subjectType: "User",
      subjectId: Number(user.id),
      summary: `Sent ${user.name} a new invitation link; earlier links no longer work`,
      data: { invitationId: issued.invitationId },
      at,
    });
    return {
      userId: Number(user.id),
      invitationId: issued.invitationId,
      token: issued.token,
      email: user.email,
      name: user.name,
      expiresAt: issued.expiresAt,
      organisationName: await organisationName(trx, actor.organisationId),
      invitedByName: await actorName(trx, actor.userId),
      access,
    };
  });
}

/** Withdraws an invitation not yet accepted: the link stops working and the account is deactivated. */
export async function withdrawInvitation(db: Knex, opts: { actor: ActorRef; userId: number; now?: Date }): Promise<void> {
  const { actor } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const user = await invitedTarget(trx, actor.organisationId, opts.userId);
    const revoked = await trx("invitations")
      .where({ organisation_id: actor.organisationId, email: user.email })
      .whereNull("used_at")
      .whereNull("revoked_at")
      .update({ revoked_at: at });
    if (!toBool(user.active) && revoked === 0) throw new RecordConflictError(`${user.name}'s invitation was already withdrawn`);
    await trx("users").where({ id: user.id }).update({ active: false, deactivated_at: at });
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: "person.invitation_withdrawn",
      subjectType: "User",
      subjectId: Number(user.id),
      summary: `Withdrew ${user.name}'s invitation; the link no longer works`,
      at,
    });
  });
}

export interface InvitationView {
  state: LinkState;
  /** Present only while the link can be used. */
  email?: string;
  name?: string;
  organisationName?: string;
  invitedByName?: string;
  access?: string;
  expiresAt?: string;
}

/** What the invitation page shows for a link: its state, and the invitation while it can be used. */
export async function describeInvitation(db: Knex, opts: { token: string; now?: Date }): Promise<InvitationView> {
  const now = opts.now ?? new Date();
  const row = await db("invitations as i")
    .join("users as by", "by.id", "i.invited_by")
    .join("organisations as o", "o.id", "i.organisation_id")
    .where("i.token_hash", hashLinkToken(opts.token))
    .first("i.*", "by.name as invited_by_name", "o.name as organisation_name");
  const state = linkState(row, now);
  if (state !== "valid") return { state, ...(state === "expired" && { expiresAt: row.expires_at, invitedByName: row.invited_by_name }) };
  const memberships = JSON.parse(row.memberships) as PersonMembership[];
  const access = describeAccess(memberships, await branchNamesOf(db, Number(row.organisation_id)));
  return {
    state,
    email: row.email,
    name: row.name ?? undefined,
    organisationName: row.organisation_name,
    invitedByName: row.invited_by_name,
    access,
    expiresAt: row.expires_at,
  };
}

export const LINK_REFUSALS: Record<Exclude<LinkState, "valid">, string> = {
  unknown: "This link is not valid. Check that you opened the whole link from the e-mail.",
  used: "This link has already been used. Sign in with your password, or ask for a new link.",
  expired: "This link has expired. Ask for a new one.",
  withdrawn: "This link was withdrawn or replaced by a newer one. Use the latest e-mail, or ask for a new link.",
};

export function refuseLink(state: Exclude<LinkState, "valid">): never {
  if (state === "unknown") throw new RecordNotFoundError(LINK_REFUSALS.unknown, "token");
  throw new RecordConflictError(LINK_REFUSALS[state], "token");
}

/**
 * Accepts an invitation: sets the person's name and password, marks the link used (once), and
 * withdraws any other open link for the address. Returns who can now sign in.
 */
export async function acceptInvitation(
  db: Knex,
  opts: { input: AcceptInvitationInput; now?: Date },
): Promise<{ userId: number; email: string }> {
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  const passwordHash = await hashPassword(opts.input.password); // slow on purpose: outside the transaction
  return db.transaction(async (trx) => {
    const invitation = await trx("invitations")
      .where({ token_hash: hashLinkToken(opts.input.token) })
      .first();
    const state = linkState(invitation, now);
    if (state !== "valid") refuseLink(state);
    const user = await trx("users")
      .where({ email: invitation.email, organisation_id: invitation.organisation_id })
      .first("id", "name", "email", "active");
    if (!user || !toBool(user.active)) refuseLink("withdrawn");

    const marked = await trx("invitations")
      .where({ id: invitation.id })
      .whereNull("used_at")
      .whereNull("revoked_at")
      .update({ used_at: at, accepted_user_id: user.id });
    if (marked !== 1) refuseLink("used");
    await trx("invitations")
      .where({ organisation_id: invitation.organisation_id, email: invitation.email })
      .whereNull("used_at")
      .whereNull("revoked_at")
      .update({ revoked_at: at });
    await trx("users").where({ id: user.id }).update({ password_hash: passwordHash, name: opts.input.name });
    await endUserSessions(trx, { userId: Number(user.id), reason: "password_changed", now });
    const roles = (JSON.parse(invitation.memberships) as PersonMembership[]).map((m) => ROLE_LABELS[m.role]);
    await appendActivity(trx, {
      organisationId: Number(invitation.organisation_id),
      actorId: Number(user.id),
      action: "person.invitation_accepted",
      subjectType: "User",
      subjectId: Number(user.id),
      summary: `${opts.input.name} accepted the invitation${roles.length ? ` (${[...new Set(roles)].join(", ")})` : ""} and set a password`,
      data: { invitationId: Number(invitation.id) },
      at,
    });
    return { userId: Number(user.id), email: user.email as string };
  });
}
