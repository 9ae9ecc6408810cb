import type { Knex } from "knex";
import {
  addDays,
  FINDING_STATE_LABELS,
  SEVERITY_LABELS,
  transitionRefusal,
  type FindingAction,
  type FindingGroupField,
  type FindingListQuery,
  type FindingState,
  type FindingViewQuery,
  type MassDisplayUnit,
  type Severity,
} from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { toNumOrNull, type ActorRef, type ScopeFn } from "../types";
import { whereContains } from "../paging";
import { findingBranchIds, whereFindingShowsIn } from "./finding-branches";

type Row = Record<string, any>;

/** A row of the findings table. */
export interface FindingListRow {
  id: number;
  branchId: number;
  branchName: string;
  branchMassUnit: MassDisplayUnit;
  ruleId: string;
  title: string;
  detail: string;
  severity: Severity;
  state: FindingState;
  recordType: string;
  recordId: number | null;
  /** Plain words for the record, e.g. "Recovery job #1137" or "Appliance TUC-RACK-908". */
  recordLabel: string;
  applianceId: number | null;
  applianceTag: string | null;
  technicianId: number | null;
  technicianName: string | null;
  assigneeId: number | null;
  assigneeName: string | null;
  dueOn: string | null;
  occurredOn: string | null;
  openedAt: string;
  updatedAt: string;
}

export interface FindingGroup {
  key: string;
  label: string;
  count: number;
}

export interface FindingListResult {
  rows: FindingListRow[];
  total: number;
  page: number;
  pageSize: number;
  groupBy: FindingGroupField | null;
  groups: FindingGroup[];
}

const SEVERITY_ORDER = "CASE findings.severity WHEN 'critical' THEN 0 WHEN 'major' THEN 1 ELSE 2 END";
const STATE_ORDER =
  "CASE findings.state WHEN 'open' THEN 0 WHEN 'fix_proposed' THEN 1 WHEN 'waived' THEN 2 WHEN 'closed' THEN 3 ELSE 4 END";

/** The due-date bucket of a finding as SQL (overdue only for findings still to be acted on). */
function dueBucketSql(today: string): { sql: string; bindings: string[] } {
  return {
    sql: `CASE WHEN findings.due_on IS NULL THEN 'none' WHEN findings.due_on < ? AND findings.state IN ('open', 'fix_proposed') THEN 'overdue' WHEN findings.due_on <= ? THEN 'week' WHEN findings.due_on <= ? THEN 'month' ELSE 'later' END`,
    bindings: [today, addDays(today, 7), addDays(today, 30)],
  };
}

const DUE_LABELS: Record<string, string> = {
  overdue: "Overdue",
  week: "Due within 7 days",
  month: "Due within 30 days",
  later: "Due later",
  none: "No due date",
};
const DUE_ORDER = ["overdue", "week", "month", "later", "none"];

/** The findings table joined with what list rows show; the scope sees it as `findings`. */
function findingsWithJoins(db: Knex): Knex.QueryBuilder {
  return db("findings as findings")
    .join("branches as branch", "branch.id", "findings.branch_id")
    .leftJoin("users as assignee", "assignee.id", "findings.assignee_id")
    .leftJoin("users as technician", "technician.id", "findings.technician_id")
    .leftJoin("appliances as appliance", "appliance.id", "findings.appliance_id")
    .leftJoin("cylinders as record_cylinder", function cylinderRecord(this: Knex.JoinClause) {
      this.on("record_cylinder.id", "=", "findings.record_id").andOnVal("findings.record_type", "=", "cylinder");
    })
    .leftJoin("recovery_equipment as record_equipment", function equipmentRecord(this: Knex.JoinClause) {
      this.on("record_equipment.id", "=", "findings.record_id").andOnVal("findings.record_type", "=", "equipment");
    });
}

const LIST_COLUMNS = [
  "findings.id",
  "findings.branch_id",
  "branch.name as branch_name",
  "branch.mass_unit as branch_mass_unit",
  "findings.rule_id",
  "findings.title",
  "findings.detail",
  "findings.severity",
  "findings.state",
  "findings.record_type",
  "findings.record_id",
  "findings.appliance_id",
  "appliance.tag as appliance_tag",
  "findings.technician_id",
  "technician.name as technician_name",
  "findings.assignee_id",
  "assignee.name as assignee_name",
  "findings.due_on",
  "findings.occurred_on",
  "findings.opened_at",
  "findings.updated_at",
  "record_cylinder.serial as record_cylinder_serial",
  "record_equipment.serial as record_equipment_serial",
];

const RECORD_WORDS: Record<string, string> = {
  job: "Job",
  appliance: "Appliance",
  cylinder: "Cylinder",
  equipment: "Recovery equipment",
  technician: "Technician",
  certification: "Certification",
  branch: "Branch",
};

/** Plain words for the record a finding concerns, from a row with the list's joined columns. */
export function findingRecordLabel(r: any): string {
  const type = r.record_type as string;
  const id = toNumOrNull(r.record_id);
  if (type === "appliance" && r.appliance_tag) return `Appliance ${r.appliance_tag}`;
  if (type === "job") return `Job #${id}${r.appliance_tag ? ` on ${r.appliance_tag}` : ""}`;
  if (type === "branch") return `Branch ${r.branch_name}`;
  if (type === "cylinder" && r.record_cylinder_serial) return `Cylinder ${r.record_cylinder_serial}`;
  if (type === "equipment" && r.record_equipment_serial) return `Recovery equipment ${r.record_equipment_serial}`;
  if (type === "technician" && r.technician_name) return `Technician ${r.technician_name}`;
  if (type === "certification" && r.technician_name) return `Certification #${id} of ${r.technician_name}`;
  return `${RECORD_WORDS[type] ?? type} #${id ?? "—"}`;
}

