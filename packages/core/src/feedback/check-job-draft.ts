import { checkCertificationCoverage } from "../classification/check-certification-coverage";
import { isSmallAppliance } from "../classification/appliance-classification";
import { classifyPressure } from "../classification/classify-pressure";
import {
  cylinderAcceptsRefrigerant,
  exceedsMaxFill,
  maxCylinderFill,
  requalificationDueOn,
  type MaxFill,
} from "../cylinders/cylinder-fill";
import { evacuationSatisfied, requiredEvacuation } from "../evacuation/required-evacuation";
import { leakDeadlines } from "../leak-rate/leak-deadlines";
import { leakRateHistory, type AdditionExclusion, type LeakRateMethod } from "../leak-rate/leak-rate";
import { CATEGORY_LEAK_RULES, leakRepairRegime, LEAK_REGIME_THRESHOLDS } from "../leak-rate/leak-repair-regime";
import { getRefrigerant } from "../refrigerants/catalogue";
import { section608Scope } from "../refrigerants/section-608-scope";
import { normaliseDesignation } from "../refrigerants/normalise-designation";
import { resolveSettings, type AuditSettings } from "../settings";
import { formatMass, toGrams } from "../units/mass";
import { analyseLeaks } from "../audit/leak-analysis";
import { getRule } from "../audit/rule-registry";
import type { Appliance, Branch, Cylinder, Job, RecoveryEquipment, Technician } from "../audit/records";
import {
  CERTIFICATION_TYPE_LABELS,
  EVACUATION_UNIT_LABELS,
  TEMPORARY_ACCESS_METHODS,
  type AccessMethod,
  type CertificationType,
  type EvacuationUnit,
  type JobKind,
  type PressureClass,
  type Severity,
} from "../vocabulary";

/**
 * Instant feedback on a job being entered: the same rules the audit runs, applied to the draft
 * before it is saved, so the technician hears about a future finding while still on site.
 * Pure: the caller loads the appliance, the technician's certifications, the equipment, the
 * cylinder's current contents and the appliance's earlier jobs.
 */

/** The job as typed so far. Missing values are null: the form reports missing fields itself. */
export interface JobDraft {
  kind: JobKind;
  /** Calendar date of the work in the branch's zone. */
  performedOn: string;
  refrigerant: string | null;
  /** Recovery and disposal: grams taken out of the appliance. */
  recoveredG: number | null;
  /** Charge: grams added. */
  chargedG: number | null;
  /** Charge: the refrigerant came from the chosen cylinder (otherwise from stock). */
  chargeFromCylinder: boolean;
  evacuation: { value: number; unit: EvacuationUnit } | null;
  accessMethod: AccessMethod | null;
  temporaryAccessRemoved: boolean | null;
  compressorOperating: boolean | null;
  additionExclusion: AdditionExclusion | null;
  /** Charge: the earlier job on this appliance whose leak this addition also tops up. */
  sameLeakAsJobId?: number | null;
}

export interface JobDraftContext {
  branch: Branch;
  appliance: Appliance;
  /** The technician on the job with every certification they hold (all states). */
  technician: Technician | null;
  equipment: RecoveryEquipment | null;
  /** The chosen cylinder with its recorded contents now. */
  cylinder: (Cylinder & { contents: { refrigerant: string | null; netG: number } }) | null;
  /** The appliance's recorded jobs (not voided), for the leak rate. */
  applianceJobs: readonly Job[];
  settings?: Partial<AuditSettings>;
}

/** Which input a warning is about, so the form can show it beside that field. */
export type DraftField =
  "applianceId" | "evacuationValue" | "recoveredAmount" | "chargedAmount" | "cylinderId" | "equipmentId" | "temporaryAccessRemoved";

export interface DraftWarning {
  /** The audit rule that would raise a finding once the job is saved. */
  ruleId: string;
  severity: Severity;
  title: string;
  /** Plain words addressed to the person entering the job. */
  message: string;
  field: DraftField | null;
  citation: string;
}

export interface LeakRateVerdict {
  /** Leak rate in %, or null when the addition is excluded or cannot be calculated. */
  percent: number | null;
  /** Trigger rate for the appliance's use, when a leak-repair rule covers it. */
  threshold: number | null;
  method: LeakRateMethod;
  /** A leak-repair rule (608 or AIM) covers this appliance on that date. */
  covered: boolean;
  exceeds: boolean;
  /** Plain words: why covered or not, excluded, or the figure. */
  reason: string;
  excluded: AdditionExclusion | null;
  /** When the rate exceeds the threshold: the repair deadline. */
  repairDueOn: string | null;
}

