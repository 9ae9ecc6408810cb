import "server-only";
import { PassThrough, Readable } from "node:stream";
import ExcelJS from "exceljs";
import {
  ACCESS_METHOD_LABELS,
  APPLIANCE_CATEGORY_LABELS,
  CERTIFICATION_STATE_LABELS,
  CERTIFICATION_TYPE_LABELS,
  REGISTER_LABELS,
  EVACUATION_UNIT_LABELS,
  FINDING_STATE_LABELS,
  JOB_KIND_LABELS,
  RULE_PACKS,
  SEVERITY_LABELS,
  type AccessMethod,
  type ApplianceCategory,
  type AuditSettings,
  type CertificationState,
  type CertificationType,
  type CylinderStatus,
  type EvacuationUnit,
  type FindingState,
  type JobKind,
  type RulePack,
  type Severity,
} from "@coldtrail/core";
import {
  auditFindingCounts,
  auditFindingExportRows,
  certificationExportRows,
  cylinderExportRows,
  disposalExportRows,
  jobExportRows,
  leakRateExportRows,
  type AuditRun,
  type Knex,
  type ScopeFn,
} from "@coldtrail/db";

/**
 * The audit workbook, written with exceljs's streaming writer straight into the HTTP response: each
 * row is committed as soon as it is read (records come from the database in batches), so a large
 * audit never sits in memory and the download starts at once. Sheets: Summary, Findings, and the
 * records behind them — Jobs, Leak rates, Cylinders, Certifications, Disposals. Every sheet starts
 * with the date its figures are as of (the period's figures are the period's: cylinder contents at
 * its end, not today's), then a frozen header row with a filter, widths to read by, units in the
 * headers, real dates, the product's own words for states, and text that can never run as a formula.
 */

export const PACK_LABELS: Record<RulePack, string> = {
  us_federal: "US federal (40 CFR 82 Subpart F, 40 CFR 84)",
  eu: "EU (Regulation 2024/573)",
};

export const SHEET_NAMES = ["Summary", "Findings", "Jobs", "Leak rates", "Cylinders", "Certifications", "Disposals"] as const;

const LB = 453.59237;
const kg = (g: number | null) => (g === null ? null : Math.round(g) / 1000);
const lb = (g: number | null) => (g === null ? null : Math.round((g / LB) * 100) / 100);
const date = (iso: string | null | undefined) => (iso ? new Date(`${iso.slice(0, 10)}T00:00:00.000Z`) : null);
const instant = (iso: string | null | undefined) => (iso ? new Date(iso) : null);

type Column = { header: string; key: string; width: number; style?: Partial<ExcelJS.Style> };
const DATE: Partial<ExcelJS.Style> = { numFmt: "yyyy-mm-dd" };
const DATETIME: Partial<ExcelJS.Style> = { numFmt: "yyyy-mm-dd hh:mm" };
const MASS_KG: Partial<ExcelJS.Style> = { numFmt: "0.000" };
const MASS_LB: Partial<ExcelJS.Style> = { numFmt: "0.00" };
const WRAP: Partial<ExcelJS.Style> = { alignment: { wrapText: true, vertical: "top" } };

const columnLetter = (n: number) => {
  let s = "";
  for (let x = n; x > 0; x = Math.floor((x - 1) / 26)) s = String.fromCharCode(65 + ((x - 1) % 26)) + s;
  return s;
};

/**
 * Text that a spreadsheet program could read as a formula (= + - @, or a leading tab or carriage
 * return, which some programs strip before looking) gets a leading apostrophe as part of the text.
 * The apostrophe is stored in the cell, not used as Excel's hidden text prefix, so it survives a
 * re-save as CSV: reopened, the value still starts with "'" and is never evaluated.
 */
export function spreadsheetSafe(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** A row's values with every string made safe (numbers, dates and empty cells pass unchanged). */
function safe<T extends Record<string, unknown>>(row: T): T {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(row)) out[k] = typeof v === "string" ? spreadsheetSafe(v) : v;
  return out as T;
}

/** Rows above the column headers: the "as of" line. The header is row 2, frozen with it and filtered. */
export const HEADER_ROW = 2;

/**
 * A sheet with the date its figures are as of on the first row, the column headers on the second
 * (frozen, with a filter), and the data below.
 */