function toListRow(r: any): FindingListRow {
  return {
    id: Number(r.id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchMassUnit: r.branch_mass_unit,
    ruleId: r.rule_id,
    title: r.title,
    detail: r.detail,
    severity: r.severity,
    state: r.state,
    recordType: r.record_type,
    recordId: toNumOrNull(r.record_id),
    recordLabel: findingRecordLabel(r),
    applianceId: toNumOrNull(r.appliance_id),
    applianceTag: r.appliance_tag ?? null,
    technicianId: toNumOrNull(r.technician_id),
    technicianName: r.technician_name ?? null,
    assigneeId: toNumOrNull(r.assignee_id),
    assigneeName: r.assignee_name ?? null,
    dueOn: r.due_on ?? null,
    occurredOn: r.occurred_on ?? null,
    openedAt: r.opened_at,
    updatedAt: r.updated_at,
  };
}

function applyScope(qb: Knex.QueryBuilder, scope: ScopeFn): void {
  qb.where(function scoped(this: Knex.QueryBuilder) {
    scope(this);
  });
}

/** Filters of the findings table on a query whose findings table is aliased `findings`. */
function applyFilters(qb: Knex.QueryBuilder, query: FindingViewQuery, today: string, withAppliance: boolean): void {
  if (query.state === "active") qb.whereIn("findings.state", ["open", "fix_proposed"]);
  else if (query.state && query.state !== "all") qb.where("findings.state", query.state);
  if (query.severity) qb.where("findings.severity", query.severity);
  if (query.branchId) whereFindingShowsIn(qb, [query.branchId]);
  if (query.ruleId) qb.where("findings.rule_id", query.ruleId);
  if (query.assignee === "none") qb.whereNull("findings.assignee_id");
  else if (typeof query.assignee === "number") qb.where("findings.assignee_id", query.assignee);
  if (query.due) {
    const bucket = dueBucketSql(today);
    qb.whereRaw(`(${bucket.sql}) = ?`, [...bucket.bindings, query.due]);
  }
  if (query.auditId) {
    qb.whereExists(function inAudit(this: Knex.QueryBuilder) {
      this.select(1)
        .from("audit_findings as af")
        .whereRaw("af.finding_id = findings.id")
        .andWhere("af.audit_id", query.auditId as number);
    });
  }
  if (query.q)
    whereContains(qb, query.q, ["findings.title", "findings.detail", "findings.rule_id", ...(withAppliance ? ["appliance.tag"] : [])]);
}

/** SQL expression (with bindings) of a grouping key, and its order. */
function groupKey(field: FindingGroupField, today: string): { key: string; bindings: string[]; order: string; orderBindings: string[] } {
  switch (field) {
    case "branch":
      return { key: "branch.name", bindings: [], order: "branch.name", orderBindings: [] };
    case "rule":
      return { key: "findings.rule_id", bindings: [], order: "findings.rule_id", orderBindings: [] };
    case "severity":
      return { key: "findings.severity", bindings: [], order: SEVERITY_ORDER, orderBindings: [] };
    case "state":
      return { key: "findings.state", bindings: [], order: STATE_ORDER, orderBindings: [] };
    case "assignee":
      return {
        key: "COALESCE(assignee.name, '')",
        bindings: [],
        order: "CASE WHEN assignee.name IS NULL THEN 1 ELSE 0 END, assignee.name",
        orderBindings: [],
      };
    case "due": {
      const b = dueBucketSql(today);
      const order = `CASE (${b.sql}) WHEN 'overdue' THEN 0 WHEN 'week' THEN 1 WHEN 'month' THEN 2 WHEN 'later' THEN 3 ELSE 4 END`;
      return { key: b.sql, bindings: b.bindings, order, orderBindings: b.bindings };
    }
  }
}

function groupLabel(field: FindingGroupField, key: string, titles: Map<string, string>): string {
  switch (field) {
    case "severity":
      return SEVERITY_LABELS[key as Severity] ?? key;
    case "state":
      return FINDING_STATE_LABELS[key as FindingState] ?? key;
    case "assignee":
      return key === "" ? "Not assigned" : key;
    case "due":
      return DUE_LABELS[key] ?? key;
    case "rule":
      return titles.has(key) ? `${key} · ${titles.get(key)}` : key;
    default:
      return key;
  }
}

/**
 * One page of the findings the scope allows, filtered, sorted and (optionally) grouped on the server.
 * Grouping orders the rows by the group first and returns every group with its count, so a page
 * shows group headings in order. `today` is the calendar date the due-date buckets are measured from.
 */
export async function listFindings(
  db: Knex,
  opts: { organisationId: number; scope: ScopeFn; query: FindingListQuery; today: string },
): Promise<FindingListResult> {
  const { query, today } = opts;
  const page = query.page ?? 1;
  const pageSize = query.pageSize ?? 25;
  const needsJoins = Boolean(query.q) || query.groupBy === "branch" || query.groupBy === "assignee";

  const filtered = (qb: Knex.QueryBuilder, withAppliance: boolean) => {
    qb.where("findings.organisation_id", opts.organisationId);
    applyScope(qb, opts.scope);
    applyFilters(qb, query, today, withAppliance);
    return qb;
  };

  const countBase = needsJoins ? findingsWithJoins(db) : db("findings as findings");
  const countRow = await filtered(countBase, needsJoins).count({ n: "*" }).first();
  const total = Number(countRow?.n ?? 0);

  const rowsQuery = filtered(findingsWithJoins(db), true).select(LIST_COLUMNS);
  const groupBy = query.groupBy ?? null;
  let groups: FindingGroup[] = [];
  if (groupBy) {
    const g = groupKey(groupBy, today);
    rowsQuery.orderByRaw(g.order, g.orderBindings);
    // GROUP BY 1 (the first selected column): an expression with bound values repeated in GROUP BY
    // would not be recognised as the same expression by PostgreSQL; a position works in both dialects.
    const groupRows = await filtered(findingsWithJoins(db), true)
      .select(db.raw(`${g.key} as group_key`, g.bindings))
      .count({ n: "*" })
      .groupByRaw("1");
    const titles = new Map<string, string>();
    if (groupBy === "rule") {
      for (const r of await db("findings").where({ organisation_id: opts.organisationId }).distinct("rule_id", "title"))
        titles.set(r.rule_id, r.title);
    }
    groups = (groupRows as Row[]).map((r) => ({
      key: String(r.group_key ?? ""),
      label: groupLabel(groupBy, String(r.group_key ?? ""), titles),
      count: Number(r.n),
    }));
    const orderOf = (k: string) =>
      groupBy === "severity"
        ? ["critical", "major", "minor"].indexOf(k)
        : groupBy === "state"
          ? ["open", "fix_proposed", "waived", "closed", "no_longer_found"].indexOf(k)
          : groupBy === "due"
            ? DUE_ORDER.indexOf(k)
            : 0;
    groups.sort(
      (a, b) =>
        orderOf(a.key) - orderOf(b.key) ||
        (groupBy === "assignee" && (a.key === "") !== (b.key === "") ? (a.key === "" ? 1 : -1) : a.key.localeCompare(b.key)),
    );
  }

  const dir = query.dir === "desc" ? "desc" : "asc";
  switch (query.sort ?? "due") {
    case "due":
      rowsQuery.orderByRaw(`CASE WHEN findings.due_on IS NULL THEN 1 ELSE 0 END, findings.due_on ${dir}`);
      break;
    case "severity":
      rowsQuery.orderByRaw(`${SEVERITY_ORDER} ${dir}`);
      break;
    case "branch":
      rowsQuery.orderBy("branch.name", dir);
      break;
    case "rule":
      rowsQuery.orderBy("findings.rule_id", dir);
      break;
    case "state":
      rowsQuery.orderByRaw(`${STATE_ORDER} ${dir}`);
      break;
    case "assignee":
      rowsQuery.orderByRaw(`CASE WHEN assignee.name IS NULL THEN 1 ELSE 0 END, assignee.name ${dir}`);
      break;
    case "opened":
      rowsQuery.orderBy("findings.opened_at", dir);
      break;
    case "updated":
      rowsQuery.orderBy("findings.updated_at", dir);
      break;
  }
  rowsQuery.orderBy("findings.id", dir);
  const rows = await rowsQuery.limit(pageSize).offset((page - 1) * pageSize);
  return { rows: rows.map(toListRow), total, page, pageSize, groupBy, groups };
}

export interface FindingEventRow {
  id: number;
  at: string;
  action: string;
  fromState: FindingState | null;
  toState: FindingState | null;
  note: string | null;
  actorId: number | null;
  actorName: string | null;
  data: Record<string, unknown> | null;
}

export interface FindingCommentRow {
  id: number;
  authorId: number;
  authorName: string;
  body: string;
  createdAt: string;
}

export interface FindingEvidenceRow {
  id: number;
  fileName: string;
  mime: string;
  sizeBytes: number;
  note: string | null;
  uploadedBy: number;
  uploadedByName: string;
  uploadedAt: string;
}

export interface FindingDetail extends FindingListRow {
  organisationId: number;
  /** Every branch the finding shows in (a person-level finding shows in each branch whose audit finds it). */
  branches: { id: number; name: string }[];
  identityKey: string;
  fix: string;
  citation: string;
  pack: string;
  waiverReason: string | null;
  branchTimeZone: string;
  closedAt: string | null;
  lastSeenAt: string;
  stateChangedAt: string;
  auditId: number | null;
  firstAuditId: number | null;
  audits: { id: number; createdAt: string; periodFrom: string; periodTo: string }[];
  events: FindingEventRow[];
  comments: FindingCommentRow[];
  evidence: FindingEvidenceRow[];
}

const parse = (text: unknown): Record<string, unknown> | null => {
  if (typeof text !== "string" || text === "") return null;
  try {
    return JSON.parse(text) as Record<string, unknown>;
  } catch {
    return null;
  }
};

/** One finding the scope allows, with its history, comments, evidence and audits; undefined otherwise. */
export async function getFinding(
  db: Knex,
  opts: { organisationId: number; scope: ScopeFn; id: number },
): Promise<FindingDetail | undefined> {
  const q = findingsWithJoins(db).where({ "findings.id": opts.id, "findings.organisation_id": opts.organisationId });
  applyScope(q, opts.scope);
  const r = await q.first([
    ...LIST_COLUMNS,
    "findings.organisation_id",
    "findings.identity_key",
    "findings.fix",
    "findings.citation",
    "findings.pack",
    "findings.waiver_reason",
    "findings.closed_at",
    "findings.last_seen_at",
    "findings.state_changed_at",
    "findings.audit_id",
    "findings.first_audit_id",
    "branch.time_zone as branch_time_zone",
  ]);
  if (!r) return undefined;
  const events = await db("finding_events as e")
    .leftJoin("users as u", "u.id", "e.actor_id")
    .where({ "e.finding_id": opts.id, "e.organisation_id": opts.organisationId })
    .orderBy([{ column: "e.at" }, { column: "e.id" }])
    .select("e.id", "e.at", "e.action", "e.from_state", "e.to_state", "e.note", "e.actor_id", "u.name as actor_name", "e.data");
  const comments = await db("comments as c")
    .join("users as u", "u.id", "c.author_id")
    .where({ "c.subject_type": "finding", "c.subject_id": opts.id, "c.organisation_id": opts.organisationId })
    .orderBy([{ column: "c.created_at" }, { column: "c.id" }])
    .select("c.id", "c.author_id", "u.name as author_name", "c.body", "c.created_at");
  const evidence = await db("evidence as ev")
    .join("users as u", "u.id", "ev.uploaded_by")
    .where({ "ev.subject_type": "finding", "ev.subject_id": opts.id, "ev.organisation_id": opts.organisationId })
    .orderBy([{ column: "ev.uploaded_at" }, { column: "ev.id" }])
    .select(
      "ev.id",
      "ev.file_name",
      "ev.mime",
      "ev.size_bytes",
      "ev.note",
      "ev.uploaded_by",
      "u.name as uploaded_by_name",
      "ev.uploaded_at",
    );
  const audits = await db("audit_findings as af")
    .join("audits as a", "a.id", "af.audit_id")
    .where("af.finding_id", opts.id)
    .orderBy("a.id", "desc")
    .limit(20)
    .select("a.id", "a.created_at", "a.period_from", "a.period_to");
  const shownIn = (await findingBranchIds(db, [{ id: opts.id, branchId: Number(r.branch_id) }])).get(opts.id) ?? [Number(r.branch_id)];
  const branchNames = new Map(
    (await db("branches").where({ organisation_id: opts.organisationId }).whereIn("id", shownIn).select("id", "name")).map((b) => [
      Number(b.id),
      b.name as string,
    ]),
  );
  return {
    ...toListRow(r),
    organisationId: Number(r.organisation_id),
    branches: shownIn.map((id) => ({ id, name: branchNames.get(id) ?? `#${id}` })),
    identityKey: r.identity_key,
    fix: r.fix,
    citation: r.citation,
    pack: r.pack,
    waiverReason: r.waiver_reason ?? null,
    branchTimeZone: r.branch_time_zone,
    closedAt: r.closed_at ?? null,
    lastSeenAt: r.last_seen_at,
    stateChangedAt: r.state_changed_at,
    auditId: toNumOrNull(r.audit_id),
    firstAuditId: toNumOrNull(r.first_audit_id),
    audits: audits.map((a) => ({ id: Number(a.id), createdAt: a.created_at, periodFrom: a.period_from, periodTo: a.period_to })),
    events: events.map((e) => ({
      id: Number(e.id),
      at: e.at,
      action: e.action,
      fromState: e.from_state ?? null,
      toState: e.to_state ?? null,
      note: e.note ?? null,
      actorId: toNumOrNull(e.actor_id),
      actorName: e.actor_name ?? null,
      data: parse(e.data),
    })),
    comments: comments.map((c) => ({
      id: Number(c.id),
      authorId: Number(c.author_id),
      authorName: c.author_name,
      body: c.body,
      createdAt: c.created_at,
    })),
    evidence: evidence.map((e) => ({
      id: Number(e.id),
      fileName: e.file_name,
      mime: e.mime,
      sizeBytes: Number(e.size_bytes),
      note: e.note ?? null,
      uploadedBy: Number(e.uploaded_by),
      uploadedByName: e.uploaded_by_name,
      uploadedAt: e.uploaded_at,
    })),
  };
}

/** Where a finding belongs, for permission checks: what the ability's conditions read. */
export interface FindingRef {
  id: number;
  organisationId: number;
  branchId: number;
  technicianId: number | null;
  state: FindingState;
  assigneeId: number | null;
}

/** The permission-relevant fields of findings of the organisation (missing ids are left out). */
export async function getFindingRefs(db: Knex, opts: { organisationId: number; ids: number[] }): Promise<FindingRef[]> {
  if (opts.ids.length === 0) return [];
  const rows = await db("findings")
    .where({ organisation_id: opts.organisationId })
    .whereIn("id", opts.ids)
    .select("id", "organisation_id", "branch_id", "technician_id", "state", "assignee_id");
  return rows.map((r) => ({
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    technicianId: toNumOrNull(r.technician_id),
    state: r.state,
    assigneeId: toNumOrNull(r.assignee_id),
  }));
}

// ---------------------------------------------------------------------------------------------- writes

export interface NotificationDraft {
  userId: number;
  kind: "finding_assigned" | "finding_fix_proposed" | "finding_accepted" | "finding_reopened" | "finding_waived" | "finding_digest";
  title: string;
  /** Plain-text paragraphs separated by blank lines. */
  body: string;
  link: string;
  subjectId: number | null;
}

/** Inserts in-app notifications (the outbox the mailer sends from) and returns their ids. */
export async function insertFindingNotifications(
  trx: Knex | Knex.Transaction,
  organisationId: number,
  drafts: NotificationDraft[],
  at: string,
): Promise<number[]> {
  const ids: number[] = [];
  const seen = new Set<string>();
  for (const d of drafts) {
    const key = `${d.userId}|${d.kind}|${d.subjectId}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const [row] = await trx("notifications")
      .insert({
        organisation_id: organisationId,
        user_id: d.userId,
        kind: d.kind,
        title: d.title.slice(0, 300),
        body: d.body,
        link: d.link,
        subject_type: d.subjectId === null ? null : "finding",
        subject_id: d.subjectId,
        created_at: at,
      })
      .returning("id");
    ids.push(rowId(row));
  }
  return ids;
}

export interface TransitionResult {
  id: number;
  state: FindingState;
  notificationIds: number[];
}

interface FindingForWrite {
  id: number;
  organisation_id: number;
  branch_id: number;
  branch_name: string;
  rule_id: string;
  title: string;
  detail: string;
  severity: Severity;
  state: FindingState;
  assignee_id: number | null;
  due_on: string | null;
}

/** Loads a finding the scope allows for a write, inside the transaction; 404 otherwise. */
async function findingForWrite(
  trx: Knex.Transaction,
  opts: { organisationId: number; scope: ScopeFn; id: number },
): Promise<FindingForWrite> {
  const q = trx("findings as findings")
    .join("branches as branch", "branch.id", "findings.branch_id")
    .where({ "findings.id": opts.id, "findings.organisation_id": opts.organisationId });
  applyScope(q, opts.scope);
  const r = await q.first(
    "findings.id",
    "findings.organisation_id",
    "findings.branch_id",
    "branch.name as branch_name",
    "findings.rule_id",
    "findings.title",
    "findings.detail",
    "findings.severity",
    "findings.state",
    "findings.assignee_id",
    "findings.due_on",
  );
  if (!r) throw new RecordNotFoundError("No such finding");
  return {
    ...r,
    id: Number(r.id),
    organisation_id: Number(r.organisation_id),
    branch_id: Number(r.branch_id),
    assignee_id: toNumOrNull(r.assignee_id),
  };
}

function refuseTransition(action: FindingAction, f: FindingForWrite): void {
  const refusal = transitionRefusal(action, f.state);
  if (refusal) throw new RecordConflictError(refusal, "state");
}

async function event(
  trx: Knex.Transaction,
  f: FindingForWrite,
  e: {
    actorId: number;
    at: string;
    action: string;
    from: FindingState | null;
    to: FindingState | null;
    note?: string | null;
    data?: unknown;
  },
): Promise<void> {
  await trx("finding_events").insert({
    organisation_id: f.organisation_id,
    finding_id: f.id,
    actor_id: e.actorId,
    at: e.at,
    action: e.action,
    from_state: e.from,
    to_state: e.to,
    note: e.note ?? null,
    data: e.data === undefined ? null : JSON.stringify(e.data),
  });
}

const link = (id: number) => `/findings/${id}`;
const describe = (f: FindingForWrite) => `${f.rule_id} ${f.title} (${f.branch_name}, finding #${f.id})`;

/** Users allowed to be given findings of a branch: its branch managers and the organisation's owners. */
export async function listAssignableUsers(
  db: Knex,
  opts: { organisationId: number; branchIds?: number[] },
): Promise<{ id: number; name: string; email: string; role: string; branchIds: number[] }[]> {
  const rows = await db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where({ "m.organisation_id": opts.organisationId, "u.active": true })
    .whereIn("m.role", ["branch_manager", "owner"])
    .orderBy([{ column: "u.name" }, { column: "u.id" }])
    .select("u.id", "u.name", "u.email", "m.role", "m.branch_id");
  const byUser = new Map<number, { id: number; name: string; email: string; role: string; branchIds: number[] }>();
  for (const r of rows) {
    const id = Number(r.id);
    const entry = byUser.get(id) ?? { id, name: r.name, email: r.email, role: r.role, branchIds: [] as number[] };
    if (r.role === "owner") entry.role = "owner";
    if (r.branch_id !== null) entry.branchIds.push(Number(r.branch_id));
    byUser.set(id, entry);
  }
  return [...byUser.values()].filter((u) => !opts.branchIds || u.role === "owner" || opts.branchIds.every((b) => u.branchIds.includes(b)));
}

/**
 * Assigns findings (or takes the assignment away with `assigneeId: null`) in one transaction. Every
 * finding must be within the scope (else 404, nothing written) and still to be acted on; the
 * assignee must manage the finding's branch or own the organisation. One notification per assignee.
 */
export async function assignFindings(
  db: Knex,
  opts: { actor: ActorRef; scope: ScopeFn; findingIds: number[]; assigneeId: number | null; now?: Date },
): Promise<{ assigned: number; notificationIds: number[] }> {
  const at = (opts.now ?? new Date()).toISOString();
  const ids = [...new Set(opts.findingIds)];
  return db.transaction(async (trx) => {
    const findings: FindingForWrite[] = [];
    for (const id of ids) findings.push(await findingForWrite(trx, { organisationId: opts.actor.organisationId, scope: opts.scope, id }));
    for (const f of findings) refuseTransition("assign", f);
    let assigneeName: string | null = null;
    if (opts.assigneeId !== null) {
      const assignee = await trx("users")
        .where({ id: opts.assigneeId, organisation_id: opts.actor.organisationId })
        .first("id", "name", "active");
      if (!assignee || !assignee.active) throw new InvalidInputError("Choose a person of your organisation who is active", "assigneeId");
      assigneeName = assignee.name;
      const memberships = await trx("memberships")
        .where({ user_id: opts.assigneeId, organisation_id: opts.actor.organisationId })
        .select("role", "branch_id");
      const owner = memberships.some((m) => m.role === "owner");
      const managed = new Set(memberships.filter((m) => m.role === "branch_manager").map((m) => Number(m.branch_id)));
      const shownIn = await findingBranchIds(
        trx,
        findings.map((f) => ({ id: f.id, branchId: f.branch_id })),
      );
      const outside = findings.find((f) => !owner && !(shownIn.get(f.id) ?? [f.branch_id]).some((b) => managed.has(b)));
      if (outside)
        throw new InvalidInputError(
          `${assignee.name} does not manage ${outside.branch_name}, so cannot fix finding #${outside.id}`,
          "assigneeId",
        );
    }
    for (const f of findings) {
      if (f.assignee_id === opts.assigneeId) continue;
      await trx("findings").where({ id: f.id }).update({ assignee_id: opts.assigneeId, updated_at: at });
      await event(trx, f, {
        actorId: opts.actor.userId,
        at,
        action: opts.assigneeId === null ? "unassigned" : "assigned",
        from: f.state,
        to: f.state,
        note: assigneeName ? `Assigned to ${assigneeName}` : "Assignment removed",
        data: { from: f.assignee_id, to: opts.assigneeId },
      });
    }
    const changed = findings.filter((f) => f.assignee_id !== opts.assigneeId);
    await appendActivity(trx, {
      organisationId: opts.actor.organisationId,
      actorId: opts.actor.userId,
      branchId: new Set(changed.map((f) => f.branch_id)).size === 1 ? changed[0]!.branch_id : null,
      action: opts.assigneeId === null ? "finding.unassigned" : "finding.assigned",
      subjectType: "finding",
      subjectId: changed.length === 1 ? changed[0]!.id : null,
      at,
      summary: assigneeName
        ? `Assigned ${changed.length} finding${changed.length === 1 ? "" : "s"} to ${assigneeName}`
        : `Removed the assignment of ${changed.length} finding${changed.length === 1 ? "" : "s"}`,
      data: { findingIds: changed.map((f) => f.id), assigneeId: opts.assigneeId },
    });
    let notificationIds: number[] = [];
    if (opts.assigneeId !== null && changed.length > 0 && opts.assigneeId !== opts.actor.userId) {
      const actor = await trx("users").where({ id: opts.actor.userId }).first("name");
      const lines = changed.slice(0, 20).map((f) => `• ${describe(f)}${f.due_on ? ` — due ${f.due_on}` : ""}`);
      if (changed.length > 20) lines.push(`… and ${changed.length - 20} more`);
      notificationIds = await insertFindingNotifications(
        trx,
        opts.actor.organisationId,
        [
          {
            userId: opts.assigneeId,
            kind: "finding_assigned",
            title:
              changed.length === 1
                ? `Finding assigned to you: ${changed[0]!.rule_id} ${changed[0]!.title}`
                : `${changed.length} findings assigned to you`,
            body: [
              `${actor?.name ?? "The compliance officer"} assigned ${changed.length === 1 ? "a finding" : `${changed.length} findings`} to you.`,
              lines.join("\n"),
              changed.length === 1 ? changed[0]!.detail : "Open each finding to see what is wrong and how to fix it.",
            ].join("\n\n"),
            link: changed.length === 1 ? link(changed[0]!.id) : `/findings?assignee=${opts.assigneeId}`,
            subjectId: changed.length === 1 ? changed[0]!.id : null,
          },
        ],
        at,
      );
    }
    return { assigned: changed.length, notificationIds };
  });
}

/** Who hears that a fix was proposed: whoever assigned the finding last, else every compliance officer. */
async function reviewersOf(trx: Knex.Transaction, f: FindingForWrite): Promise<number[]> {
  const assigned = await trx("finding_events")
    .where({ finding_id: f.id, action: "assigned" })
    .whereNotNull("actor_id")
    .orderBy([
      { column: "at", order: "desc" },
      { column: "id", order: "desc" },
    ])
    .first("actor_id");
  if (assigned) return [Number(assigned.actor_id)];
  const officers = await trx("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where({ "m.organisation_id": f.organisation_id, "m.role": "compliance_officer", "u.active": true })
    .distinct("u.id")
    .orderBy("u.id"); // ordered: DISTINCT rows come back in the planner's order, which differs between SQLite and PostgreSQL
  return officers.map((o) => Number(o.id));
}

/** The people who proposed fixes on a finding (for reopen notices). */
async function proposersOf(trx: Knex.Transaction, findingId: number): Promise<number[]> {
  const rows = await trx("finding_events")
    .where({ finding_id: findingId, action: "fix_proposed" })
    .whereNotNull("actor_id")
    .distinct("actor_id")
    .orderBy("actor_id"); // ordered: DISTINCT rows come back in the planner's order, which differs between SQLite and PostgreSQL
  return rows.map((r) => Number(r.actor_id));
}

export interface EvidenceFile {
  fileKey: string;
  fileName: string;
  mime: string;
  sizeBytes: number;
  note?: string | null;
}

async function insertEvidence(trx: Knex.Transaction, f: FindingForWrite, actorId: number, file: EvidenceFile, at: string): Promise<number> {
  const [row] = await trx("evidence")
    .insert({
      organisation_id: f.organisation_id,
      branch_id: f.branch_id,
      subject_type: "finding",
      subject_id: f.id,
      file_key: file.fileKey,
      file_name: file.fileName,
      mime: file.mime,
      size_bytes: file.sizeBytes,
      note: file.note ?? null,
      uploaded_by: actorId,
      uploaded_at: at,
    })
    .returning("id");
  return rowId(row);
}

/** The branch proposes a finding as fixed, with a note and optional evidence. */
export async function proposeFindingFix(
  db: Knex,
  opts: { actor: ActorRef; scope: ScopeFn; id: number; note: string; evidence?: EvidenceFile | null; now?: Date },
): Promise<TransitionResult> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const f = await findingForWrite(trx, { organisationId: opts.actor.organisationId, scope: opts.scope, id: opts.id });
    refuseTransition("propose_fix", f);
    let evidenceId: number | null = null;
    if (opts.evidence) evidenceId = await insertEvidence(trx, f, opts.actor.userId, opts.evidence, at);
    await trx("findings").where({ id: f.id }).update({ state: "fix_proposed", state_changed_at: at, updated_at: at });
    await event(trx, f, {
      actorId: opts.actor.userId,
      at,
      action: "fix_proposed",
      from: f.state,
      to: "fix_proposed",
      note: opts.note,
      data: { evidenceId },
    });
    await appendActivity(trx, {
      organisationId: f.organisation_id,
      actorId: opts.actor.userId,
      branchId: f.branch_id,
      action: "finding.fix_proposed",
      subjectType: "finding",
      subjectId: f.id,
      at,
      summary: `Proposed a fix for finding #${f.id} (${f.rule_id})${evidenceId ? " with evidence" : ""}`,
      data: { evidenceId },
    });
    const actor = await trx("users").where({ id: opts.actor.userId }).first("name");
    const notificationIds = await insertFindingNotifications(
      trx,
      f.organisation_id,
      (await reviewersOf(trx, f))
        .filter((u) => u !== opts.actor.userId)
        .map((userId) => ({
          userId,
          kind: "finding_fix_proposed" as const,
          title: `Fix proposed: ${f.rule_id} ${f.title} (${f.branch_name})`,
          body: [
            `${actor?.name ?? "The branch"} proposed a fix for ${describe(f)} and asks you to accept it.`,
            `What was done: ${opts.note}`,
            evidenceId ? "Evidence is attached to the finding." : "No evidence was attached.",
          ].join("\n\n"),
          link: link(f.id),
          subjectId: f.id,
        })),
      at,
    );
    return { id: f.id, state: "fix_proposed", notificationIds };
  });
}

/** The officer accepts a proposed fix: the finding is closed. */
export async function acceptFindingFix(
  db: Knex,
  opts: { actor: ActorRef; scope: ScopeFn; id: number; note?: string | null; now?: Date },
): Promise<TransitionResult> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const f = await findingForWrite(trx, { organisationId: opts.actor.organisationId, scope: opts.scope, id: opts.id });
    refuseTransition("accept", f);
    await trx("findings").where({ id: f.id }).update({ state: "closed", state_changed_at: at, closed_at: at, updated_at: at });
    await event(trx, f, { actorId: opts.actor.userId, at, action: "accepted", from: f.state, to: "closed", note: opts.note ?? null });
    await appendActivity(trx, {
      organisationId: f.organisation_id,
      actorId: opts.actor.userId,
      branchId: f.branch_id,
      action: "finding.accepted",
      subjectType: "finding",
      subjectId: f.id,
      at,
      summary: `Accepted the fix of finding #${f.id} (${f.rule_id}); the finding is closed`,
    });
    const actor = await trx("users").where({ id: opts.actor.userId }).first("name");
    const people = new Set([...(f.assignee_id ? [f.assignee_id] : []), ...(await proposersOf(trx, f.id))]);
    people.delete(opts.actor.userId);
    const notificationIds = await insertFindingNotifications(
      trx,
      f.organisation_id,
      [...people].map((userId) => ({
        userId,
        kind: "finding_accepted" as const,
        title: `Fix accepted: ${f.rule_id} ${f.title} (${f.branch_name})`,
        body: [
          `${actor?.name ?? "The compliance officer"} accepted the fix of ${describe(f)}. The finding is closed.`,
          ...(opts.note ? [opts.note] : []),
        ].join("\n\n"),
        link: link(f.id),
        subjectId: f.id,
      })),
      at,
    );
    return { id: f.id, state: "closed", notificationIds };
  });
}

