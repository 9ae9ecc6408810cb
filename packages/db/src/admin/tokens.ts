import { createHash, randomBytes } from "node:crypto";

/** A new link token: 32 random bytes, URL-safe. Only its hash is stored. */
export function newLinkToken(): string {
  return randomBytes(32).toString("base64url");
}

/** sha256 of a link token, hex; what the invitations and password_reset_tokens tables hold. */
export function hashLinkToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** Why a link cannot be used, in words the person reads on the page. */
export type LinkState = "valid" | "used" | "expired" | "withdrawn" | "unknown";

export function linkState(
  row: { used_at?: string | null; revoked_at?: string | null; expires_at: string } | undefined,
  now: Date,
): LinkState {
  if (!row) return "unknown";
  if (row.used_at) return "used";
  if (row.revoked_at) return "withdrawn";
  if (new Date(row.expires_at).getTime() <= now.getTime()) return "expired";
  return "valid";
}

export function addMinutes(now: Date, minutes: number): Date {
  return new Date(now.getTime() + minutes * 60_000);
}
