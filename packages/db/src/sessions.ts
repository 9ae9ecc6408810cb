import { createHash, randomBytes } from "node:crypto";
import type { Knex } from "knex";
import { SESSION_IDLE_DEFAULTS, idleMinutesFor, type Role, type SessionIdleSettings } from "@coldtrail/core";
import { toBool } from "./types";

/**
 * Sign-in sessions kept on the server. The session cookie (a signed JWT) carries a random session id;
 * the table keeps only its SHA-256, so a copy of the table opens no session. A session works while its
 * row is not revoked, the person is active, and it has not been idle longer than the organisation's
 * idle timeout for the person's roles.
 */

export type SessionEndReason = "signed_out" | "signed_out_everywhere" | "password_changed" | "deactivated" | "idle";

/** Seconds between two writes of `last_seen_at` for the same session: activity is recorded, not every request. */
const TOUCH_EVERY_MS = 60_000;

const hashSessionId = (id: string) => createHash("sha256").update(id).digest("hex");

/** Opens a session for a person who has just proved who they are; returns the id the cookie carries. */
export async function openSession(
  db: Knex,
  opts: { userId: number; organisationId: number; userAgent?: string | null; now?: Date },
): Promise<string> {
  const id = randomBytes(32).toString("base64url");
  const at = (opts.now ?? new Date()).toISOString();
  await db("user_sessions").insert({
    id_hash: hashSessionId(id),
    organisation_id: opts.organisationId,
    user_id: opts.userId,
    created_at: at,
    last_seen_at: at,
    revoked_at: null,
    revoked_reason: null,
    user_agent: opts.userAgent ? opts.userAgent.slice(0, 300) : null,
  });
  return id;
}

export type SessionCheck = { ok: true; userId: number } | { ok: false; reason: "unknown" | "revoked" | "inactive" | "idle" };

/** The organisation's idle timeouts (minutes). */
export async function getSessionIdleSettings(db: Knex | Knex.Transaction, organisationId: number): Promise<SessionIdleSettings> {
  const row = await db("organisations").where({ id: organisationId }).first("session_idle_minutes_officers", "session_idle_minutes_others");
  return {
    officers: Number(row?.session_idle_minutes_officers ?? SESSION_IDLE_DEFAULTS.officers),
    others: Number(row?.session_idle_minutes_others ?? SESSION_IDLE_DEFAULTS.others),
  };
}

/**
 * Whether the session with this id still works, checked on every request that loads the signed-in
 * person. `activity: true` (a request the person made, not background polling) records the time, so
 * the idle timeout counts from it; a session found idle is ended for good.
 */
export async function checkSession(db: Knex, opts: { sessionId: string; now?: Date; activity?: boolean }): Promise<SessionCheck> {
  const now = opts.now ?? new Date();
  const row = await db("user_sessions as s")
    .join("users as u", "u.id", "s.user_id")
    .where("s.id_hash", hashSessionId(opts.sessionId))
    .first("s.id", "s.user_id", "s.organisation_id", "s.last_seen_at", "s.revoked_at", "u.active");
  if (!row) return { ok: false, reason: "unknown" };
  if (row.revoked_at) return { ok: false, reason: "revoked" };
  if (!toBool(row.active)) return { ok: false, reason: "inactive" };

  const roles = (await db("memberships").where({ user_id: row.user_id }).distinct("role")).map((m) => m.role as Role);
  const idleMs = idleMinutesFor(roles, await getSessionIdleSettings(db, Number(row.organisation_id))) * 60_000;
  const idleFor = now.getTime() - Date.parse(row.last_seen_at);
  if (idleFor > idleMs) {
    await db("user_sessions")
      .where({ id: row.id })
      .whereNull("revoked_at")
      .update({ revoked_at: now.toISOString(), revoked_reason: "idle" });
    return { ok: false, reason: "idle" };
  }
  if (opts.activity && idleFor >= TOUCH_EVERY_MS) {
    await db("user_sessions").where({ id: row.id }).update({ last_seen_at: now.toISOString() });
  }
  return { ok: true, userId: Number(row.user_id) };
}

/** Ends one session (sign-out). */
export async function endSession(db: Knex, opts: { sessionId: string; reason?: SessionEndReason; now?: Date }): Promise<void> {
  await db("user_sessions")
    .where({ id_hash: hashSessionId(opts.sessionId) })
    .whereNull("revoked_at")
    .update({ revoked_at: (opts.now ?? new Date()).toISOString(), revoked_reason: opts.reason ?? "signed_out" });
}

/** Ends every open session of a person (sign out everywhere, password changed, deactivated); returns how many. */
export async function endUserSessions(
  db: Knex | Knex.Transaction,
  opts: { userId: number; reason: SessionEndReason; now?: Date },
): Promise<number> {
  return db("user_sessions")
    .where({ user_id: opts.userId })
    .whereNull("revoked_at")
    .update({ revoked_at: (opts.now ?? new Date()).toISOString(), revoked_reason: opts.reason });
}

/** How many sessions of a person are open (not revoked; an idle one counts until it is next checked). */
export async function countOpenSessions(db: Knex, userId: number): Promise<number> {
  const row = await db("user_sessions").where({ user_id: userId }).whereNull("revoked_at").count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}