export interface DraftCheckResult {
  warnings: DraftWarning[];
  /** What the rules require of this job, shown as a hint even when it is met ("10 in Hg vacuum"). */
  evacuationRequired: string | null;
  /** The chosen cylinder after this job. */
  cylinderAfter: { netG: number; maxNetG: number | null; refrigerant: string | null } | null;
  /** Charges: the leak rate this addition gives. */
  leakRate: LeakRateVerdict | null;
}

/** The id a draft takes in the rules' own records: never a real row id. */
export const DRAFT_JOB_ID = 0;

const CIRCUIT_OPENING: readonly JobKind[] = ["recovery", "charge", "leak_repair", "disposal"];
const RECOVERING: readonly JobKind[] = ["recovery", "disposal"];
const SYSTEM_DEPENDENT_MAX_G = toGrams(15, "lb");

const PRESSURE_WORDS: Record<PressureClass, string> = {
  low: "low-pressure",
  medium: "medium-pressure",
  high: "high-pressure",
  very_high: "very-high-pressure",
};

const EXCLUSION_WORDS: Record<AdditionExclusion, string> = {
  retrofit: "added right after a retrofit",
  installation: "added at the installation of a new appliance",
  seasonal_variance: "a seasonal variance",
};

function warn(ruleId: string, message: string, field: DraftField | null): DraftWarning {
  const rule = getRule(ruleId);
  if (!rule) throw new Error(`Unknown rule ${ruleId}`);
  return { ruleId, severity: rule.severity, title: rule.title, message, field, citation: rule.citation };
}

function safePressureClass(a: Appliance): PressureClass | null {
  if (!getRefrigerant(a.refrigerant)) return null;
  try {
    return classifyPressure(a.refrigerant);
  } catch {
    return null;
  }
}

function safeMaxFill(cylinder: Cylinder, refrigerant: string | null, strict: boolean): MaxFill | null {
  if (!refrigerant || !(cylinder.waterCapacityG > 0)) return null;
  try {
    return maxCylinderFill({ waterCapacityG: cylinder.waterCapacityG, tareG: cylinder.tareG, refrigerant, strict130F: strict });
  } catch {
    // Same fallback as the audit's cylinder ledger: the label rule, SG 1.
    return maxCylinderFill({ waterCapacityG: cylinder.waterCapacityG, tareG: cylinder.tareG, refrigerant, specificGravity: 1 });
  }
}

/** A leak rate in words: two decimals under 1 %, one above ("0.03 %", "20.3 %"). */
export function formatLeakPercent(percent: number): string {
  return `${percent < 1 ? percent.toFixed(2) : percent.toFixed(1)} %`;
}

const typeList = (types: readonly CertificationType[]) => types.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" or ");

function reading(e: { value: number; unit: EvacuationUnit }): string {
  const unit = e.unit === "in_hg_vacuum" ? "in Hg" : EVACUATION_UNIT_LABELS[e.unit];
  return `${e.value} ${unit}`;
}

/** Turns a draft into the rules' job record (id {@link DRAFT_JOB_ID}). */
export function draftAsJob(draft: JobDraft, ctx: Pick<JobDraftContext, "appliance" | "technician" | "equipment" | "cylinder">): Job {
  const movements: Job["movements"] = [];
  if (RECOVERING.includes(draft.kind) && draft.recoveredG !== null) {
    movements.push({ direction: "recovered", amountG: draft.recoveredG, cylinderId: ctx.cylinder?.id ?? null });
  }
  if (draft.kind === "charge" && draft.chargedG !== null) {
    movements.push({
      direction: "charged",
      amountG: draft.chargedG,
      cylinderId: draft.chargeFromCylinder ? (ctx.cylinder?.id ?? null) : null,
    });
  }
  return {
    id: DRAFT_JOB_ID,
    kind: draft.kind,
    performedOn: draft.performedOn,
    technicianId: ctx.technician?.id ?? null,
    applianceId: ctx.appliance.id,
    equipmentId: RECOVERING.includes(draft.kind) ? (ctx.equipment?.id ?? null) : null,
    refrigerant: draft.refrigerant,
    movements,
    evacuation: draft.evacuation,
    accessMethod: draft.accessMethod,
    temporaryAccessRemoved: draft.temporaryAccessRemoved,
    compressorOperating: draft.compressorOperating,
    additionExclusion: draft.kind === "charge" ? draft.additionExclusion : null,
    sameLeakAsJobId: draft.kind === "charge" ? (draft.sameLeakAsJobId ?? null) : null,
    verification: null,
  };
}

