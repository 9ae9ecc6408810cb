import { z } from "zod";
import { text } from "./text";
import { calendarDate } from "./calendar-date";
import { FINDING_STATES, RULE_PACKS, SEVERITIES } from "../vocabulary";

const isoDate = (what: string) => calendarDate(`Use a date like 2026-03-14 for ${what}`, { error: `Enter ${what}` });
const positiveId = (what: string) =>
  z.coerce
    .number({ error: `Choose ${what}` })
    .int(`Choose ${what}`)
    .positive(`Choose ${what}`);
const MAX_PERIOD_DAYS = 10 * 366;

/** A new audit: which branches, which period (dates inclusive, in each branch's zone), which rule packs. */
export const auditInput = z
  .object({
    branchIds: z
      .array(positiveId("a branch"), { error: "Choose the branches to audit" })
      .min(1, "Choose at least one branch")
      .max(500, "Choose at most 500 branches"),
    periodFrom: isoDate("the first day of the period"),
    periodTo: isoDate("the last day of the period"),
    packs: z
      .array(z.enum(RULE_PACKS, { error: "Choose a known rule pack" }), { error: "Choose the rule packs" })
      .min(1, "Choose at least one rule pack"),
  })
  .superRefine((v, ctx) => {
    if (v.periodFrom > v.periodTo)
      ctx.addIssue({ code: "custom", path: ["periodTo"], message: "The period must end on or after its first day" });
    const latest = new Date(Date.now() + 24 * 3600 * 1000).toISOString().slice(0, 10);
    if (v.periodTo > latest) ctx.addIssue({ code: "custom", path: ["periodTo"], message: "The period cannot end in the future" });
    const span = (Date.parse(v.periodTo) - Date.parse(v.periodFrom)) / 86_400_000;
    if (span > MAX_PERIOD_DAYS) ctx.addIssue({ code: "custom", path: ["periodFrom"], message: "An audit covers at most ten years" });
    if (new Set(v.branchIds).size !== v.branchIds.length)
      ctx.addIssue({ code: "custom", path: ["branchIds"], message: "A branch is listed twice" });
  });
export type AuditInput = z.infer<typeof auditInput>;

export const auditListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
});
export type AuditListQuery = z.infer<typeof auditListQuery>;

/** Columns the findings table sorts and groups by. */
export const FINDING_SORT_FIELDS = ["due", "severity", "branch", "rule", "state", "assignee", "opened", "updated"] as const;
export type FindingSortField = (typeof FINDING_SORT_FIELDS)[number];
export const FINDING_GROUP_FIELDS = ["branch", "rule", "severity", "state", "assignee", "due"] as const;
export type FindingGroupField = (typeof FINDING_GROUP_FIELDS)[number];
/** Buckets of the due-date filter and grouping. */
export const DUE_BUCKETS = ["overdue", "week", "month", "later", "none"] as const;
export type DueBucket = (typeof DUE_BUCKETS)[number];
export const FINDING_STATE_FILTERS = ["active", "all", ...FINDING_STATES] as const;

const optionalText = (max: number) =>
  z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v), text().trim().max(max).optional());
const optionalId = z.preprocess((v) => (v === "" || v === null ? undefined : v), z.coerce.number().int().positive().optional());

/** Filters, sort and grouping of the findings table; also what a saved view keeps. */
export const findingViewQuery = z.object({
  sort: z.enum(FINDING_SORT_FIELDS).default("due"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  groupBy: z.preprocess((v) => (v === "" ? undefined : v), z.enum(FINDING_GROUP_FIELDS).optional()),
  state: z.preprocess((v) => (v === "" ? undefined : v), z.enum(FINDING_STATE_FILTERS).default("active")),
  severity: z.preprocess((v) => (v === "" ? undefined : v), z.enum(SEVERITIES).optional()),
  branchId: optionalId,
  ruleId: optionalText(64),
  /** A user id, or "none" for unassigned findings. */
  assignee: z.preprocess((v) => (v === "" ? undefined : v), z.union([z.literal("none"), z.coerce.number().int().positive()]).optional()),
  due: z.preprocess((v) => (v === "" ? undefined : v), z.enum(DUE_BUCKETS).optional()),
  auditId: optionalId,
  q: optionalText(100),
});
export type FindingViewQuery = z.infer<typeof findingViewQuery>;

export const findingListQuery = findingViewQuery.extend({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});
export type FindingListQuery = z.infer<typeof findingListQuery>;

export const assignFindingsInput = z.object({
  findingIds: z
    .array(positiveId("a finding"), { error: "Choose the findings to assign" })
    .min(1, "Choose at least one finding")
    .max(500, "Assign at most 500 findings at once"),
  /** null takes the assignment away. */
  assigneeId: positiveId("the person to assign").nullable(),
});
export type AssignFindingsInput = z.infer<typeof assignFindingsInput>;

const words = (what: string, min: number, max = 4000) =>
  text({ error: `Write ${what}` })
    .trim()
    .min(min, min <= 1 ? `Write ${what}` : `Write ${what} (at least ${min} characters)`)
    .max(max, `Keep ${what} under ${max.toLocaleString("en-US")} characters`);

export const proposeFixInput = z.object({ note: words("what was done to fix it", 5) });
export type ProposeFixInput = z.infer<typeof proposeFixInput>;

export const acceptFindingInput = z.object({ note: optionalText(4000) });
export type AcceptFindingInput = z.infer<typeof acceptFindingInput>;

export const reopenFindingInput = z.object({ reason: words("why the finding is reopened", 5) });
export type ReopenFindingInput = z.infer<typeof reopenFindingInput>;

export const waiveFindingInput = z.object({ reason: words("why no fix is needed", 10) });
export type WaiveFindingInput = z.infer<typeof waiveFindingInput>;

export const findingCommentInput = z.object({ body: words("a comment", 1) });
export type FindingCommentInput = z.infer<typeof findingCommentInput>;

/** A saved view of a list (for now the findings table), per person. */
export const savedViewInput = z.object({
  list: z.literal("findings").default("findings"),
  name: text({ error: "Name the view" }).trim().min(1, "Name the view").max(100, "Keep the name under 100 characters"),
  query: findingViewQuery,
});
export type SavedViewInput = z.infer<typeof savedViewInput>;

export const dashboardQuery = z.object({
  /** Months of history in the charts (ending this month). */
  months: z.coerce.number().int().min(3).max(36).default(12),
});
export type DashboardQuery = z.infer<typeof dashboardQuery>;