function table(wb: ExcelJS.stream.xlsx.WorkbookWriter, name: string, columns: Column[], asOf: string): ExcelJS.Worksheet {
  const ws = wb.addWorksheet(name, { views: [{ state: "frozen", ySplit: HEADER_ROW }] });
  ws.columns = columns.map((c) => ({ key: c.key, width: c.width, ...(c.style ? { style: c.style } : {}) }));
  const note = ws.addRow([spreadsheetSafe(asOf)]);
  note.getCell(1).style = { font: { italic: true }, alignment: { wrapText: false } };
  note.commit();
  const header = ws.addRow(columns.map((c) => c.header));
  header.font = { bold: true };
  header.alignment = { vertical: "middle", wrapText: true };
  header.commit();
  ws.autoFilter = { from: `A${HEADER_ROW}`, to: `${columnLetter(columns.length)}${HEADER_ROW}` };
  return ws;
}

export interface AuditExportOptions {
  audit: AuditRun;
  organisationName: string;
  branchNames: Map<number, string>;
  exportedBy: string;
  settings: AuditSettings;
  /** Branches whose records the person may read, per sheet (a subset of the audit's scope). */
  branchIds: { jobs: number[]; leak: number[]; cylinders: number[]; certifications: number[]; disposals: number[] };
  scopes: { findings: ScopeFn; jobs: ScopeFn; cylinders: ScopeFn; disposals: ScopeFn };
  jobVisible: (job: { branchId: number; performedOn: string; technicianId: number | null }) => boolean;
}

