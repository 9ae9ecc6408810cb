/**
 * Settings production must not run with: the development defaults that ship in the code or in the
 * repository's scripts. A pure function of the settings (env.ts reads process.env and calls it), so it
 * is unit-tested directly. Each problem names the setting to fix.
 */

/** The development secret of env.ts and the fixed secret of the end-to-end server: public, in the repository. */
export const PUBLIC_DEVELOPMENT_SECRETS = [
  "coldtrail-local-development-secret-not-for-production",
  "e2e-only-secret-not-for-production-0123456789",
] as const;

/** The local object-store fake's credentials (s3rver's defaults). */
export const LOCAL_S3_CREDENTIALS = ["S3RVER"] as const;

function isLocalHost(host: string): boolean {
  const h = host
    .trim()
    .toLowerCase()
    .replace(/^\[|\]$/g, "");
  return h === "localhost" || h.endsWith(".localhost") || h === "::1" || h === "0.0.0.0" || /^127\./.test(h);
}

export interface ProductionSettings {
  NEXTAUTH_URL?: string;
  NEXTAUTH_SECRET?: string;
  SMTP_HOST?: string;
  S3_ENDPOINT?: string;
  S3_ACCESS_KEY_ID?: string;
  S3_SECRET_ACCESS_KEY?: string;
}

/** Every reason these settings cannot run in production; empty when they can. */
export function productionSettingProblems(vars: ProductionSettings): string[] {
  const problems: string[] = [];
  const url = vars.NEXTAUTH_URL?.trim();
  if (!url) problems.push("NEXTAUTH_URL is not set: set it to the https:// address people open the app at");
  else {
    let parsed: URL | null = null;
    try {
      parsed = new URL(url);
    } catch {
      problems.push(`NEXTAUTH_URL is not a valid address: set it to the https:// address people open the app at`);
    }
    if (parsed && parsed.protocol !== "https:")
      problems.push("NEXTAUTH_URL must start with https:// in production (session cookies and HSTS need it)");
    else if (parsed && isLocalHost(parsed.hostname))
      problems.push("NEXTAUTH_URL points at this machine: set it to the public https:// address of the app");
  }

  const secret = vars.NEXTAUTH_SECRET ?? "";
  if (!secret)
    problems.push("NEXTAUTH_SECRET is not set: set it to a random value of at least 32 characters (e.g. `openssl rand -base64 48`)");
  else if ((PUBLIC_DEVELOPMENT_SECRETS as readonly string[]).includes(secret))
    problems.push("NEXTAUTH_SECRET is the public development secret from the repository: set a random value of at least 32 characters");
  else if (secret.length < 32) problems.push("NEXTAUTH_SECRET must be at least 32 characters in production");

  const smtp = vars.SMTP_HOST?.trim();
  if (!smtp) problems.push("SMTP_HOST is not set: set it to your mail server (the development default is the local mail fake)");
  else if (isLocalHost(smtp)) problems.push(`SMTP_HOST is ${smtp}, the local mail fake of development: set it to your mail server`);

  const endpoint = vars.S3_ENDPOINT?.trim();
  if (!endpoint) problems.push("S3_ENDPOINT is not set: set it to your object storage (the development default is the local fake)");
  else {
    try {
      const e = new URL(endpoint);
      if (isLocalHost(e.hostname))
        problems.push(`S3_ENDPOINT is ${endpoint}, the local storage fake of development: set it to your object storage`);
    } catch {
      problems.push("S3_ENDPOINT is not a valid address");
    }
  }
  for (const key of ["S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"] as const) {
    const v = vars[key];
    if (!v) problems.push(`${key} is not set: set the credentials of your object storage`);
    else if ((LOCAL_S3_CREDENTIALS as readonly string[]).includes(v))
      problems.push(`${key} is the local storage fake's credential: set the credentials of your object storage`);
  }
  return problems;
}

/** The error production starts with when its settings are unsafe. */
export function productionSettingsError(problems: string[]): Error {
  return new Error(
    `Coldtrail will not start in production with development settings. Fix:\n${problems.map((p) => `  - ${p}`).join("\n")}\n` +
      "(Test builds that run on this machine set COLDTRAIL_ALLOW_DEV_DEFAULTS=1.)",
  );
}