/** The officer sends a finding back to open, with a reason. */
export async function reopenFinding(
  db: Knex,
  opts: { actor: ActorRef; scope: ScopeFn; id: number; reason: string; now?: Date },
): Promise<TransitionResult> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const f = await findingForWrite(trx, { organisationId: opts.actor.organisationId, scope: opts.scope, id: opts.id });
    refuseTransition("reopen", f);
    await trx("findings")
      .where({ id: f.id })
      .update({ state: "open", state_changed_at: at, closed_at: null, waiver_reason: null, updated_at: at });
    await event(trx, f, { actorId: opts.actor.userId, at, action: "reopened", from: f.state, to: "open", note: opts.reason });
    await appendActivity(trx, {
      organisationId: f.organisation_id,
      actorId: opts.actor.userId,
      branchId: f.branch_id,
      action: "finding.reopened",
      subjectType: "finding",
      subjectId: f.id,
      at,
      summary: `Reopened finding #${f.id} (${f.rule_id}): ${opts.reason}`.slice(0, 500),
    });
    const actor = await trx("users").where({ id: opts.actor.userId }).first("name");
    const people = new Set([...(f.assignee_id ? [f.assignee_id] : []), ...(await proposersOf(trx, f.id))]);
    people.delete(opts.actor.userId);
    const notificationIds = await insertFindingNotifications(
      trx,
      f.organisation_id,
      [...people].map((userId) => ({
        userId,
        kind: "finding_reopened" as const,
        title: `Finding reopened: ${f.rule_id} ${f.title} (${f.branch_name})`,
        body: [
          `${actor?.name ?? "The compliance officer"} reopened ${describe(f)}.`,
          `Why: ${opts.reason}`,
          f.due_on ? `It is due by ${f.due_on}.` : "",
        ]
          .filter(Boolean)
          .join("\n\n"),
        link: link(f.id),
        subjectId: f.id,
      })),
      at,
    );
    return { id: f.id, state: "open", notificationIds };
  });
}