/**
 * The leak rate an addition gives, by the company's method, and whether a leak-repair rule covers
 * the appliance (82.157 / 84.106). `jobs` holds the appliance's jobs including the one asked about.
 */
export function leakRateAtJob(
  appliance: Appliance,
  jobs: readonly Job[],
  jobId: number,
  opts: { timeZone: string; settings?: Partial<AuditSettings> },
): LeakRateVerdict | null {
  const job = jobs.find((j) => j.id === jobId);
  if (!job || !job.movements.some((m) => m.direction === "charged")) return null;
  const settings = resolveSettings(opts.settings);
  const method = settings.leakRateMethod;
  const base = { method, excluded: null, threshold: null, covered: false, exceeds: false, repairDueOn: null } as const;
  if (job.additionExclusion) {
    return {
      ...base,
      percent: null,
      excluded: job.additionExclusion,
      reason: `Not counted in the leak rate: ${EXCLUSION_WORDS[job.additionExclusion]}`,
    };
  }
  const useClass = CATEGORY_LEAK_RULES[appliance.category].useClass;
  if (!appliance.fullChargeG || appliance.fullChargeG <= 0) {
    return { ...base, percent: null, reason: "The appliance's full charge is not recorded, so no leak rate can be calculated" };
  }
  const sorted = [...jobs].sort((a, b) => (a.performedOn < b.performedOn ? -1 : a.performedOn > b.performedOn ? 1 : a.id - b.id));
  const analysis = useClass ? analyseLeaks(appliance, sorted, settings, opts.timeZone) : null;
  const covered = analysis?.events.find((e) => e.event.sourceIds.includes(jobId));
  if (covered && covered.event.percent !== null) {
    const percent = covered.event.percent;
    const deadlines = covered.exceeds
      ? leakDeadlines({
          exceededOn: covered.event.on,
          timeZone: opts.timeZone,
          useClass: useClass!,
          needsIndustrialShutdown: appliance.needsIndustrialShutdownForRepair ?? false,
        })
      : null;
    return {
      ...base,
      percent,
      threshold: covered.threshold,
      covered: true,
      exceeds: covered.exceeds,
      repairDueOn: deadlines?.repairDueOn ?? null,
      reason: covered.exceeds
        ? `Leak rate ${formatLeakPercent(percent)} is over the ${covered.threshold} % threshold for this appliance: repair the leak by ${deadlines!.repairDueOn}`
        : `Leak rate ${formatLeakPercent(percent)}, under the ${covered.threshold} % threshold for this appliance`,
    };
  }
  // Not covered by a leak-repair rule: the figure is still worth knowing.
  const additions = sorted.flatMap((j) =>
    j.movements
      .filter((m) => m.direction === "charged")
      .map((m) => ({
        on: j.performedOn,
        amountG: m.amountG,
        excluded: j.additionExclusion,
        sourceId: j.id,
        sameLeakAsJobId: j.sameLeakAsJobId ?? null,
      })),
  );
  const regime = leakRepairRegime({
    refrigerant: appliance.refrigerant,
    fullChargeG: appliance.fullChargeG,
    category: appliance.category,
    on: job.performedOn,
  });
  const event = leakRateHistory({
    fullChargeG: appliance.fullChargeG,
    additions,
    method,
    countFrom: regime.regime === "us_aim_hfc" ? LEAK_REGIME_THRESHOLDS.aimFrom : null,
    installedOn: appliance.installedOn,
  }).find((e) => e.sourceIds.includes(jobId));
  const percent = event?.percent ?? null;
  return {
    ...base,
    percent,
    reason: `${percent === null ? "No leak rate" : `Leak rate ${formatLeakPercent(percent)}`}; no leak-repair threshold applies: ${regime.reason}`,
  };
}

/**
 * What would become a finding if the draft were saved as it is, rule by rule, with the rule id the
 * audit would use. Only what has been entered is judged.
 */
