import type { Knex } from "knex";
import {
  addDays,
  addMonths,
  analyseLeaks,
  certificationClass,
  CERTIFICATION_COVERAGE,
  fillPercent,
  getRule,
  healthTrend,
  maxCylinderFill,
  recordHealth,
  requalificationDueOn,
  resolveSettings,
  type ApplianceCertificationClass,
  type CertificationType,
  type HealthTrend,
  type MassDisplayUnit,
  type RecordHealth,
  type Severity,
} from "@coldtrail/core";
import { RecordNotFoundError } from "../errors";
import type { ScopeFn } from "../types";
import { toBool } from "../types";
import type { AuditSummary } from "./audit-runs";
import { whereFindingShowsIn } from "./finding-branches";
import { loadBranchRecords } from "./load-branch-records";
import { getOrganisationAuditSettings } from "./organisation-settings";

type Row = Record<string, any>;

const scoped = (qb: Knex.QueryBuilder, scope: ScopeFn) =>
  qb.where(function inScope(this: Knex.QueryBuilder) {
    scope(this);
  });

const zero = (): Record<Severity, number> => ({ critical: 0, major: 0, minor: 0 });

export interface AuditSnapshot {
  auditId: number;
  finishedAt: string;
  health: number;
  open: number;
}

export interface OverviewBranch {
  branchId: number;
  name: string;
  code: string;
  massUnit: MassDisplayUnit;
  /** Findings open or with a proposed fix, by severity. */
  active: Record<Severity, number>;
  fixProposed: number;
  overdue: number;
  /** Records the latest audit of the branch looked at; null before the first audit. */
  recordsAudited: number | null;
  health: RecordHealth | null;
  /** Record health at each of the latest audits (oldest first, up to 6). */
  history: AuditSnapshot[];
  /** Now compared with the latest audit of the branch. */
  trend: HealthTrend | null;
  lastAudit: AuditSnapshot | null;
}

function parseSummary(text: unknown): AuditSummary | null {
  if (typeof text !== "string" || text === "") return null;
  try {
    return JSON.parse(text) as AuditSummary;
  } catch {
    return null;
  }
}

/**
 * Every branch given (those the person may read) with its findings to act on by severity, record
 * health now and at each recent audit, and the trend since the latest audit. Finding counts go
 * through the scope (the table is aliased `findings`).
 */
export async function getOrganisationOverview(
  db: Knex,
  opts: { organisationId: number; branchIds: number[]; findingScope: ScopeFn; today: string },
): Promise<{ branches: OverviewBranch[]; totals: Record<Severity, number> & { overdue: number; fixProposed: number } }> {
  const branches = await db("branches")
    .where({ organisation_id: opts.organisationId })
    .whereIn("id", opts.branchIds.length ? opts.branchIds : [-1])
    .orderBy("name")
    .select("id", "name", "code", "mass_unit");
  // Per branch, a finding counts in every branch it shows in (a person-level finding in each branch of
  // the person); the totals count each finding once.
  const activeFindings = () =>
    scoped(
      db("findings as findings").where("findings.organisation_id", opts.organisationId).whereIn("findings.state", ["open", "fix_proposed"]),
      opts.findingScope,
    );
  const shownIn = db("findings")
    .where("organisation_id", opts.organisationId)
    .whereIn("state", ["open", "fix_proposed"])
    .select("id as finding_id", "branch_id")
    .union((u) => u.from("finding_branches").where("organisation_id", opts.organisationId).select("finding_id", "branch_id"));
  const counts = await activeFindings()
    .join(shownIn.as("shown"), "shown.finding_id", "findings.id")
    .groupBy("shown.branch_id", "findings.severity", "findings.state")
    .select("shown.branch_id", "findings.severity", "findings.state")
    .count({ n: "*" })
    .sum({ overdue: db.raw("CASE WHEN findings.due_on < ? THEN 1 ELSE 0 END", [opts.today]) });
  const distinctCounts = await activeFindings()
    .where((w) =>
      whereFindingShowsIn(
        w,
        branches.map((b) => Number(b.id)),
      ),
    )
    .groupBy("findings.severity", "findings.state")
    .select("findings.severity", "findings.state")
    .count({ n: "*" })
    .sum({ overdue: db.raw("CASE WHEN findings.due_on < ? THEN 1 ELSE 0 END", [opts.today]) });
  const audits = await db("audits")
    .where({ organisation_id: opts.organisationId, state: "done" })
    .orderBy([
      { column: "finished_at", order: "desc" },
      { column: "id", order: "desc" },
    ])
    .limit(100)
    .select("id", "finished_at", "summary");

  const totals = { ...zero(), overdue: 0, fixProposed: 0 };
  const out: OverviewBranch[] = branches.map((b) => {
    const id = Number(b.id);
    const active = zero();
    let fixProposed = 0;
    let overdue = 0;
    for (const c of counts.filter((x) => Number(x.branch_id) === id)) {
      active[c.severity as Severity] += Number(c.n);
      if (c.state === "fix_proposed") fixProposed += Number(c.n);
      overdue += Number(c.overdue ?? 0);
    }
    const history: AuditSnapshot[] = [];
    let recordsAudited: number | null = null;
    for (const a of audits) {
      const summary = parseSummary(a.summary);
      const mine = summary?.branches.find((x) => x.branchId === id);
      if (!mine) continue;
      recordsAudited ??= mine.recordsAudited;
      const h = recordHealth({ open: mine.activeAfter, recordsAudited: mine.recordsAudited });
      history.unshift({
        auditId: Number(a.id),
        finishedAt: a.finished_at,
        health: h.score,
        open: mine.activeAfter.critical + mine.activeAfter.major + mine.activeAfter.minor,
      });
      if (history.length >= 6) break;
    }
    const health = recordsAudited === null ? null : recordHealth({ open: active, recordsAudited });
    const lastAudit = history[history.length - 1] ?? null;
    const openNow = active.critical + active.major + active.minor;
    return {
      branchId: id,
      name: b.name,
      code: b.code,
      massUnit: b.mass_unit,
      active,
      fixProposed,
      overdue,
      recordsAudited,
      health,
      history,
      trend:
        lastAudit && health ? healthTrend({ score: lastAudit.health, open: lastAudit.open }, { score: health.score, open: openNow }) : null,
      lastAudit,
    };
  });
  for (const c of distinctCounts) {
    totals[c.severity as Severity] += Number(c.n);
    if (c.state === "fix_proposed") totals.fixProposed += Number(c.n);
    totals.overdue += Number(c.overdue ?? 0);
  }
  return { branches: out, totals };
}

