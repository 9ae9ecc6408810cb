import { COMMON_PASSWORDS_TEXT } from "./common-passwords";

/** Shortest password accepted when one is set (OWASP ASVS 4.0.3 V2.1.1: at least 12 characters). */
export const PASSWORD_MIN_LENGTH = 12;
/**
 * Longest password accepted: long pass phrases are welcome (ASVS V2.1.2 asks for at least 64). Passwords
 * are pre-hashed before bcrypt (see packages/db passwords.ts), so bcrypt's 72-byte limit never cuts one short.
 */
export const PASSWORD_MAX_LENGTH = 1000;

let common: Set<string> | undefined;
function commonPasswords(): Set<string> {
  common ??= new Set(
    COMMON_PASSWORDS_TEXT.split("\n")
      .map((l) => l.trim())
      .filter(Boolean),
  );
  return common;
}

/** Look-alike characters people use in place of letters ("p@ssw0rd"). */
const LOOK_ALIKES: Record<string, string> = { "0": "o", "1": "i", "3": "e", "4": "a", "5": "s", "7": "t", "@": "a", $: "s", "!": "i" };

const deLeet = (s: string) => [...s].map((c) => LOOK_ALIKES[c] ?? c).join("");

/** The password without leading and trailing digits, symbols and spaces: "Summer2026!!" → "summer". */
function stem(s: string): string {
  return s.replace(/^[^\p{L}]+/u, "").replace(/[^\p{L}]+$/u, "");
}

/** True when `s` is `unit` written two or more times ("abcabcabc", "passwordpassword"). */
function repeatedUnit(s: string): string | null {
  for (let n = 1; n <= s.length / 2; n++) {
    if (s.length % n !== 0) continue;
    const unit = s.slice(0, n);
    if (unit.repeat(s.length / n) === s) return unit;
  }
  return null;
}

/** True for a run of consecutive characters up or down ("abcdefghijkl", "789012345678": digits wrap round). */
function isRun(s: string): boolean {
  const codes = [...s].map((c) => c.codePointAt(0)!);
  if (codes.length < 3) return false;
  const digits = /^\d+$/.test(s);
  const steps = codes.slice(1).map((c, i) => (digits ? (c - codes[i]! + 10) % 10 : c - codes[i]!));
  const first = steps[0]!;
  const up = first === 1;
  const down = digits ? first === 9 : first === -1;
  return (up || down) && steps.every((d) => d === first);
}

/**
 * Why a new password is refused, or null when it may be used. Refuses what is too short, too long, or
 * among the most common passwords — directly, padded with digits or symbols, repeated, written with
 * look-alike characters, a keyboard or number run — in the spirit of ASVS V2.1.7 (no breached or
 * common passwords). No other composition rules (V2.1.9): a few unrelated words are a good password.
 */
export function passwordProblem(password: string): string | null {
  const length = [...password].length;
  if (length < PASSWORD_MIN_LENGTH) return `Use at least ${PASSWORD_MIN_LENGTH} characters`;
  if (length > PASSWORD_MAX_LENGTH) return `Use at most ${PASSWORD_MAX_LENGTH} characters`;
  if (password.trim().length < PASSWORD_MIN_LENGTH) return `Use at least ${PASSWORD_MIN_LENGTH} characters that are not spaces`;

  const list = commonPasswords();
  const normal = password.normalize("NFKC").toLowerCase().replace(/\s+/g, " ").trim();
  const squeezed = normal.replace(/[\s_.-]+/g, "");
  const candidates = new Set<string>();
  for (const form of [normal, squeezed]) {
    candidates.add(form);
    candidates.add(deLeet(form));
    candidates.add(stem(form));
    candidates.add(stem(deLeet(stem(form))) || stem(form));
  }
  const common =
    "This password is one of the most common ones and easy to guess; choose another (a few unrelated words make a strong pass phrase)";
  for (const c of candidates) {
    if (!c) continue;
    if (list.has(c)) return common;
    const unit = repeatedUnit(c);
    if (unit && (unit.length <= 4 || list.has(unit) || list.has(deLeet(unit))))
      return "Do not repeat the same few characters or words; choose another password";
  }
  if (isRun(squeezed)) {
    return "Runs of neighbouring keys or numbers are easy to guess; choose another password";
  }
  return null;
}
