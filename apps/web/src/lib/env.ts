import "server-only";
import { z } from "zod";
import { productionSettingProblems, productionSettingsError } from "./env-check";

const isProduction = process.env.NODE_ENV === "production" && process.env.COLDTRAIL_ALLOW_DEV_DEFAULTS !== "1";

/**
 * The one place that reads process.env. Local defaults exist only for development and tests;
 * the demo script generates a random NEXTAUTH_SECRET and points mail and storage at local fakes.
 * In production (NODE_ENV=production without COLDTRAIL_ALLOW_DEV_DEFAULTS=1, which only the scripts
 * that build and test on this machine set) the server refuses to start with any development default:
 * see env-check.ts.
 */
const schema = z.object({
  NEXTAUTH_URL: z.string().url().default("http://127.0.0.1:3000"),
  NEXTAUTH_SECRET: isProduction
    ? z.string().min(32, "NEXTAUTH_SECRET must be at least 32 characters in production")
    : z.string().min(1).default("coldtrail-local-development-secret-not-for-production"),
  COLDTRAIL_DB: z.string().optional(),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().default(2525),
  MAIL_FROM: z.string().default("Coldtrail <no-reply@coldtrail.example>"),
  S3_ENDPOINT: z.string().default("http://127.0.0.1:4569"),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().default("coldtrail-files"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  /** "off" stops the daily digest timer (the end-to-end server sets it; tests send digests on demand). */
  COLDTRAIL_DIGEST: z.enum(["on", "off"]).default("on"),
  /** Reverse proxies in front of the server that append to X-Forwarded-For (lib/server/throttle.ts). */
  COLDTRAIL_TRUSTED_PROXIES: z.coerce.number().int().min(1).max(10).default(1),
  /**
   * Multiplies every throttling limit. 1 (the real limits) unless a test server needs more room; the
   * throttling tests run against the real limits.
   */
  COLDTRAIL_THROTTLE_SCALE: z.coerce.number().int().min(1).max(1000).default(1),
});

// Checked when the server starts (instrumentation.ts imports this module first), not while building.
if (isProduction && process.env.NEXT_PHASE !== "phase-production-build") {
  const problems = productionSettingProblems(process.env);
  if (problems.length) throw productionSettingsError(problems);
}

export const env = schema.parse(process.env);

/** True when the app is served over https (HSTS is sent then). */
export const servedOverHttps = env.NEXTAUTH_URL.startsWith("https:");
