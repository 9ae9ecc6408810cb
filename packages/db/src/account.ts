import type { Knex } from "knex";
import type { ChangePasswordInput } from "@coldtrail/core";
import { appendActivity } from "./activity";
import { InvalidInputError, RecordNotFoundError } from "./errors";
import { hashPassword, verifyPassword } from "./passwords";
import { endUserSessions } from "./sessions";
import { toBool } from "./types";

/**
 * A signed-in person changes their own password. The current password must match; every session of
 * the person ends (this one too: the page signs in again with the new password).
 */
export async function changeOwnPassword(
  db: Knex,
  opts: { userId: number; input: ChangePasswordInput; now?: Date },
): Promise<{ email: string }> {
  const at = (opts.now ?? new Date()).toISOString();
  const user = await db("users").where({ id: opts.userId }).first("id", "organisation_id", "email", "name", "active", "password_hash");
  if (!user || !toBool(user.active)) throw new RecordNotFoundError("No such person");
  if (!(await verifyPassword(opts.input.currentPassword, user.password_hash))) {
    throw new InvalidInputError("That is not your current password", "currentPassword");
  }
  const passwordHash = await hashPassword(opts.input.password);
  await db.transaction(async (trx) => {
    await trx("users").where({ id: user.id }).update({ password_hash: passwordHash });
    await trx("password_reset_tokens").where({ user_id: user.id }).whereNull("used_at").update({ used_at: at });
    await endUserSessions(trx, { userId: Number(user.id), reason: "password_changed", now: opts.now });
    await appendActivity(trx, {
      organisationId: Number(user.organisation_id),
      actorId: Number(user.id),
      action: "person.password_changed",
      subjectType: "User",
      subjectId: Number(user.id),
      summary: `${user.name} changed their password; every session of theirs was ended`,
      at,
    });
  });
  return { email: user.email as string };
}

/** Ends every session of the person ("sign out everywhere"), this one included. */
export async function signOutEverywhere(db: Knex, opts: { userId: number; organisationId: number; now?: Date }): Promise<number> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const ended = await endUserSessions(trx, { userId: opts.userId, reason: "signed_out_everywhere", now: opts.now });
    await appendActivity(trx, {
      organisationId: opts.organisationId,
      actorId: opts.userId,
      action: "person.signed_out_everywhere",
      subjectType: "User",
      subjectId: opts.userId,
      summary: `Signed out everywhere (${ended} ${ended === 1 ? "session" : "sessions"} ended)`,
      at,
    });
    return ended;
  });
}