/** The officer decides no fix is needed, with a required reason. */
export async function waiveFinding(
  db: Knex,
  opts: { actor: ActorRef; scope: ScopeFn; id: number; reason: string; now?: Date },
): Promise<TransitionResult> {
  const at = (opts.now ?? new Date()).toISOString();
  const reason = opts.reason.trim();
  if (reason.length < 10) throw new InvalidInputError("Write why no fix is needed (at least 10 characters)", "reason");
  return db.transaction(async (trx) => {
    const f = await findingForWrite(trx, { organisationId: opts.actor.organisationId, scope: opts.scope, id: opts.id });
    refuseTransition("waive", f);
    await trx("findings")
      .where({ id: f.id })
      .update({ state: "waived", waiver_reason: reason, state_changed_at: at, closed_at: at, updated_at: at });
    await event(trx, f, { actorId: opts.actor.userId, at, action: "waived", from: f.state, to: "waived", note: reason });
    await appendActivity(trx, {
      organisationId: f.organisation_id,
      actorId: opts.actor.userId,
      branchId: f.branch_id,
      action: "finding.waived",
      subjectType: "finding",
      subjectId: f.id,
      at,
      summary: `Waived finding #${f.id} (${f.rule_id}): ${reason}`.slice(0, 500),
    });
    const actor = await trx("users").where({ id: opts.actor.userId }).first("name");
    const managers = await trx("memberships")
      .where({ organisation_id: f.organisation_id, branch_id: f.branch_id, role: "branch_manager" })
      .distinct("user_id")
      .orderBy("user_id"); // ordered: DISTINCT rows come back in the planner's order, which differs between SQLite and PostgreSQL
    const people = new Set([...(f.assignee_id ? [f.assignee_id] : []), ...managers.map((m) => Number(m.user_id))]);
    people.delete(opts.actor.userId);
    const notificationIds = await insertFindingNotifications(
      trx,
      f.organisation_id,
      [...people].map((userId) => ({
        userId,
        kind: "finding_waived" as const,
        title: `Finding waived: ${f.rule_id} ${f.title} (${f.branch_name})`,
        body: [`${actor?.name ?? "The compliance officer"} waived ${describe(f)}: no fix is needed.`, `Why: ${reason}`].join("\n\n"),
        link: link(f.id),
        subjectId: f.id,
      })),
      at,
    );
    return { id: f.id, state: "waived", notificationIds };
  });
}

