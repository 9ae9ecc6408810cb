import { createHash } from "node:crypto";
import bcrypt from "bcryptjs";

/** Cost 10: about 60–80 ms per hash on the project's machines. */
const COST = 10;

/**
 * Hashes written since long pass phrases are allowed carry this prefix before the bcrypt hash: the
 * password is first reduced to the base64 of its SHA-256 (44 ASCII characters), because bcrypt reads
 * only the first 72 bytes and a longer phrase would otherwise be cut short silently. Hashes without
 * the prefix (written before) are plain bcrypt and still verify.
 */
const PREHASHED = "$sha256b64$";

function prehash(plain: string): string {
  return createHash("sha256").update(plain.normalize("NFC"), "utf8").digest("base64");
}

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(prehash(plain), COST).then((h) => `${PREHASHED}${h}`);
}

/** False for a missing hash (an invitation not yet accepted). */
export async function verifyPassword(plain: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) return false;
  if (hash.startsWith(PREHASHED)) return bcrypt.compare(prehash(plain), hash.slice(PREHASHED.length));
  return bcrypt.compare(plain, hash);
}

/** A hash of a password nobody has, compared against when an address is unknown so timing does not tell. */
export const DUMMY_PASSWORD_HASH = `${PREHASHED}$2b$10$QDffZTER43.CMZeTT4IEVuwOw/lL8BIXPUIgpjgYEeRb78UzHh5wC`;