async function writeWorkbook(db: Knex, wb: ExcelJS.stream.xlsx.WorkbookWriter, o: AuditExportOptions): Promise<void> {
  const { audit } = o;
  const period = { from: audit.periodFrom, to: audit.periodTo };
  const counts = await auditFindingCounts(db, { organisationId: audit.organisationId, auditId: audit.id, scope: o.scopes.findings });

  const exportedAt = new Date();
  const exportedOn = exportedAt.toISOString().slice(0, 10);
  // The period's own figures are as of its last day (never later than the day of the export).
  const periodEnd = period.to < exportedOn ? period.to : exportedOn;
  const AS_OF = {
    summary: `Figures as of ${exportedOn}: the findings and their status on the day of the export (${exportedAt.toISOString().slice(0, 16).replace("T", " ")} UTC); the audit period is ${period.from} to ${period.to}.`,
    findings: `Figures as of ${exportedOn} (the day of the export): the status now of the findings audit #${audit.id} saw in its period ${period.from} to ${period.to}.`,
    jobs: `Figures as of ${exportedOn}: jobs performed ${period.from} to ${period.to}, as recorded on the day of the export (corrections included, voided jobs left out).`,
    leaks: `Figures as of ${periodEnd} (end of the audit period): every addition in ${period.from} to ${period.to}, computed from the records up to that date.`,
    cylinders: `Figures as of ${periodEnd} (end of the audit period): contents and fill are the register less everything recorded after that date. Status and requalification as recorded on ${exportedOn}.`,
    certifications: `Figures as of ${exportedOn}: verification status on the day of the export.`,
    disposals: `Figures as of ${exportedOn}: disposals dated ${period.from} to ${period.to}, as recorded on the day of the export.`,
  };

  // Summary
  const summary = table(
    wb,
    "Summary",
    [
      { header: "Item", key: "a", width: 34 },
      { header: "Value", key: "b", width: 60 },
      { header: "Critical", key: "c", width: 10 },
      { header: "Major", key: "d", width: 10 },
      { header: "Minor", key: "e", width: 10 },
      { header: "Total", key: "f", width: 10 },
    ],
    AS_OF.summary,
  );
  const line = (a: string, b: unknown, style?: Partial<ExcelJS.Style>) => {
    const row = summary.addRow(safe({ a, b }));
    if (style) row.getCell(2).style = style;
    row.commit();
  };
  line("Organisation", o.organisationName);
  line("Audit", `#${audit.id}`);
  line("Scope (branches)", audit.branchIds.map((id) => o.branchNames.get(id) ?? `#${id}`).join(", "));
  line("Period from", date(period.from), DATE);
  line("Period to", date(period.to), DATE);
  line("Rule packs", audit.packs.map((p) => PACK_LABELS[p]).join("; "));
  line("Run by", audit.startedByName);
  line("Started at (UTC)", instant(audit.startedAt ?? audit.createdAt), DATETIME);
  line("Finished at (UTC)", instant(audit.finishedAt), DATETIME);
  line(
    "State",
    audit.state === "done" ? "Finished" : audit.state === "failed" ? `Stopped: ${audit.error ?? ""}` : "Still running when exported",
  );
  line("Exported by", o.exportedBy);
  line("Exported at (UTC)", exportedAt, DATETIME);
  line(
    "Findings in this workbook",
    counts.reduce((n, c) => n + c.n, 0),
  );
  summary.addRow({}).commit();

  const heading = (a: string, b: string) => {
    const row = summary.addRow(safe({ a, b, c: "Critical", d: "Major", e: "Minor", f: "Total" }));
    row.font = { bold: true };
    row.commit();
  };
  const sumRow = (a: string, b: string, by: Record<Severity, number>) => {
    summary.addRow(safe({ a, b, c: by.critical, d: by.major, e: by.minor, f: by.critical + by.major + by.minor })).commit();
  };
  const group = (key: (c: (typeof counts)[number]) => string) => {
    const m = new Map<string, Record<Severity, number>>();
    for (const c of counts) {
      const k = key(c);
      const e = m.get(k) ?? { critical: 0, major: 0, minor: 0 };
      e[c.severity] += c.n;
      m.set(k, e);
    }
    return [...m.entries()].sort(([a], [b]) => a.localeCompare(b));
  };
  heading("Findings by branch", "Branch");
  for (const [branch, by] of group((c) => c.branchName)) sumRow("", branch, by);
  summary.addRow({}).commit();
  heading("Findings by rule", "Rule");
  const titles = new Map(counts.map((c) => [c.ruleId, c.title]));
  for (const [rule, by] of group((c) => c.ruleId)) sumRow(rule, titles.get(rule) ?? "", by);
  summary.addRow({}).commit();
  heading("Findings by severity", "Severity");
  const total = group(() => "all")[0]?.[1] ?? { critical: 0, major: 0, minor: 0 };
  for (const s of ["critical", "major", "minor"] as Severity[])
    sumRow("", SEVERITY_LABELS[s], { critical: 0, major: 0, minor: 0, [s]: total[s] });
  summary.addRow({}).commit();
  line(
    "Masses",
    "Stored in grams; shown in kilograms (kg) and pounds (lb) in their own columns. Dates are calendar dates in each branch's time zone.",
  );
  line("Status words", Object.values(FINDING_STATE_LABELS).join(", "));
  line("Rule packs available", RULE_PACKS.map((p) => PACK_LABELS[p]).join("; "));
  summary.commit();

  // Findings: one row per finding of the audit.
  const findings = table(
    wb,
    "Findings",
    [
      { header: "Finding id", key: "id", width: 11 },
      { header: "Branch", key: "branch", width: 14 },
      { header: "Rule id", key: "rule", width: 13 },
      { header: "Title", key: "title", width: 40, style: WRAP },
      { header: "Severity", key: "severity", width: 10 },
      { header: "Status", key: "status", width: 16 },
      { header: "Record", key: "record", width: 30 },
      { header: "What is wrong", key: "detail", width: 70, style: WRAP },
      { header: "How to fix it", key: "fix", width: 60, style: WRAP },
      { header: "Citation", key: "citation", width: 36, style: WRAP },
      { header: "Due", key: "due", width: 12, style: DATE },
      { header: "Assignee", key: "assignee", width: 22 },
      { header: "Last change (UTC)", key: "changed", width: 18, style: DATETIME },
      { header: "Date of the event", key: "occurred", width: 14, style: DATE },
      { header: "Technician named", key: "technician", width: 22 },
    ],
    AS_OF.findings,
  );
  for await (const f of auditFindingExportRows(db, { organisationId: audit.organisationId, auditId: audit.id, scope: o.scopes.findings })) {
    findings
      .addRow(
        safe({
          id: f.id,
          branch: f.branchName,
          rule: f.ruleId,
          title: f.title,
          severity: SEVERITY_LABELS[f.severity],
          status: FINDING_STATE_LABELS[f.state as FindingState] ?? f.state,
          record: f.recordLabel,
          detail: f.detail,
          fix: f.fix,
          citation: f.citation,
          due: date(f.dueOn),
          assignee: f.assigneeName ?? "",
          changed: instant(f.updatedAt),
          occurred: date(f.occurredOn),
          technician: f.technicianName ?? "",
        }),
      )
      .commit();
  }
  findings.commit();

  // Jobs of the period.
  const jobs = table(
    wb,
    "Jobs",
    [
      { header: "Job id", key: "id", width: 9 },
      { header: "Date", key: "date", width: 12, style: DATE },
      { header: "Branch", key: "branch", width: 14 },
      { header: "Kind", key: "kind", width: 18 },
      { header: "Appliance", key: "appliance", width: 16 },
      { header: "Description", key: "description", width: 34 },
      { header: "Category", key: "category", width: 26 },
      { header: "Technician", key: "technician", width: 22 },
      { header: "Refrigerant", key: "refrigerant", width: 12 },
      { header: "Recovered (kg)", key: "recKg", width: 14, style: MASS_KG },
      { header: "Recovered (lb)", key: "recLb", width: 14, style: MASS_LB },
      { header: "Charged (kg)", key: "chgKg", width: 13, style: MASS_KG },
      { header: "Charged (lb)", key: "chgLb", width: 13, style: MASS_LB },
      { header: "Cylinder", key: "cylinder", width: 14 },
      { header: "Recovery equipment", key: "equipment", width: 18 },
      { header: "Evacuation reached", key: "evac", width: 12 },
      { header: "Evacuation unit", key: "evacUnit", width: 22 },
      { header: "Access", key: "access", width: 30 },
      { header: "Temporary device removed", key: "removed", width: 14 },
    ],
    AS_OF.jobs,
  );
  for await (const j of jobExportRows(db, {
    organisationId: audit.organisationId,
    branchIds: o.branchIds.jobs,
    from: period.from,
    to: period.to,
    scope: o.scopes.jobs,
  })) {
    jobs
      .addRow(
        safe({
          id: j.id,
          date: date(j.performedOn),
          branch: j.branchName,
          kind: JOB_KIND_LABELS[j.kind as JobKind] ?? j.kind,
          appliance: j.applianceTag,
          description: j.applianceDescription,
          category: APPLIANCE_CATEGORY_LABELS[j.category as ApplianceCategory] ?? j.category,
          technician: j.technicianName,
          refrigerant: j.refrigerant ?? "",
          recKg: j.recoveredG ? kg(j.recoveredG) : null,
          recLb: j.recoveredG ? lb(j.recoveredG) : null,
          chgKg: j.chargedG ? kg(j.chargedG) : null,
          chgLb: j.chargedG ? lb(j.chargedG) : null,
          cylinder: j.cylinderSerial ?? "",
          equipment: j.equipmentSerial ?? "",
          evac: j.evacuationValue,
          evacUnit: j.evacuationUnit ? (EVACUATION_UNIT_LABELS[j.evacuationUnit as EvacuationUnit] ?? j.evacuationUnit) : "",
          access: j.accessMethod ? (ACCESS_METHOD_LABELS[j.accessMethod as AccessMethod] ?? j.accessMethod) : "",
          removed: j.temporaryAccessRemoved === null ? "" : j.temporaryAccessRemoved ? "Yes" : "No",
        }),
      )
      .commit();
  }
  jobs.commit();

  // Leak-rate calculations with their inputs.
  const leaks = table(
    wb,
    "Leak rates",
    [
      { header: "Branch", key: "branch", width: 14 },
      { header: "Appliance", key: "appliance", width: 16 },
      { header: "Category", key: "category", width: 26 },
      { header: "Refrigerant", key: "refrigerant", width: 12 },
      { header: "Full charge (kg)", key: "fullKg", width: 14, style: MASS_KG },
      { header: "Full charge (lb)", key: "fullLb", width: 14, style: MASS_LB },
      { header: "Date of addition", key: "date", width: 14, style: DATE },
      { header: "Added, counted (kg)", key: "addKg", width: 15, style: MASS_KG },
      { header: "Added, counted (lb)", key: "addLb", width: 15, style: MASS_LB },
      { header: "Added, not counted (kg)", key: "exKg", width: 16, style: MASS_KG },
      { header: "Days since last addition", key: "days", width: 14 },
      { header: "Method", key: "method", width: 16 },
      { header: "Leak rate (%)", key: "rate", width: 12, style: { numFmt: "0.00" } },
      { header: "Threshold (%)", key: "threshold", width: 12 },
      { header: "Over the threshold", key: "over", width: 12 },
      { header: "Rules applied", key: "regime", width: 26 },
      { header: "Job ids", key: "jobs", width: 14 },
    ],
    AS_OF.leaks,
  );
  const REGIMES: Record<string, string> = {
    us_608_ods: "40 CFR 82 (ozone-depleting)",
    us_608_substitute: "40 CFR 82 (substitute)",
    us_aim_hfc: "40 CFR 84 (AIM Act HFC)",
  };
  for await (const l of leakRateExportRows(db, {
    organisationId: audit.organisationId,
    branchIds: o.branchIds.leak,
    from: period.from,
    to: period.to,
    settings: o.settings,
    jobVisible: o.jobVisible,
  })) {
    leaks
      .addRow(
        safe({
          branch: l.branchName,
          appliance: l.applianceTag,
          category: APPLIANCE_CATEGORY_LABELS[l.category as ApplianceCategory] ?? l.category,
          refrigerant: l.refrigerant,
          fullKg: kg(l.fullChargeG),
          fullLb: lb(l.fullChargeG),
          date: date(l.on),
          addKg: kg(l.addedG),
          addLb: lb(l.addedG),
          exKg: l.excludedG ? kg(l.excludedG) : null,
          days: l.daysSinceLastAddition,
          method: l.method === "annualizing" ? "Annualizing" : "Rolling average",
          rate: l.percent,
          threshold: l.threshold,
          over: l.exceeds ? "Yes" : "No",
          regime: REGIMES[l.regime] ?? l.regime,
          jobs: l.jobIds.join(", "),
        }),
      )
      .commit();
  }
  leaks.commit();

  // Cylinders of the branches (their state now).
  const cylinders = table(
    wb,
    "Cylinders",
    [
      { header: "Branch", key: "branch", width: 14 },
      { header: "Serial", key: "serial", width: 14 },
      { header: "Specification", key: "spec", width: 14 },
      { header: "Water capacity (kg)", key: "wcKg", width: 14, style: MASS_KG },
      { header: "Water capacity (lb)", key: "wcLb", width: 14, style: MASS_LB },
      { header: "Tare (kg)", key: "tareKg", width: 11, style: MASS_KG },
      { header: "Tare (lb)", key: "tareLb", width: 11, style: MASS_LB },
      { header: "Refrigerant", key: "refrigerant", width: 12 },
      { header: "Contents (kg)", key: "kg", width: 13, style: MASS_KG },
      { header: "Contents (lb)", key: "lb", width: 13, style: MASS_LB },
      { header: "Maximum fill (kg)", key: "maxKg", width: 14, style: MASS_KG },
      { header: "Maximum fill (lb)", key: "maxLb", width: 14, style: MASS_LB },
      { header: "Fill (% of maximum)", key: "fill", width: 13, style: { numFmt: "0.0" } },
      { header: "Last requalified", key: "requal", width: 14, style: DATE },
      { header: "Requalification due", key: "due", width: 14, style: DATE },
      { header: "Status", key: "status", width: 12 },
    ],
    AS_OF.cylinders,
  );
  for await (const c of cylinderExportRows(db, {
    organisationId: audit.organisationId,
    branchIds: o.branchIds.cylinders,
    scope: o.scopes.cylinders,
    settings: o.settings,
    asOf: periodEnd,
  })) {
    cylinders
      .addRow(
        safe({
          branch: c.branchName,
          serial: c.serial,
          spec: c.specification ?? "",
          wcKg: kg(c.waterCapacityG),
          wcLb: lb(c.waterCapacityG),
          tareKg: kg(c.tareG),
          tareLb: lb(c.tareG),
          refrigerant: c.refrigerant ?? "",
          kg: kg(c.contentsG),
          lb: lb(c.contentsG),
          maxKg: kg(c.maxNetG),
          maxLb: lb(c.maxNetG),
          fill: c.fillPercent,
          requal: date(c.lastRequalifiedOn),
          due: date(c.requalificationDueOn),
          status: REGISTER_LABELS.cylinderStatus[c.status as CylinderStatus] ?? c.status,
        }),
      )
      .commit();
  }
  cylinders.commit();

  // Certifications of the branches' technicians.
  const certs = table(
    wb,
    "Certifications",
    [
      { header: "Technician", key: "technician", width: 24 },
      { header: "Branches", key: "branches", width: 18 },
      { header: "Certifying organisation", key: "org", width: 34 },
      { header: "Certificate number", key: "number", width: 16 },
      { header: "Types", key: "types", width: 22 },
      { header: "Verification", key: "state", width: 12 },
      { header: "Issued on", key: "issued", width: 12, style: DATE },
      { header: "Verified at (UTC)", key: "verified", width: 18, style: DATETIME },
      { header: "Card uploaded at (UTC)", key: "uploaded", width: 18, style: DATETIME },
    ],
    AS_OF.certifications,
  );
  for await (const c of certificationExportRows(db, { organisationId: audit.organisationId, branchIds: o.branchIds.certifications })) {
    certs
      .addRow(
        safe({
          technician: c.technicianName,
          branches: c.branchNames,
          org: c.certifyingOrganisation,
          number: c.certificateNumber,
          types: c.types.map((t) => CERTIFICATION_TYPE_LABELS[t as CertificationType] ?? t).join(" + "),
          state: CERTIFICATION_STATE_LABELS[c.state as CertificationState] ?? c.state,
          issued: date(c.issuedOn),
          verified: instant(c.verifiedAt),
          uploaded: instant(c.uploadedAt),
        }),
      )
      .commit();
  }
  certs.commit();

  // Disposal records and signed statements of the period.
  const disposals = table(
    wb,
    "Disposals",
    [
      { header: "Kind", key: "kind", width: 18 },
      { header: "Record id", key: "id", width: 10 },
      { header: "Branch", key: "branch", width: 14 },
      { header: "Appliance", key: "appliance", width: 16 },
      { header: "Category", key: "category", width: 24 },
      { header: "Full charge (kg)", key: "fullKg", width: 14, style: MASS_KG },
      { header: "Full charge (lb)", key: "fullLb", width: 14, style: MASS_LB },
      { header: "Date", key: "date", width: 12, style: DATE },
      { header: "Refrigerant", key: "refrigerant", width: 12 },
      { header: "Recovered (kg)", key: "recKg", width: 14, style: MASS_KG },
      { header: "Recovered (lb)", key: "recLb", width: 14, style: MASS_LB },
      { header: "Location or address", key: "location", width: 36, style: WRAP },
      { header: "Recovered by", key: "by", width: 22 },
      { header: "Signed by", key: "signedBy", width: 22 },
      { header: "Signed on", key: "signedOn", width: 12, style: DATE },
      { header: "Job id", key: "job", width: 9 },
    ],
    AS_OF.disposals,
  );
  for await (const d of disposalExportRows(db, {
    organisationId: audit.organisationId,
    branchIds: o.branchIds.disposals,
    from: period.from,
    to: period.to,
    scope: o.scopes.disposals,
  })) {
    disposals
      .addRow(
        safe({
          kind: d.kind === "record" ? "Disposal record" : "Signed statement",
          id: d.id,
          branch: d.branchName,
          appliance: d.applianceTag,
          category: APPLIANCE_CATEGORY_LABELS[d.applianceCategory as ApplianceCategory] ?? d.applianceCategory,
          fullKg: kg(d.fullChargeG),
          fullLb: lb(d.fullChargeG),
          date: date(d.on),
          refrigerant: d.refrigerant ?? "",
          recKg: kg(d.recoveredG),
          recLb: lb(d.recoveredG),
          location: d.location ?? "",
          by: d.recoveredBy ?? "",
          signedBy: d.signedBy ?? "",
          signedOn: date(d.signedOn),
          job: d.jobId,
        }),
      )
      .commit();
  }
  disposals.commit();
}

/** The streamed download: a Response whose body is the workbook as it is written. */
export function auditWorkbookResponse(db: Knex, o: AuditExportOptions): Response {
  const out = new PassThrough();
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: out, useStyles: true, useSharedStrings: false });
  wb.creator = "Coldtrail";
  wb.created = new Date();
  writeWorkbook(db, wb, o)
    .then(() => wb.commit())
    .catch((err: unknown) => {
      console.error(`[export] audit #${o.audit.id} workbook failed`, err);
      out.destroy(err instanceof Error ? err : new Error("Export failed"));
    });
  return new Response(Readable.toWeb(out) as unknown as ReadableStream<Uint8Array>, {
    headers: {
      "content-type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
      "content-disposition": `attachment; filename="coldtrail-audit-${o.audit.id}.xlsx"`,
      "cache-control": "no-store",
    },
  });
}
