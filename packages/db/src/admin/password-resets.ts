import type { Knex } from "knex";
import { PASSWORD_RESET_VALID_MINUTES, type ResetPasswordInput } from "@coldtrail/core";
import { appendActivity } from "../activity";
import { hashPassword } from "../passwords";
import { endUserSessions } from "../sessions";
import { toBool } from "../types";
import { refuseLink } from "./invitations";
import { addMinutes, hashLinkToken, linkState, newLinkToken, type LinkState } from "./tokens";

/** At most this many reset links per account per hour; more requests are answered the same but send nothing. */
export const RESET_REQUESTS_PER_HOUR = 3;

export interface IssuedReset {
  userId: number;
  email: string;
  name: string;
  token: string;
  expiresAt: string;
}

/**
 * Issues a password-reset link for an address, or nothing: unknown addresses, deactivated accounts,
 * accounts still waiting for their invitation and too many recent requests all return null. The
 * caller answers every case with the same words, so the form never tells whether an account exists.
 */
export async function requestPasswordReset(db: Knex, opts: { email: string; now?: Date }): Promise<IssuedReset | null> {
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  return db.transaction(async (trx) => {
    const user = await trx("users")
      .where({ email: opts.email.trim().toLowerCase() })
      .first("id", "organisation_id", "email", "name", "active", "password_hash");
    if (!user || !toBool(user.active) || !user.password_hash) return null;
    const recent = await trx("password_reset_tokens")
      .where({ user_id: user.id })
      .where("created_at", ">", addMinutes(now, -60).toISOString())
      .count({ n: "*" })
      .first();
    if (Number(recent?.n ?? 0) >= RESET_REQUESTS_PER_HOUR) return null;

    const token = newLinkToken();
    const expiresAt = addMinutes(now, PASSWORD_RESET_VALID_MINUTES).toISOString();
    await trx("password_reset_tokens").insert({
      organisation_id: user.organisation_id,
      user_id: user.id,
      token_hash: hashLinkToken(token),
      expires_at: expiresAt,
      used_at: null,
      created_at: at,
    });
    await appendActivity(trx, {
      organisationId: Number(user.organisation_id),
      actorId: null,
      action: "person.password_reset_requested",
      subjectType: "User",
      subjectId: Number(user.id),
      summary: `A password-reset link was sent to ${user.email}`,
      at,
    });
    return { userId: Number(user.id), email: user.email, name: user.name, token, expiresAt };
  });
}

/** The state of a reset link, for the page that opens it. */
export async function describePasswordReset(db: Knex, opts: { token: string; now?: Date }): Promise<{ state: LinkState; email?: string }> {
  const row = await db("password_reset_tokens as t")
    .join("users as u", "u.id", "t.user_id")
    .where("t.token_hash", hashLinkToken(opts.token))
    .first("t.expires_at", "t.used_at", "u.email", "u.active");
  let state = linkState(row, opts.now ?? new Date());
  if (state === "valid" && !toBool(row.active)) state = "withdrawn";
  return state === "valid" ? { state, email: row.email } : { state };
}

/**
 * Sets a new password from a reset link. The link works once; every other open reset link of the
 * account stops working too.
 */
export async function resetPassword(db: Knex, opts: { input: ResetPasswordInput; now?: Date }): Promise<{ userId: number; email: string }> {
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  const passwordHash = await hashPassword(opts.input.password);
  return db.transaction(async (trx) => {
    const row = await trx("password_reset_tokens")
      .where({ token_hash: hashLinkToken(opts.input.token) })
      .first();
    const state = linkState(row, now);
    if (state !== "valid") refuseLink(state);
    const user = await trx("users").where({ id: row.user_id }).first("id", "organisation_id", "email", "name", "active");
    if (!user || !toBool(user.active)) refuseLink("withdrawn");

    const marked = await trx("password_reset_tokens").where({ id: row.id }).whereNull("used_at").update({ used_at: at });
    if (marked !== 1) refuseLink("used");
    await trx("password_reset_tokens").where({ user_id: user.id }).whereNull("used_at").update({ used_at: at });
    await trx("users").where({ id: user.id }).update({ password_hash: passwordHash });
    await endUserSessions(trx, { userId: Number(user.id), reason: "password_changed", now });
    await appendActivity(trx, {
      organisationId: Number(user.organisation_id),
      actorId: Number(user.id),
      action: "person.password_reset",
      subjectType: "User",
      subjectId: Number(user.id),
      summary: `${user.name} chose a new password with a reset link`,
      at,
    });
    return { userId: Number(user.id), email: user.email as string };
  });
}
