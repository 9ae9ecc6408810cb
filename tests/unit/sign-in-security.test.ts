import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  PASSWORD_MAX_LENGTH,
  changePasswordInput,
  idleMinutesFor,
  newPassword,
  passwordProblem,
  resetPasswordInput,
  safeNextPath,
} from "@coldtrail/core";
import { productionSettingProblems } from "../../apps/web/src/lib/env-check";
import { API_CSP, COMMON_SECURITY_HEADERS, pageCsp } from "../../apps/web/src/lib/security-headers";

const ORIGIN = "https://app.coldtrail.example";

describe("where sign-in may send the person next", () => {
  it.each([
    ["/jobs", "/jobs"],
    ["/jobs/12?tab=history#amendments", "/jobs/12?tab=history#amendments"],
    ["/admin/people", "/admin/people"],
    [`${ORIGIN}/findings`, "/findings"],
  ])("keeps a page of this site: %s", (next, expected) => {
    expect(safeNextPath(next, ORIGIN)).toBe(expected);
  });

  it.each([
    // Seen working against the app: browsers read a backslash or a tab as part of "//".
    ["/\\evil.example/"],
    ["/%5Cevil.example/".replace("%5C", "\\")],
    ["/\t/evil.example"],
    ["/\n/evil.example"],
    ["//evil.example"],
    ["///evil.example"],
    ["\\\\evil.example"],
    ["https://evil.example/"],
    ["http://app.coldtrail.example/"], // same host, other scheme: another origin
    ["https://app.coldtrail.example.evil.example/"],
    ["https://app.coldtrail.example@evil.example/"],
    ["javascript:alert(1)"],
    ["data:text/html,hi"],
    [" //evil.example"],
    [""],
  ])("refuses another site or scheme: %j", (next) => {
    expect(safeNextPath(next, ORIGIN)).toBe("/");
  });

  it("the query string as Next.js decodes it (%5C and %09) also lands at home", () => {
    for (const raw of ["/%5Cevil.example/", "/%09/evil.example"]) {
      const next = new URL(`${ORIGIN}/sign-in?next=${raw}`).searchParams.get("next");
      expect(safeNextPath(next, ORIGIN)).toBe("/");
    }
  });

  it("whatever it is given, the answer is a path of the same origin", () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 40 }), (next) => {
        const out = safeNextPath(next, ORIGIN);
        expect(out.startsWith("/")).toBe(true);
        expect(new URL(out, ORIGIN).origin).toBe(ORIGIN);
      }),
      { numRuns: 300 },
    );
  });
});

describe("password policy", () => {
  it.each(["correct-lantern-gasket-orchard", "amber-evaporator-17", "Zq8#mW2!pL5@", "a quiet compressor hums by the loading dock"])(
    "accepts a strong password or pass phrase: %s",
    (p) => {
      expect(passwordProblem(p)).toBeNull();
    },
  );

  it("accepts long pass phrases, up to the maximum", () => {
    const phrase = "the receiver drier sits beside the sight glass on the liquid line ".repeat(8).trim();
    expect(phrase.length).toBeGreaterThan(256);
    expect(passwordProblem(phrase)).toBeNull();
    expect(passwordProblem("x".repeat(7) + "yz-".repeat(400))).toMatch(/at most/);
    expect(PASSWORD_MAX_LENGTH).toBeGreaterThanOrEqual(64); // Source: OWASP ASVS 4.0.3 V2.1.2 (at least 64 characters allowed)
  });

  it("refuses fewer than 12 characters", () => {
    // Source: OWASP ASVS 4.0.3 V2.1.1 (at least 12 characters)
    expect(passwordProblem("violet-gas1")).toBe("Use at least 12 characters");
    expect(passwordProblem("            ab")).toMatch(/not spaces/);
  });

  it.each([
    "password1234",
    "123456789012",
    "qwertyuiop123",
    "Password2026!",
    "P@ssw0rd2026",
    "iloveyou12345",
    "passwordpassword",
    "monkeymonkey",
    "abcabcabcabc",
    "aaaaaaaaaaaaaa",
    "abcdefghijklm",
    "987654321098",
    "1qaz2wsx3edc",
    "Summer2026!!!",
    "coldtrail-demo",
    "Coldtrail2026!",
    "letmein123456",
  ])("refuses a common or breached password, padded or disguised: %s", (p) => {
    // Source: OWASP ASVS 4.0.3 V2.1.7 (refuse breached and common passwords)
    expect(passwordProblem(p)).not.toBeNull();
  });

  it("applies wherever a password is set: reset, invitation and change of password", () => {
    expect(newPassword.safeParse("password1234").success).toBe(false);
    expect(resetPasswordInput.safeParse({ token: "a".repeat(30), password: "password1234", confirmPassword: "password1234" }).success).toBe(
      false,
    );
    const change = changePasswordInput.safeParse({
      currentPassword: "coldtrail-demo",
      password: "Summer2026!!!",
      confirmPassword: "Summer2026!!!",
    });
    expect(change.success).toBe(false);
    expect(change.error!.issues[0]!.path).toEqual(["password"]);
    expect(
      changePasswordInput.safeParse({
        currentPassword: "coldtrail-demo",
        password: "lantern-gasket-orchard",
        confirmPassword: "lantern-gasket-orchard",
      }).success,
    ).toBe(true);
  });
});