/** A comment on a finding (anyone the scope allows to comment). */
export async function addFindingComment(
  db: Knex,
  opts: { actor: ActorRef; scope: ScopeFn; id: number; body: string; now?: Date },
): Promise<number> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const f = await findingForWrite(trx, { organisationId: opts.actor.organisationId, scope: opts.scope, id: opts.id });
    const [row] = await trx("comments")
      .insert({
        organisation_id: f.organisation_id,
        branch_id: f.branch_id,
        subject_type: "finding",
        subject_id: f.id,
        author_id: opts.actor.userId,
        body: opts.body,
        created_at: at,
      })
      .returning("id");
    const id = rowId(row);
    await appendActivity(trx, {
      organisationId: f.organisation_id,
      actorId: opts.actor.userId,
      branchId: f.branch_id,
      action: "finding.commented",
      subjectType: "finding",
      subjectId: f.id,
      at,
      summary: `Commented on finding #${f.id} (${f.rule_id})`,
      data: { commentId: id },
    });
    return id;
  });
}

/** Evidence attached to a finding (a file already stored by the caller). */
export async function addFindingEvidence(
  db: Knex,
  opts: { actor: ActorRef; scope: ScopeFn; id: number; file: EvidenceFile; now?: Date },
): Promise<number> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const f = await findingForWrite(trx, { organisationId: opts.actor.organisationId, scope: opts.scope, id: opts.id });
    const id = await insertEvidence(trx, f, opts.actor.userId, opts.file, at);
    await event(trx, f, {
      actorId: opts.actor.userId,
      at,
      action: "evidence_added",
      from: f.state,
      to: f.state,
      note: opts.file.note ?? `Attached ${opts.file.fileName}`,
      data: { evidenceId: id },
    });
    await appendActivity(trx, {
      organisationId: f.organisation_id,
      actorId: opts.actor.userId,
      branchId: f.branch_id,
      action: "finding.evidence_added",
      subjectType: "finding",
      subjectId: f.id,
      at,
      summary: `Attached evidence ${opts.file.fileName} to finding #${f.id}`,
      data: { evidenceId: id },
    });
    return id;
  });
}

