import { z } from "zod";
import { text } from "./text";
import { calendarDate } from "./calendar-date";
import { ISO_COUNTRY_CODES, US_REGION_CODES } from "../places/rule-pack-places";
import { MASS_DISPLAY_UNITS, RULE_PACKS, type MassDisplayUnit, type Role, type RulePack } from "../vocabulary";
import { PASSWORD_MAX_LENGTH, passwordProblem } from "../security/password-policy";
import { SESSION_IDLE_LIMITS } from "../security/sessions";

/**
 * Inputs of running the organisation: branches, people and their access, invitations, password
 * resets, inspector access and the organisation's settings. Shared by the API routes and the forms.
 */

// ------------------------------------------------------------------------------------------ vocabulary

/** Roles the owner gives to the company's own people. Inspectors come in through inspector access. */
export const ASSIGNABLE_ROLES = ["owner", "compliance_officer", "branch_manager", "technician"] as const;
export type AssignableRole = (typeof ASSIGNABLE_ROLES)[number];

/** Roles held in named branches; the others cover the whole organisation. */
export const BRANCH_ROLES: readonly Role[] = ["branch_manager", "technician"];

/** Who outranks whom: nobody may give a role above their own, or raise their own. */
export const ROLE_RANK: Readonly<Record<Role, number>> = {
  owner: 4,
  compliance_officer: 3,
  branch_manager: 2,
  technician: 1,
  inspector: 0,
};

export const ROLE_DESCRIPTIONS: Readonly<Record<AssignableRole, string>> = {
  owner: "Everything in the organisation: branches, people, roles and settings.",
  compliance_officer: "Reads every branch, runs audits, verifies certification cards and lets inspectors in.",
  branch_manager: "Reads and keeps the records of the chosen branches and fixes their findings.",
  technician: "Logs their own jobs in the chosen branches and uploads their certification cards.",
};

export const MASS_DISPLAY_UNIT_LABELS: Readonly<Record<MassDisplayUnit, string>> = {
  lb_oz: "Pounds and ounces (lb oz)",
  kg: "Kilograms (kg)",
};

export const RULE_PACK_LABELS: Readonly<Record<RulePack, string>> = {
  us_federal: "United States, federal rules",
  eu: "European Union",
};

export const RULE_PACK_DESCRIPTIONS: Readonly<Record<RulePack, string>> = {
  us_federal:
    "Clean Air Act section 608 (40 CFR Part 82, Subpart F) and the AIM Act rules (40 CFR Part 84): certification, evacuation, leak repair, cylinders, disposal and reclaim.",
  eu: "Regulation (EU) 2024/573 on fluorinated gases: CO2-equivalent thresholds and leak-check intervals.",
};

/** How a person stands: can sign in, has not set a password yet, or no longer signs in. */
export const PERSON_STATUSES = ["active", "invited", "deactivated"] as const;
export type PersonStatus = (typeof PERSON_STATUSES)[number];
export const PERSON_STATUS_LABELS: Readonly<Record<PersonStatus, string>> = {
  active: "Active",
  invited: "Invitation sent",
  deactivated: "Deactivated",
};

export const GRANT_STATES = ["active", "expired", "revoked"] as const;
export type GrantState = (typeof GRANT_STATES)[number];
export const GRANT_STATE_LABELS: Readonly<Record<GrantState, string>> = {
  active: "Open",
  expired: "Ended (expired)",
  revoked: "Withdrawn",
};

/** How long links sent by e-mail stay usable. */
export const INVITATION_VALID_DAYS = 7;
export const PASSWORD_RESET_VALID_MINUTES = 60;

// ------------------------------------------------------------------------------------------- helpers

const grantDate = (what: string) => calendarDate(`${what}: use a date like 2026-03-14`);

/** A number typed into a form: an empty box means "not entered", never zero. */
const entered = <T extends z.ZodType>(schema: T) =>
  z.preprocess((v) => (v === "" || v === null || (typeof v === "string" && v.trim() === "") ? undefined : v), schema);

const id = z.coerce.number().int().positive();