describe("idle timeout by role", () => {
  const settings = { officers: 30, others: 90 };
  it("owners and compliance officers get the officers' timeout, even with another role beside it", () => {
    expect(idleMinutesFor(["owner"], settings)).toBe(30);
    expect(idleMinutesFor(["technician", "compliance_officer"], settings)).toBe(30);
  });
  it("managers, technicians and inspectors get the other one", () => {
    expect(idleMinutesFor(["branch_manager"], settings)).toBe(90);
    expect(idleMinutesFor(["technician"], settings)).toBe(90);
    expect(idleMinutesFor(["inspector"], settings)).toBe(90);
  });
});

describe("production refuses development settings", () => {
  const good = {
    NEXTAUTH_URL: "https://app.kestrelmoor.example",
    NEXTAUTH_SECRET: "k3Lr9vQ2xW8mT5nB7cY1zA4dF6gH0jPqRsUvWxYz",
    SMTP_HOST: "smtp.kestrelmoor.example",
    S3_ENDPOINT: "https://objects.kestrelmoor.example",
    S3_ACCESS_KEY_ID: "AKIDEXAMPLEKESTREL",
    S3_SECRET_ACCESS_KEY: "s3cr3t-from-the-provider-0123456789",
  };

  it("starts with real settings", () => {
    expect(productionSettingProblems(good)).toEqual([]);
  });

  it.each([
    [
      "NEXTAUTH_SECRET",
      { NEXTAUTH_SECRET: "coldtrail-local-development-secret-not-for-production" },
      /NEXTAUTH_SECRET is the public development secret/,
    ],
    [
      "NEXTAUTH_SECRET",
      { NEXTAUTH_SECRET: "e2e-only-secret-not-for-production-0123456789" },
      /NEXTAUTH_SECRET is the public development secret/,
    ],
    ["NEXTAUTH_SECRET", { NEXTAUTH_SECRET: "short" }, /NEXTAUTH_SECRET must be at least 32/],
    ["NEXTAUTH_SECRET", { NEXTAUTH_SECRET: undefined }, /NEXTAUTH_SECRET is not set/],
    ["NEXTAUTH_URL", { NEXTAUTH_URL: "http://app.kestrelmoor.example" }, /NEXTAUTH_URL must start with https/],
    ["NEXTAUTH_URL", { NEXTAUTH_URL: "https://127.0.0.1:3000" }, /NEXTAUTH_URL points at this machine/],
    ["NEXTAUTH_URL", { NEXTAUTH_URL: undefined }, /NEXTAUTH_URL is not set/],
    ["SMTP_HOST", { SMTP_HOST: "127.0.0.1" }, /SMTP_HOST is 127\.0\.0\.1, the local mail fake/],
    ["SMTP_HOST", { SMTP_HOST: "localhost" }, /SMTP_HOST is localhost/],
    ["SMTP_HOST", { SMTP_HOST: undefined }, /SMTP_HOST is not set/],
    ["S3_ENDPOINT", { S3_ENDPOINT: "http://127.0.0.1:4569" }, /S3_ENDPOINT is .* the local storage fake/],
    ["S3_ACCESS_KEY_ID", { S3_ACCESS_KEY_ID: "S3RVER" }, /S3_ACCESS_KEY_ID is the local storage fake's credential/],
    ["S3_SECRET_ACCESS_KEY", { S3_SECRET_ACCESS_KEY: "S3RVER" }, /S3_SECRET_ACCESS_KEY is the local storage fake's credential/],
  ])("refuses a development value of %s and names it", (_name, change, message) => {
    const problems = productionSettingProblems({ ...good, ...change });
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(message);
  });

  it("the development defaults together are refused one setting at a time", () => {
    const problems = productionSettingProblems({
      NEXTAUTH_URL: "http://127.0.0.1:3000",
      NEXTAUTH_SECRET: "coldtrail-local-development-secret-not-for-production",
      SMTP_HOST: "127.0.0.1",
      S3_ENDPOINT: "http://127.0.0.1:4569",
      S3_ACCESS_KEY_ID: "S3RVER",
      S3_SECRET_ACCESS_KEY: "S3RVER",
    });
    expect(problems.map((p) => p.split(" ")[0])).toEqual([
      "NEXTAUTH_URL",
      "NEXTAUTH_SECRET",
      "SMTP_HOST",
      "S3_ENDPOINT",
      "S3_ACCESS_KEY_ID",
      "S3_SECRET_ACCESS_KEY",
    ]);
  });
});

describe("security headers", () => {
  it("the page policy allows scripts only by nonce, never inline, and no framing", () => {
    const csp = pageCsp({ nonce: "abc123==" });
    const script = csp.split("; ").find((d) => d.startsWith("script-src"))!;
    expect(script).toContain("'nonce-abc123=='");
    expect(script).not.toContain("'unsafe-inline'");
    expect(script).not.toContain("'unsafe-eval'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).not.toContain("upgrade-insecure-requests");
    expect(pageCsp({ nonce: "n", https: true })).toContain("upgrade-insecure-requests");
  });

  it("API answers may not run or be framed; camera only for this site", () => {
    expect(API_CSP).toContain("default-src 'none'");
    expect(API_CSP).toContain("frame-ancestors 'none'");
    const headers = Object.fromEntries(COMMON_SECURITY_HEADERS.map((h) => [h.key, h.value]));
    expect(headers["X-Frame-Options"]).toBe("DENY");
    expect(headers["X-Content-Type-Options"]).toBe("nosniff");
    expect(headers["Permissions-Policy"]).toContain("camera=(self)");
    expect(headers["Permissions-Policy"]).toContain("microphone=()");
  });
});