/** One evidence file of a finding the scope allows (for download); undefined otherwise. */
export async function getFindingEvidence(
  db: Knex,
  opts: { organisationId: number; scope: ScopeFn; findingId: number; evidenceId: number },
): Promise<{ fileKey: string; fileName: string; mime: string } | undefined> {
  const q = db("evidence as ev").join("findings as findings", "findings.id", "ev.subject_id").where({
    "ev.id": opts.evidenceId,
    "ev.subject_type": "finding",
    "ev.subject_id": opts.findingId,
    "ev.organisation_id": opts.organisationId,
  });
  applyScope(q, opts.scope);
  const r = await q.first("ev.file_key", "ev.file_name", "ev.mime");
  return r ? { fileKey: r.file_key, fileName: r.file_name, mime: r.mime } : undefined;
}

export interface PendingMail {
  id: number;
  userId: number;
  email: string;
  name: string;
  kind: string;
  title: string;
  body: string;
  link: string | null;
}

/** Notifications not e-mailed yet, with the recipient's address (active people only). */
export async function listUnsentFindingMail(db: Knex, opts: { ids?: number[]; since?: string; limit?: number }): Promise<PendingMail[]> {
  const q = db("notifications as n").join("users as u", "u.id", "n.user_id").whereNull("n.emailed_at").where("u.active", true);
  if (opts.ids) q.whereIn("n.id", opts.ids.length ? opts.ids : [-1]);
  if (opts.since) q.where("n.created_at", ">=", opts.since);
  const rows = await q
    .orderBy("n.id")
    .limit(opts.limit ?? 500)
    .select("n.id", "n.user_id", "u.email", "u.name", "n.kind", "n.title", "n.body", "n.link");
  return rows.map((r) => ({
    id: Number(r.id),
    userId: Number(r.user_id),
    email: r.email,
    name: r.name,
    kind: r.kind,
    title: r.title,
    body: r.body ?? "",
    link: r.link ?? null,
  }));
}

export async function markFindingMailSent(db: Knex, opts: { id: number; at?: Date }): Promise<void> {
  await db("notifications")
    .where({ id: opts.id })
    .update({ emailed_at: (opts.at ?? new Date()).toISOString() });
}