/** True for an IANA zone name the runtime knows (e.g. "America/Chicago"); offsets and abbreviations are refused. */
export function isValidTimeZone(value: string): boolean {
  if (!/^[A-Za-z][A-Za-z0-9_+-]*(\/[A-Za-z0-9_+-]+)*$/.test(value)) return false;
  if (!value.includes("/") && value !== "UTC") return false;
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

const email = text({ error: "Enter an e-mail address" })
  .trim()
  .toLowerCase()
  .min(1, "Enter an e-mail address")
  .max(320, "That e-mail address is too long")
  .pipe(z.email("Enter a valid e-mail address, like name@company.example"));

const personName = text({ error: "Enter the person's name" })
  .trim()
  .min(2, "Enter the person's full name")
  .max(200, "Names are limited to 200 characters");

/**
 * A new password, wherever one is set (invitation, reset link, change of password): at least 12
 * characters, long pass phrases welcome, and not one of the most common passwords (core security).
 */
export const newPassword = z.string({ error: "Choose a password" }).superRefine((p, ctx) => {
  const problem = passwordProblem(p);
  if (problem) ctx.addIssue({ code: "custom", message: problem });
});

const paging = {
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
};

// ------------------------------------------------------------------------------------------ branches

const branchName = text({ error: "Enter the branch name" })
  .trim()
  .min(2, "Enter the branch name")
  .max(200, "Branch names are limited to 200 characters");
const timeZone = text({ error: "Choose the branch's time zone" })
  .trim()
  .min(1, "Choose the branch's time zone")
  .refine(isValidTimeZone, "Choose a time zone from the list (a region name like America/Chicago)");
const address = text().trim().max(500, "Addresses are limited to 500 characters").optional();
const massUnit = z.enum(MASS_DISPLAY_UNITS, { error: "Choose how the branch shows amounts" });
/** Where the branch is: decides which rule packs its audits apply. */
const country = z
  .string({ error: "Choose the country the branch is in" })
  .trim()
  .toUpperCase()
  .refine((c) => ISO_COUNTRY_CODES.includes(c), "Choose a country from the list (a two-letter code like US or DE)");
const region = z.preprocess(
  (v) => (typeof v === "string" && v.trim() === "" ? null : v),
  text().trim().max(64, "Regions are limited to 64 characters").nullable().optional(),
);
/** A US branch names its state (the two-letter postal code); elsewhere the region is optional words. */
function refinePlace(v: { country?: string; region?: string | null }, ctx: z.RefinementCtx): void {
  if (v.country !== "US") return;
  const code = v.region?.trim().toUpperCase() ?? "";
  if (!code) ctx.addIssue({ code: "custom", path: ["region"], message: "Choose the state the branch is in" });
  else if (!US_REGION_CODES.includes(code))
    ctx.addIssue({ code: "custom", path: ["region"], message: "Use the state's two-letter code, like TX or CO" });
}
/** Stores a US state as its upper-case code; other regions as typed. */
export function normalRegion(countryCode: string, value: string | null | undefined): string | null {
  const v = value?.trim() ?? "";
  if (!v) return null;
  return countryCode.toUpperCase() === "US" ? v.toUpperCase() : v;
}

export const branchInput = z
  .object({
    name: branchName,
    code: text({ error: "Enter a short code for the branch" })
      .trim()
      .toUpperCase()
      .regex(/^[A-Z0-9]{2,8}$/, "Use 2 to 8 letters or digits, like DEN"),
    address,
    timeZone,
    massUnit,
    country,
    region,
  })
  .superRefine(refinePlace);
export type BranchInput = z.infer<typeof branchInput>;

/** Rename, move, change the unit, or archive / bring back a branch. The code stays: record tags carry it. */
export const branchUpdate = z
  .object({
    name: branchName.optional(),
    address,
    timeZone: timeZone.optional(),
    massUnit: massUnit.optional(),
    country: country.optional(),
    region,
    archived: z.boolean().optional(),
  })
  .superRefine(refinePlace)
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: "Nothing to change", path: ["_"] });
export type BranchUpdate = z.infer<typeof branchUpdate>;

export const branchListQuery = z.object({
  ...paging,
  archived: z.enum(["exclude", "include", "only"]).default("include"),
  q: text().trim().max(100).optional(),
});
export type BranchListQuery = z.infer<typeof branchListQuery>;

// -------------------------------------------------------------------------------------------- people

