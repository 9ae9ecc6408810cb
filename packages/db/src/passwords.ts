import bcrypt from "bcryptjs";

/** Cost 10: about 60–80 ms per hash on the project's machines. */
const COST = 10;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

/** False for a missing hash (an invitation not yet accepted). */
export async function verifyPassword(plain: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) return false;
  return bcrypt.compare(plain, hash);
}
