import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { RateLimiterPostgres, RateLimiterSQLite, type RateLimiterAbstract, type RateLimiterRes } from "rate-limiter-flexible";
import { isPostgres } from "./connection";

/**
 * Throttling of sign-in and the other public routes, counted in the database (table `rate_limits`,
 * created by a migration) so the counts hold across restarts and across server instances.
 *
 * Sign-in counts failed attempts only, three ways, so nobody can lock a person out for good:
 * - account + address: 5 failures in 15 minutes, then that address waits for the rest of the
 *   15 minutes for that account (the person at another address is not affected); a success clears it;
 * - account, any address: 30 failures in 15 minutes (guessing spread over many addresses), then every
 *   address waits for the rest of the 15 minutes; an attacker can keep this one engaged only by
 *   continuing to fail, and each window ends by itself;
 * - address, any account: 100 failures in 15 minutes (trying many accounts from one place).
 * Public routes (forgotten password, reset link, invitation) count every request per address and route,
 * and the forgotten-password route also per address asked about.
 */
export interface Limit {
  /** Attempts allowed in a window. */
  points: number;
  /** Length of the window, in seconds; counting restarts when it ends. */
  seconds: number;
}

export const SIGN_IN_LIMITS = {
  accountAddress: { points: 5, seconds: 15 * 60 },
  account: { points: 30, seconds: 15 * 60 },
  address: { points: 100, seconds: 15 * 60 },
} as const satisfies Record<string, Limit>;

export const PUBLIC_ROUTE_LIMITS = {
  /** Asking for a reset link, per client address. */
  "password-forgot": { points: 10, seconds: 15 * 60 },
  /** Asking for a reset link, per e-mail address asked about (on top of the per-account mail limit). */
  "password-forgot-email": { points: 5, seconds: 60 * 60 },
  /** Using a reset link, per client address. */
  "password-reset": { points: 20, seconds: 15 * 60 },
  /** Accepting an invitation, per client address. */
  "invitation-accept": { points: 20, seconds: 15 * 60 },
  /** Opening a reset or invitation link (the page looks the token up), per client address. */
  "link-open": { points: 60, seconds: 15 * 60 },
} as const satisfies Record<string, Limit>;

export type PublicRouteName = keyof typeof PUBLIC_ROUTE_LIMITS;

/** A refusal: how long until the next attempt is allowed. */
export interface Refusal {
  retryAfterSeconds: number;
  /** "Try again in 12 minutes." */
  message: string;
}

export function retryMessage(ms: number): string {
  const minutes = Math.max(1, Math.ceil(ms / 60_000));
  return `Try again in ${minutes} ${minutes === 1 ? "minute" : "minutes"}.`;
}

/** Short, one-way keys: neither e-mail addresses nor client addresses are stored in the table. */
const keyOf = (...parts: string[]) => createHash("sha256").update(parts.join("\u0000")).digest("base64url");

function limiter(db: Knex, prefix: string, limit: Limit): RateLimiterAbstract {
  const options = {
    storeClient: db,
    storeType: "knex",
    tableName: "rate_limits",
    tableCreated: true,
    keyPrefix: prefix,
    points: limit.points,
    duration: limit.seconds,
  };
  return isPostgres(db)
    ? new RateLimiterPostgres({ ...options, clearExpiredByTimeout: true })
    : new RateLimiterSQLite({ ...options, clearExpiredByTimeout: true });
}

const isLimiterRes = (e: unknown): e is RateLimiterRes =>
  typeof e === "object" && e !== null && "msBeforeNext" in e && !(e instanceof Error);

export interface Throttle {
  /** Null when a sign-in attempt for this account from this address may go ahead, else the refusal. */
  signInRefusal(email: string, address: string): Promise<Refusal | null>;
  /** Counts a failed sign-in; returns the refusal when this failure used up a limit. */
  signInFailed(email: string, address: string): Promise<Refusal | null>;
  /** A successful sign-in clears the failures of this account from this address. */
  signInSucceeded(email: string, address: string): Promise<void>;
  /** Counts a request to a public route; returns the refusal when over the limit (the request is then not served). */
  publicRequest(route: PublicRouteName, key: string): Promise<Refusal | null>;
}

/**
 * The throttle of a database. `scale` multiplies every limit (1 in production and in the throttling
 * tests; the end-to-end server may set COLDTRAIL_THROTTLE_SCALE, see apps/web/src/lib/env.ts).
 */
export function createThrottle(db: Knex, opts: { scale?: number } = {}): Throttle {
  const scale = Math.max(1, Math.floor(opts.scale ?? 1));
  const scaled = (l: Limit): Limit => ({ points: l.points * scale, seconds: l.seconds });
  const sign = {
    accountAddress: limiter(db, "signin_aa", scaled(SIGN_IN_LIMITS.accountAddress)),
    account: limiter(db, "signin_a", scaled(SIGN_IN_LIMITS.account)),
    address: limiter(db, "signin_ip", scaled(SIGN_IN_LIMITS.address)),
  };
  const publicLimiters = Object.fromEntries(
    Object.entries(PUBLIC_ROUTE_LIMITS).map(([name, l]) => [name, limiter(db, `public_${name.replace(/-/g, "_")}`, scaled(l))]),
  ) as Record<PublicRouteName, RateLimiterAbstract>;

  const signKeys = (email: string, address: string) => {
    const account = email.trim().toLowerCase();
    return { accountAddress: keyOf(account, address), account: keyOf(account), address: keyOf(address) };
  };

  return {
    async signInRefusal(email, address) {
      const keys = signKeys(email, address);
      let wait = 0;
      for (const name of ["accountAddress", "account", "address"] as const) {
        const res = await sign[name].get(keys[name]);
        if (res && res.consumedPoints >= sign[name].points) wait = Math.max(wait, res.msBeforeNext);
      }
      return wait > 0 ? { retryAfterSeconds: Math.ceil(wait / 1000), message: retryMessage(wait) } : null;
    },
    async signInFailed(email, address) {
      const keys = signKeys(email, address);
      let wait = 0;
      for (const name of ["accountAddress", "account", "address"] as const) {
        try {
          const res = await sign[name].consume(keys[name]);
          if (res.remainingPoints <= 0) wait = Math.max(wait, res.msBeforeNext);
        } catch (err) {
          if (!isLimiterRes(err)) throw err;
          wait = Math.max(wait, err.msBeforeNext);
        }
      }
      return wait > 0 ? { retryAfterSeconds: Math.ceil(wait / 1000), message: retryMessage(wait) } : null;
    },
    async signInSucceeded(email, address) {
      await sign.accountAddress.delete(signKeys(email, address).accountAddress);
    },
    async publicRequest(route, key) {
      try {
        await publicLimiters[route].consume(keyOf(key));
        return null;
      } catch (err) {
        if (!isLimiterRes(err)) throw err;
        return { retryAfterSeconds: Math.ceil(err.msBeforeNext / 1000), message: retryMessage(err.msBeforeNext) };
      }
    },
  };
}