export interface RuleCount {
  ruleId: string;
  title: string;
  critical: number;
  major: number;
  minor: number;
  total: number;
}

export interface MonthFindings {
  month: string;
  opened: number;
  closed: number;
  /** Findings to act on at the end of the month. */
  active: number;
}

export interface MonthFlows {
  month: string;
  purchasedG: number;
  chargedG: number;
  recoveredG: number;
  shippedG: number;
}

export interface LeakWatchRow {
  applianceId: number;
  tag: string;
  description: string;
  refrigerant: string;
  fullChargeG: number;
  lastAdditionOn: string;
  percent: number;
  threshold: number;
  /** Leak rate as a share of the threshold (1 = at the threshold). */
  ratio: number;
  exceeds: boolean;
  repairDueOn: string | null;
  repairedOn: string | null;
}

export interface CoverageRow {
  technicianId: number;
  name: string;
  verified: CertificationType[];
  pending: CertificationType[];
  /** Which classes of appliance the technician may open. */
  covers: Record<ApplianceCertificationClass, boolean>;
}

export interface CylinderWatchRow {
  cylinderId: number;
  serial: string;
  refrigerant: string | null;
  contentsG: number;
  maxNetG: number | null;
  fillPercent: number | null;
  lastRequalifiedOn: string | null;
  requalificationDueOn: string | null;
  reasons: ("past_requalification" | "requalification_soon" | "near_full" | "over_full" | "no_requalification_date")[];
}

export interface BranchDashboard {
  branch: { id: number; name: string; code: string; massUnit: MassDisplayUnit; timeZone: string };
  today: string;
  months: string[];
  findingsByRule: RuleCount[];
  findingsOverTime: MonthFindings[];
  flows: MonthFlows[];
  leakWatchlist: LeakWatchRow[] | null;
  coverage: { technicians: CoverageRow[]; appliancesByClass: Record<ApplianceCertificationClass, number> };
  cylinders: CylinderWatchRow[];
}

const monthOf = (date: string) => date.slice(0, 7);

/**
 * What the branch dashboard shows. Findings and refrigerant flows go through the scopes given
 * (tables aliased `findings`, `jobs`, `purchases`, `reclaim_shipments`), so a reader limited to a
 * window of records sees that window only. The leak watchlist reads the branch's whole history and is
 * left out (null) unless `includeLeakWatchlist`.
 */