export function checkJobDraft(draft: JobDraft, ctx: JobDraftContext): DraftCheckResult {
  const settings = resolveSettings(ctx.settings);
  const a = ctx.appliance;
  const mass = (g: number) => formatMass(g, ctx.branch.massUnit);
  const warnings: DraftWarning[] = [];
  const smallAppliance = isSmallAppliance(a);
  // Exempt substitutes (82.154(a)(1)): no certification, evacuation or recovery-equipment rule applies.
  const scope = section608Scope(a.refrigerant, a.category);
  const pressureClass = scope.covered ? safePressureClass(a) : null;
  let evacuationRequired: string | null = null;
  let cylinderAfter: DraftCheckResult["cylinderAfter"] = null;
  let leakRate: LeakRateVerdict | null = null;

  // CT-CERT-01: the technician's verified certifications must cover the appliance (82.161).
  // Disposal of a small appliance is governed by 82.155 (recovery or the signed statement), not 82.161.
  const needsCertification = CIRCUIT_OPENING.includes(draft.kind) && !(draft.kind === "disposal" && smallAppliance);
  if (needsCertification && scope.covered && ctx.technician && (smallAppliance || pressureClass !== null)) {
    const coverage = checkCertificationCoverage(ctx.technician.certifications, a);
    if (!coverage.allowed) {
      const verified = [...new Set(ctx.technician.certifications.filter((c) => c.state === "verified").map((c) => c.type))].sort();
      const what =
        coverage.applianceClass === "small_appliance" ? "small appliance" : `${PRESSURE_WORDS[coverage.applianceClass]} appliance`;
      const held = verified.length
        ? `Your ${typeList(verified)} certification does not cover this ${what}`
        : `You hold no verified certification, and this ${what} needs one`;
      const pending = coverage.pendingCovering.length
        ? ` Your ${typeList(coverage.pendingCovering)} card is still awaiting verification.`
        : "";
      warnings.push(warn("CT-CERT-01", `${held}: ${typeList(coverage.requiredTypes)} is needed.${pending}`, "applianceId"));
    }
  }

  // Evacuation (82.156): Table 1 levels, or the small-appliance share.
  if (RECOVERING.includes(draft.kind) && scope.covered) {
    const equipmentMade = ctx.equipment?.manufacturedOn ?? null;
    const withEquipment = ctx.equipment ? " with this equipment" : "";
    if (smallAppliance) {
      const req = requiredEvacuation({
        pressureClass: "high",
        fullChargeG: a.fullChargeG,
        equipmentManufacturedOn: equipmentMade,
        smallAppliance: true,
        compressorOperating: draft.compressorOperating,
      });
      evacuationRequired = `${req.kind === "small_appliance" ? `${req.percentOfCharge} % of the charge recovered, or 4 in Hg vacuum` : req.description}`;
      if (draft.recoveredG !== null || draft.evacuation) {
        const verdict = evacuationSatisfied(req, { reading: draft.evacuation, recoveredG: draft.recoveredG, fullChargeG: a.fullChargeG });
        if (!verdict.satisfied && req.kind === "small_appliance") {
          const share = verdict.recoveredPercent === null ? "" : ` (${verdict.recoveredPercent.toFixed(0)} %)`;
          const got = draft.recoveredG === null ? "" : `${mass(draft.recoveredG)} of the ${mass(a.fullChargeG ?? 0)} charge${share}`;
          const vac = draft.evacuation ? `${got ? " and " : ""}${reading(draft.evacuation)} reached` : "";
          warnings.push(
            warn(
              "CT-EVAC-03",
              `This small appliance needs ${req.percentOfCharge} % of its charge recovered or 4 in Hg vacuum${withEquipment}; ${got}${got ? " recovered" : ""}${vac} so far.`,
              draft.recoveredG !== null ? "recoveredAmount" : "evacuationValue",
            ),
          );
        }
      }
    } else if (pressureClass) {
      const req = requiredEvacuation({
        pressureClass,
        fullChargeG: a.fullChargeG,
        equipmentManufacturedOn: equipmentMade,
        smallAppliance: false,
      });
      evacuationRequired = req.description;
      if (draft.evacuation) {
        const verdict = evacuationSatisfied(req, { reading: draft.evacuation });
        if (!verdict.satisfied) {
          warnings.push(
            warn(
              "CT-EVAC-01",
              `This appliance needs ${req.description}${withEquipment}; ${reading(draft.evacuation)} entered.`,
              "evacuationValue",
            ),
          );
        }
      }
    }
  }

  // CT-ACCESS-01: a temporary piercing device left on the line.
  if (draft.accessMethod && TEMPORARY_ACCESS_METHODS.includes(draft.accessMethod) && draft.temporaryAccessRemoved === false) {
    warnings.push(
      warn(
        "CT-ACCESS-01",
        "The temporary piercing device is left on the line: remove it and fit a proper access fitting if access is still needed.",
        "temporaryAccessRemoved",
      ),
    );
  }

  // Recovery equipment: certified (82.158), and system-dependent only up to 15 lb.
  if (RECOVERING.includes(draft.kind) && ctx.equipment && scope.covered) {
    const e = ctx.equipment;
    if (e.certification !== "certified") {
      warnings.push(
        warn(
          "CT-EQUIP-01",
          `Recovery equipment ${e.serial} ${e.certification === "unknown" ? "has no recorded certification" : "is not certified"}; use certified equipment or record its certification.`,
          "equipmentId",
        ),
      );
    }
    if (e.kind === "system_dependent" && (a.fullChargeG === null || a.fullChargeG > SYSTEM_DEPENDENT_MAX_G)) {
      warnings.push(
        warn(
          "CT-EQUIP-02",
          `${e.serial} is system-dependent equipment, allowed only on appliances of 15 lb or less; ${a.fullChargeG === null ? "this one has no recorded full charge" : `this one holds ${mass(a.fullChargeG)}`}.`,
          "equipmentId",
        ),
      );
    }
  }

  // Cylinder: requalification, one refrigerant, maximum fill (AHRI Guideline K).
  const c = ctx.cylinder;
  const fills = c && RECOVERING.includes(draft.kind);
  const draws = c && draft.kind === "charge" && draft.chargeFromCylinder;
  if (c && (fills || draws)) {
    const incoming = draft.refrigerant ?? a.refrigerant;
    const holds = c.contents.netG > 0 ? c.contents.refrigerant : null;
    if (fills) {
      const years = c.requalificationYears ?? settings.requalificationYears;
      if (!c.lastRequalifiedOn) {
        warnings.push(
          warn("CT-CYL-02", `Cylinder ${c.serial} has no requalification date on record; check the stamp before filling it.`, "cylinderId"),
        );
      } else {
        const due = requalificationDueOn(c.lastRequalifiedOn, years);
        if (draft.performedOn >= due)
          warnings.push(
            warn(
              "CT-CYL-02",
              `Cylinder ${c.serial} was due for requalification on ${due}; do not fill it until it is retested.`,
              "cylinderId",
            ),
          );
      }
      if (!cylinderAcceptsRefrigerant(c.contents, incoming)) {
        warnings.push(
          warn(
            "CT-CYL-03",
            `Cylinder ${c.serial} already holds ${mass(c.contents.netG)} ${holds}; recovering ${normaliseDesignation(incoming)} into it would mix refrigerants.`,
            "cylinderId",
          ),
        );
      }
      const addG = draft.recoveredG ?? 0;
      const netAfter = c.contents.netG + addG;
      const refrigerantAfter = holds ?? incoming;
      const max = safeMaxFill(c, refrigerantAfter, settings.strictFill130F);
      cylinderAfter = { netG: netAfter, maxNetG: max?.maxNetG ?? null, refrigerant: refrigerantAfter };
      if (max && addG > 0 && exceedsMaxFill(netAfter, max)) {
        warnings.push(
          warn(
            "CT-CYL-01",
            `Cylinder ${c.serial} would be over its maximum fill by ${mass(netAfter - max.maxNetG)} (maximum ${mass(max.maxNetG)}, ${mass(c.contents.netG)} in it now).`,
            "recoveredAmount",
          ),
        );
      }
    } else {
      const after = c.contents.netG - (draft.chargedG ?? 0);
      cylinderAfter = {
        netG: after,
        maxNetG: safeMaxFill(c, holds ?? incoming, settings.strictFill130F)?.maxNetG ?? null,
        refrigerant: holds,
      };
    }
  }

  // Charges: the leak rate this addition gives (82.157(c); 84.106).
  if (draft.kind === "charge" && draft.chargedG !== null && draft.chargedG > 0) {
    const job = draftAsJob(draft, ctx);
    const earlier = ctx.applianceJobs.filter((j) => j.id !== DRAFT_JOB_ID);
    leakRate = leakRateAtJob(a, [...earlier, job], DRAFT_JOB_ID, { timeZone: ctx.branch.timeZone, settings: ctx.settings });
    const regimeUnknownCharge =
      a.fullChargeG === null
        ? leakRepairRegime({ refrigerant: a.refrigerant, fullChargeG: null, category: a.category, on: draft.performedOn })
        : null;
    if (regimeUnknownCharge?.regime && !draft.additionExclusion) {
      warnings.push(
        warn(
          "CT-LEAK-06",
          "This appliance has no recorded full charge, so the leak rate of this addition cannot be calculated and a rate over the threshold cannot be ruled out: record the full charge on the appliance.",
          "chargedAmount",
        ),
      );
    }
    if (leakRate?.exceeds && leakRate.percent !== null) {
      warnings.push(
        warn(
          "CT-LEAK-01",
          `Adding ${mass(draft.chargedG)} gives a leak rate of ${formatLeakPercent(leakRate.percent)}, over the ${leakRate.threshold} % threshold: the leak must be repaired by ${leakRate.repairDueOn}.`,
          "chargedAmount",
        ),
      );
    }
  }

  return { warnings, evacuationRequired, cylinderAfter, leakRate };
}