const accessShape = {
  roles: z
    .array(z.enum(ASSIGNABLE_ROLES, { error: "Choose a role from the list" }), { error: "Choose at least one role" })
    .min(1, "Choose at least one role"),
  branchIds: z.array(id, { error: "Choose the branches" }).default([]),
};

function refineAccess(value: { roles: readonly Role[]; branchIds: readonly number[] }, ctx: z.RefinementCtx): void {
  const needsBranch = value.roles.some((r) => BRANCH_ROLES.includes(r));
  if (needsBranch && value.branchIds.length === 0) {
    ctx.addIssue({ code: "custom", path: ["branchIds"], message: "Branch managers and technicians need at least one branch" });
  }
  if (new Set(value.roles).size !== value.roles.length) {
    ctx.addIssue({ code: "custom", path: ["roles"], message: "Each role once" });
  }
}

/** What a person may do: roles, and the branches the branch roles apply in. */
export const personAccessInput = z.object(accessShape).superRefine(refineAccess);
export type PersonAccessInput = z.infer<typeof personAccessInput>;

export const invitationInput = z.object({ email, name: personName, ...accessShape }).superRefine(refineAccess);
export type InvitationInput = z.infer<typeof invitationInput>;

export const PEOPLE_SORT_FIELDS = ["name", "email", "createdAt"] as const;
export const peopleListQuery = z.object({
  ...paging,
  sort: z.enum(PEOPLE_SORT_FIELDS).default("name"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  q: text().trim().max(100).optional(),
  role: z.enum(["owner", "compliance_officer", "branch_manager", "technician", "inspector"]).optional(),
  branchId: id.optional(),
  status: z.enum(PERSON_STATUSES).optional(),
});
export type PeopleListQuery = z.infer<typeof peopleListQuery>;

export const activityListQuery = z.object({ ...paging, pageSize: z.coerce.number().int().min(1).max(100).default(20) });
export type ActivityListQuery = z.infer<typeof activityListQuery>;

// --------------------------------------------------------------------------- invitations and passwords

const token = z
  .string({ error: "The link is incomplete" })
  .trim()
  .regex(/^[A-Za-z0-9_-]{20,200}$/, "The link is incomplete");

function refineConfirm(value: { password: string; confirmPassword: string }, ctx: z.RefinementCtx): void {
  if (value.password !== value.confirmPassword) {
    ctx.addIssue({ code: "custom", path: ["confirmPassword"], message: "The two passwords are not the same" });
  }
}

export const acceptInvitationInput = z
  .object({ token, name: personName, password: newPassword, confirmPassword: z.string() })
  .superRefine(refineConfirm);
export type AcceptInvitationInput = z.infer<typeof acceptInvitationInput>;

export const forgotPasswordInput = z.object({ email });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordInput>;

export const resetPasswordInput = z.object({ token, password: newPassword, confirmPassword: z.string() }).superRefine(refineConfirm);
export type ResetPasswordInput = z.infer<typeof resetPasswordInput>;

/** A signed-in person changing their own password: the current one proves it is them. */
export const changePasswordInput = z
  .object({
    currentPassword: z.string({ error: "Enter your current password" }).min(1, "Enter your current password").max(PASSWORD_MAX_LENGTH),
    password: newPassword,
    confirmPassword: z.string(),
  })
  .superRefine(refineConfirm);
export type ChangePasswordInput = z.infer<typeof changePasswordInput>;

// ---------------------------------------------------------------------------------- inspector access

export const inspectorGrantInput = z
  .object({
    email,
    name: personName,
    branchIds: z.array(id, { error: "Choose the branches" }).min(1, "Choose at least one branch"),
    recordsFrom: grantDate("The first date"),
    recordsTo: grantDate("The last date"),
    expiresOn: grantDate("The end of access"),
    note: text().trim().max(500, "Notes are limited to 500 characters").optional(),
  })
  .superRefine((value, ctx) => {
    if (value.recordsFrom > value.recordsTo) {
      ctx.addIssue({ code: "custom", path: ["recordsTo"], message: "The last date of records must be on or after the first" });
    }
    // One day of slack for the officer's calendar date being behind UTC.
    const yesterday = new Date(Date.now() - 24 * 3600 * 1000).toISOString().slice(0, 10);
    if (value.expiresOn < yesterday) {
      ctx.addIssue({ code: "custom", path: ["expiresOn"], message: "Access must end today or later" });
    }
    const limit = new Date(Date.now() + 3 * 366 * 24 * 3600 * 1000).toISOString().slice(0, 10);
    if (value.expiresOn > limit) {
      ctx.addIssue({ code: "custom", path: ["expiresOn"], message: "Access can be given for at most three years at a time" });
    }
  });
export type InspectorGrantInput = z.infer<typeof inspectorGrantInput>;

export const grantListQuery = z.object({
  ...paging,
  state: z.enum([...GRANT_STATES, "all"]).default("all"),
  userId: id.optional(),
});
export type GrantListQuery = z.infer<typeof grantListQuery>;

// ----------------------------------------------------------------------------------------- settings

export const REQUALIFICATION_YEARS = [5, 10, 12] as const;
export const LEAK_RATE_METHODS = ["annualizing", "rolling_average"] as const;
export const LEAK_RATE_METHOD_LABELS: Readonly<Record<(typeof LEAK_RATE_METHODS)[number], string>> = {
  annualizing: "Annualizing method",
  rolling_average: "Rolling average method",
};

/** The organisation's name, its rule packs, and the tolerances the rules leave to the company. */
export const organisationSettingsInput = z.object({
  name: text({ error: "Enter the organisation's name" })
    .trim()
    .min(2, "Enter the organisation's name")
    .max(200, "Names are limited to 200 characters"),
  rulePacks: z
    .array(z.enum(RULE_PACKS, { error: "Choose a rule pack from the list" }), { error: "Choose at least one set of rules" })
    .min(1, "Choose at least one set of rules"),
  ptTolerancePsi: entered(
    z.coerce
      .number({ error: "Enter the pressure tolerance in psi" })
      .min(0, "The tolerance cannot be negative")
      .max(30, "Use at most 30 psi"),
  ),
  massBalanceTolerancePercent: entered(
    z.coerce
      .number({ error: "Enter the mass-balance tolerance in percent" })
      .min(0, "The tolerance cannot be negative")
      .max(25, "Use at most 25 %"),
  ),
  massBalanceToleranceG: entered(
    z.coerce
      .number({ error: "Enter the smallest amount flagged, in grams" })
      .int("Use whole grams")
      .min(0, "The amount cannot be negative")
      .max(50_000, "Use at most 50,000 g"),
  ),
  requalificationYears: entered(
    z.coerce
      .number({ error: "Choose the requalification period" })
      .refine((n) => (REQUALIFICATION_YEARS as readonly number[]).includes(n), "Choose 5, 10 or 12 years"),
  ),
  strictFill130F: z.boolean({ error: "Say whether the stricter fill applies" }),
  leakRateMethod: z.enum(LEAK_RATE_METHODS, { error: "Choose the leak-rate method" }),
  disposalRecordGraceDays: entered(
    z.coerce
      .number({ error: "Enter the days a disposal record may follow the disposal" })
      .int("Use whole days")
      .min(0, "The days cannot be negative")
      .max(90, "Use at most 90 days"),
  ),
  cardVerificationGraceDays: entered(
    z.coerce
      .number({ error: "Enter the days a new card may wait for verification" })
      .int("Use whole days")
      .min(0, "The days cannot be negative")
      .max(90, "Use at most 90 days"),
  ),
  /** Idle timeouts of sessions, in minutes (core security/sessions.ts); left out = unchanged. */
  sessionIdleMinutesOfficers: z.coerce
    .number({ error: "Enter the idle time in minutes" })
    .int("Use whole minutes")
    .min(SESSION_IDLE_LIMITS.min, `Use at least ${SESSION_IDLE_LIMITS.min} minutes`)
    .max(SESSION_IDLE_LIMITS.officersMax, `Use at most ${SESSION_IDLE_LIMITS.officersMax} minutes for owners and officers`)
    .optional(),
  sessionIdleMinutesOthers: z.coerce
    .number({ error: "Enter the idle time in minutes" })
    .int("Use whole minutes")
    .min(SESSION_IDLE_LIMITS.min, `Use at least ${SESSION_IDLE_LIMITS.min} minutes`)
    .max(SESSION_IDLE_LIMITS.othersMax, `Use at most ${SESSION_IDLE_LIMITS.othersMax} minutes`)
    .optional(),
});
export type OrganisationSettingsInput = z.infer<typeof organisationSettingsInput>;