export async function getBranchDashboard(
  db: Knex,
  opts: {
    organisationId: number;
    branchId: number;
    today: string;
    months: number;
    findingScope: ScopeFn;
    jobScope: ScopeFn;
    purchaseScope: ScopeFn;
    shipmentScope: ScopeFn;
    includeLeakWatchlist: boolean;
  },
): Promise<BranchDashboard> {
  const b = await db("branches")
    .where({ id: opts.branchId, organisation_id: opts.organisationId })
    .first("id", "name", "code", "mass_unit", "time_zone");
  if (!b) throw new RecordNotFoundError("No such branch");
  const branch = {
    id: Number(b.id),
    name: b.name as string,
    code: b.code as string,
    massUnit: b.mass_unit as MassDisplayUnit,
    timeZone: b.time_zone as string,
  };
  const { today } = opts;
  const firstMonth = addMonths(`${monthOf(today)}-01`, -(opts.months - 1));
  const months: string[] = [];
  for (let i = 0; i < opts.months; i++) months.push(monthOf(addMonths(firstMonth, i)));

  const findingsBase = () =>
    scoped(
      db("findings as findings")
        .where({ "findings.organisation_id": opts.organisationId })
        .where((w) => whereFindingShowsIn(w, [branch.id])),
      opts.findingScope,
    );

  const byRuleRows = await findingsBase()
    .whereIn("findings.state", ["open", "fix_proposed"])
    .groupBy("findings.rule_id", "findings.severity")
    .select("findings.rule_id", "findings.severity")
    .count({ n: "*" });
  const byRule = new Map<string, RuleCount>();
  for (const r of byRuleRows) {
    const entry = byRule.get(r.rule_id) ?? {
      ruleId: r.rule_id,
      title: getRule(r.rule_id)?.title ?? r.rule_id,
      critical: 0,
      major: 0,
      minor: 0,
      total: 0,
    };
    entry[r.severity as Severity] += Number(r.n);
    entry.total += Number(r.n);
    byRule.set(r.rule_id, entry);
  }
  const findingsByRule = [...byRule.values()].sort((x, y) => y.total - x.total || x.ruleId.localeCompare(y.ruleId));

  // Opened (first raised or found again) and closed (accepted, waived, no longer found) per month.
  const eventRows = await db("finding_events as e")
    .join("findings as findings", "findings.id", "e.finding_id")
    .where({ "findings.organisation_id": opts.organisationId })
    .where((w) => whereFindingShowsIn(w, [branch.id]))
    .where(function inScope(this: Knex.QueryBuilder) {
      opts.findingScope(this);
    })
    .whereIn("e.action", ["opened", "found_again", "accepted", "waived", "no_longer_found", "reopened"])
    .select("e.action", "e.at", "e.from_state", "e.to_state");
  const opened = new Map<string, number>();
  const closed = new Map<string, number>();
  let activeBefore = 0;
  const delta = new Map<string, number>();
  const firstDay = `${months[0]}-01`;
  for (const e of eventRows) {
    const month = monthOf(e.at);
    const toActive = e.to_state === "open" || e.to_state === "fix_proposed";
    const fromActive = e.from_state === "open" || e.from_state === "fix_proposed";
    const change = (toActive ? 1 : 0) - (fromActive ? 1 : 0);
    if (e.at < firstDay) {
      activeBefore += change;
      continue;
    }
    if (e.action === "opened" || e.action === "found_again") opened.set(month, (opened.get(month) ?? 0) + 1);
    if (e.action === "accepted" || e.action === "waived" || e.action === "no_longer_found") closed.set(month, (closed.get(month) ?? 0) + 1);
    delta.set(month, (delta.get(month) ?? 0) + change);
  }
  let running = activeBefore;
  const findingsOverTime = months.map((month) => {
    running += delta.get(month) ?? 0;
    return { month, opened: opened.get(month) ?? 0, closed: closed.get(month) ?? 0, active: running };
  });

  // Refrigerant flows by month.
  const flows = new Map<string, MonthFlows>(months.map((m) => [m, { month: m, purchasedG: 0, chargedG: 0, recoveredG: 0, shippedG: 0 }]));
  const to = addDays(addMonths(`${months[months.length - 1]}-01`, 1), -1);
  const monthExpr = db.raw("substr(m.moved_on, 1, 7) as month");
  const jobFlows = await db("refrigerant_movements as m")
    .join("jobs as jobs", "jobs.id", "m.job_id")
    .where({ "m.branch_id": branch.id })
    .whereNull("m.voided_at")
    .whereNull("jobs.voided_at")
    .whereBetween("m.moved_on", [firstDay, to])
    .where(function inScope(this: Knex.QueryBuilder) {
      opts.jobScope(this);
    })
    .whereIn("m.direction", ["recovered_into_cylinder", "charged_from_cylinder", "charged_from_stock"])
    .groupByRaw("substr(m.moved_on, 1, 7), m.direction")
    .select(monthExpr, "m.direction")
    .sum({ g: "m.mass_g" });
  for (const r of jobFlows as Row[]) {
    const f = flows.get(r.month);
    if (!f) continue;
    if (r.direction === "recovered_into_cylinder") f.recoveredG += Number(r.g);
    else f.chargedG += Number(r.g);
  }
  for (const r of (await db("purchases as purchases")
    .where({ "purchases.branch_id": branch.id })
    .whereNull("purchases.voided_at")
    .whereBetween("purchases.purchased_on", [firstDay, to])
    .where(function inScope(this: Knex.QueryBuilder) {
      opts.purchaseScope(this);
    })
    .groupByRaw("substr(purchases.purchased_on, 1, 7)")
    .select(db.raw("substr(purchases.purchased_on, 1, 7) as month"))
    .sum({ g: "purchases.mass_g" })) as Row[]) {
    const f = flows.get(r.month);
    if (f) f.purchasedG += Number(r.g);
  }
  for (const r of (await db("reclaim_shipment_lines as l")
    .join("reclaim_shipments as reclaim_shipments", "reclaim_shipments.id", "l.shipment_id")
    .where({ "reclaim_shipments.branch_id": branch.id })
    .whereNull("reclaim_shipments.voided_at")
    .whereBetween("reclaim_shipments.shipped_on", [firstDay, to])
    .where(function inScope(this: Knex.QueryBuilder) {
      opts.shipmentScope(this);
    })
    .groupByRaw("substr(reclaim_shipments.shipped_on, 1, 7)")
    .select(db.raw("substr(reclaim_shipments.shipped_on, 1, 7) as month"))
    .sum({ g: "l.mass_g" })) as Row[]) {
    const f = flows.get(r.month);
    if (f) f.shippedG += Number(r.g);
  }

  const { settings } = await getOrganisationAuditSettings(db, opts.organisationId);

  // Leak watchlist: the latest leak rate of every appliance under leak-repair rules, nearest to or over its threshold.
  let leakWatchlist: LeakWatchRow[] | null = null;
  if (opts.includeLeakWatchlist) {
    const loaded = await loadBranchRecords(db, {
      organisationId: opts.organisationId,
      branchId: branch.id,
      period: { from: addDays(today, -365), to: today },
      asOf: `${today}T12:00:00Z`,
    });
    const jobsByAppliance = new Map<number, typeof loaded.records.jobs>();
    for (const j of [...loaded.records.jobs].sort((x, y) =>
      x.performedOn < y.performedOn ? -1 : x.performedOn > y.performedOn ? 1 : x.id - y.id,
    )) {
      if (j.applianceId === null) continue;
      const list = jobsByAppliance.get(j.applianceId) ?? [];
      list.push(j);
      jobsByAppliance.set(j.applianceId, list);
    }
    const rows: LeakWatchRow[] = [];
    for (const a of loaded.records.appliances) {
      if (a.status !== "in_service") continue;
      const analysis = analyseLeaks(a, jobsByAppliance.get(a.id) ?? [], resolveSettings(settings), branch.timeZone);
      const last = analysis?.events[analysis.events.length - 1];
      if (!analysis || !last || last.event.percent === null) continue;
      if (last.event.on < addDays(today, -365)) continue;
      const episode = analysis.episodes[analysis.episodes.length - 1];
      const openEpisode = episode && episode.startOn <= last.event.on ? episode : null;
      const applianceRow = loaded.records.appliances.find((x) => x.id === a.id)!;
      rows.push({
        applianceId: a.id,
        tag: a.label,
        description: "",
        refrigerant: applianceRow.refrigerant,
        fullChargeG: applianceRow.fullChargeG ?? 0,
        lastAdditionOn: last.event.on,
        percent: Math.round(last.event.percent * 10) / 10,
        threshold: last.threshold,
        ratio: last.event.percent / last.threshold,
        exceeds: last.exceeds,
        repairDueOn: openEpisode ? openEpisode.deadlines.repairDueOn : null,
        repairedOn: openEpisode?.repair?.performedOn ?? null,
      });
    }
    rows.sort((x, y) => y.ratio - x.ratio || x.tag.localeCompare(y.tag));
    leakWatchlist = rows.slice(0, 10);
    const descriptions = new Map(
      (
        await db("appliances")
          .whereIn("id", leakWatchlist.map((r) => r.applianceId).concat(-1))
          .select("id", "description")
      ).map((r) => [Number(r.id), r.description as string]),
    );
    for (const r of leakWatchlist) r.description = descriptions.get(r.applianceId) ?? "";
  }

  // Certification coverage: who may open which class of appliance, against what the branch has.
  const techRows = await db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where({ "m.branch_id": branch.id, "m.role": "technician", "m.organisation_id": opts.organisationId, "u.active": true })
    .orderBy("u.name")
    .select("u.id", "u.name");
  const certRows = await db("certifications as c")
    .join("certification_types as ct", "ct.certification_id", "c.id")
    .whereIn("c.user_id", techRows.map((t) => Number(t.id)).concat(-1))
    .whereNull("c.voided_at")
    .select("c.user_id", "c.state", "ct.type");
  const classes = Object.keys(CERTIFICATION_COVERAGE) as ApplianceCertificationClass[];
  const technicians: CoverageRow[] = techRows.map((t) => {
    const mine = certRows.filter((c) => Number(c.user_id) === Number(t.id));
    const verified = [...new Set(mine.filter((c) => c.state === "verified").map((c) => c.type as CertificationType))].sort();
    const covers = Object.fromEntries(
      classes.map((cls) => [cls, CERTIFICATION_COVERAGE[cls].some((type) => verified.includes(type))]),
    ) as Record<ApplianceCertificationClass, boolean>;
    return {
      technicianId: Number(t.id),
      name: t.name,
      verified,
      pending: [...new Set(mine.filter((c) => c.state === "pending").map((c) => c.type as CertificationType))]
        .filter((type) => !verified.includes(type))
        .sort(),
      covers,
    };
  });
  const appliancesByClass = Object.fromEntries(classes.map((c) => [c, 0])) as Record<ApplianceCertificationClass, number>;
  for (const a of await db("appliances")
    .where({ branch_id: branch.id, status: "in_service" })
    .select("refrigerant", "full_charge_g", "factory_sealed", "category")) {
    try {
      appliancesByClass[
        certificationClass({ refrigerant: a.refrigerant, fullChargeG: Number(a.full_charge_g), factorySealed: toBool(a.factory_sealed) })
      ] += 1;
    } catch {
      // A refrigerant without catalogued pressure data has no class to count.
    }
  }

  // Cylinders due for requalification within 60 days (or past it) or filled to 90 % of their maximum or more.
  const cylinders: CylinderWatchRow[] = [];
  for (const c of await db("cylinders")
    .where({ branch_id: branch.id, status: "in_service", unregistered: false })
    .orderBy("serial")
    .select("*")) {
    const reasons: CylinderWatchRow["reasons"] = [];
    const due = c.last_requalified_on ? requalificationDueOn(c.last_requalified_on, settings.requalificationYears) : null;
    if (!due) reasons.push("no_requalification_date");
    else if (due <= today) reasons.push("past_requalification");
    else if (due <= addDays(today, 60)) reasons.push("requalification_soon");
    let maxNetG: number | null = null;
    let percent: number | null = null;
    if (c.refrigerant && Number(c.contents_g) > 0) {
      try {
        maxNetG = maxCylinderFill({
          waterCapacityG: Number(c.water_capacity_g),
          tareG: Number(c.tare_g),
          refrigerant: c.refrigerant,
          strict130F: settings.strictFill130F,
        }).maxNetG;
      } catch {
        maxNetG = maxCylinderFill({
          waterCapacityG: Number(c.water_capacity_g),
          tareG: Number(c.tare_g),
          refrigerant: c.refrigerant,
          specificGravity: 1,
        }).maxNetG;
      }
      percent = Math.round(fillPercent(Number(c.contents_g), maxNetG) * 10) / 10;
      if (percent > 100) reasons.push("over_full");
      else if (percent >= 90) reasons.push("near_full");
    }
    if (reasons.length === 0) continue;
    cylinders.push({
      cylinderId: Number(c.id),
      serial: c.serial,
      refrigerant: c.refrigerant ?? null,
      contentsG: Number(c.contents_g),
      maxNetG,
      fillPercent: percent,
      lastRequalifiedOn: c.last_requalified_on ?? null,
      requalificationDueOn: due,
      reasons,
    });
  }

  return {
    branch,
    today,
    months,
    findingsByRule,
    findingsOverTime,
    flows: [...flows.values()],
    leakWatchlist,
    coverage: { technicians, appliancesByClass },
    cylinders,
  };
}
