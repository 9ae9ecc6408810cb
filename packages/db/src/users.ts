import { createHash } from "node:crypto";
import type { Knex } from "knex";
import type { Role } from "@coldtrail/core";
import { toBool } from "./types";

export interface SignInUser {
  id: number;
  organisationId: number;
  email: string;
  name: string;
  passwordHash: string | null;
  active: boolean;
}

/** The user an e-mail address signs in as (e-mails are stored lower-case). */
export async function findUserForSignIn(db: Knex, email: string): Promise<SignInUser | undefined> {
  const row = await db("users")
    .where({ email: email.trim().toLowerCase() })
    .first("id", "organisation_id", "email", "name", "password_hash", "active");
  if (!row) return undefined;
  return {
    id: Number(row.id),
    organisationId: Number(row.organisation_id),
    email: row.email,
    name: row.name,
    passwordHash: row.password_hash ?? null,
    active: toBool(row.active),
  };
}

export interface ActorMembership {
  branchId: number | null;
  role: Role;
}

export interface ActorInspectorGrant {
  id: number;
  branchIds: number[];
  recordsFrom: string;
  recordsTo: string;
  expiresAt: string;
  revokedAt: string | null;
}

export interface Actor {
  userId: number;
  organisationId: number;
  name: string;
  email: string;
  roles: Role[];
  memberships: ActorMembership[];
  /** Every grant the user ever had, revoked and expired ones included: the ability decides with the clock. */
  inspectorGrants: ActorInspectorGrant[];
}

/** Everything the ability needs about a signed-in user; undefined for unknown or deactivated users. */
export async function loadActor(db: Knex, userId: number): Promise<Actor | undefined> {
  const user = await db("users").where({ id: userId }).first("id", "organisation_id", "email", "name", "active");
  if (!user || !toBool(user.active)) return undefined;

  const memberships = await db("memberships as m")
    .leftJoin("branches as b", "b.id", "m.branch_id")
    .where("m.user_id", userId)
    .andWhere("m.organisation_id", user.organisation_id)
    .orderBy("m.id")
    .select("m.branch_id", "m.role");

  const grants = await db("inspector_grants")
    .where({ user_id: userId, organisation_id: user.organisation_id })
    .orderBy("id")
    .select("id", "records_from", "records_to", "expires_at", "revoked_at");
  const grantBranches = grants.length
    ? await db("inspector_grant_branches")
        .whereIn(
          "grant_id",
          grants.map((g) => g.id),
        )
        .orderBy("branch_id")
        .select("grant_id", "branch_id")
    : [];

  const roles: Role[] = [];
  for (const m of memberships) if (!roles.includes(m.role)) roles.push(m.role as Role);

  return {
    userId: Number(user.id),
    organisationId: Number(user.organisation_id),
    name: user.name,
    email: user.email,
    roles,
    memberships: memberships.map((m) => ({
      branchId: m.branch_id === null ? null : Number(m.branch_id),
      role: m.role as Role,
    })),
    inspectorGrants: grants.map((g) => ({
      id: Number(g.id),
      branchIds: grantBranches.filter((b) => b.grant_id === g.id).map((b) => Number(b.branch_id)),
      recordsFrom: g.records_from,
      recordsTo: g.records_to,
      expiresAt: g.expires_at,
      revokedAt: g.revoked_at ?? null,
    })),
  };
}

/**
 * A short fingerprint of a user's current password hash. A session remembers the one it was opened
 * with; once the password changes (reset, invitation accepted again) older sessions no longer match.
 */
export function credentialStampOf(passwordHash: string | null | undefined): string | null {
  return passwordHash ? createHash("sha256").update(passwordHash).digest("hex").slice(0, 24) : null;
}

/** The credential fingerprint of an active user now, or null (unknown, inactive, or no password). */
export async function currentCredentialStamp(db: Knex, userId: number): Promise<string | null> {
  const row = await db("users").where({ id: userId }).first("password_hash", "active");
  if (!row || !toBool(row.active)) return null;
  return credentialStampOf(row.password_hash);
}
