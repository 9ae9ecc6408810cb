import { CoreInputError } from "../errors";
import { isIsoDate, toLocalDate } from "../dates/local-date";
import { resolveSettings, type AuditSettings } from "../settings";
import type { RulePack } from "../vocabulary";
import type { AuditContext, AuditPeriod, AuditRule, Finding } from "./finding";
import { buildRecordIndex } from "./record-index";
import type { BranchRecords } from "./records";
import { RULES } from "./rule-registry";

export interface RunAuditOptions {
  packs: readonly RulePack[];
  /** Calendar dates in the branch's zone, inclusive. Event findings outside it are left out. */
  period: AuditPeriod;
  /** Date or instant the audit is run for; converted to the branch's calendar date. */
  asOf: string | Date;
  /** IANA zone; defaults to the branch's. */
  timeZone?: string;
  settings?: Partial<AuditSettings>;
  /** Defaults to the registry; tests may pass a subset. */
  rules?: readonly AuditRule[];
}

const compare = (a: Finding, b: Finding) =>
  a.ruleId < b.ruleId
    ? -1
    : a.ruleId > b.ruleId
      ? 1
      : a.recordType < b.recordType
        ? -1
        : a.recordType > b.recordType
          ? 1
          : a.recordId !== b.recordId
            ? a.recordId - b.recordId
            : a.identityKey < b.identityKey
              ? -1
              : a.identityKey > b.identityKey
                ? 1
                : 0;

function effectiveOn(rule: AuditRule, date: string): boolean {
  return date >= rule.effectiveFrom && (rule.effectiveUntil === null || date < rule.effectiveUntil);
}

/**
 * Runs the rules of the chosen packs over a branch's records. Pure and deterministic: the records are
 * indexed once, each rule makes one pass, and findings are sorted by rule id, record type, record id
 * and identity key, so the same records in any order give the same findings in the same order.
 * A finding about an event is kept when the event falls in the period and the rule was in force on
 * that date; a standing obligation (no event date) is kept when the rule is in force on `asOf`.
 */
export function runAudit(records: BranchRecords, options: RunAuditOptions): Finding[] {
  const timeZone = options.timeZone ?? records.branch.timeZone;
  const { from, to } = options.period;
  if (!isIsoDate(from) || !isIsoDate(to) || from > to)
    throw new CoreInputError("The audit period must be two calendar dates, from ≤ to", "period");
  const settings = resolveSettings(options.settings);
  const context: AuditContext = {
    asOf: toLocalDate(options.asOf, timeZone),
    period: options.period,
    timeZone,
    settings,
    index: buildRecordIndex(records, settings),
  };
  const findings = new Map<string, Finding>();
  for (const rule of options.rules ?? RULES) {
    if (!options.packs.includes(rule.pack)) continue;
    for (const hit of rule.check(records, context)) {
      if (hit.on !== undefined ? hit.on < from || hit.on > to || !effectiveOn(rule, hit.on) : !effectiveOn(rule, context.asOf)) continue;
      const identityKey = `${rule.id}:${hit.recordType}:${hit.recordId}${hit.qualifier ? `:${hit.qualifier}` : ""}`;
      const finding: Finding = {
        ruleId: rule.id,
        severity: rule.severity,
        pack: rule.pack,
        recordType: hit.recordType,
        recordId: hit.recordId,
        identityKey,
        title: rule.title,
        detail: hit.detail,
        fix: hit.fix ?? rule.fix,
        citation: hit.citation ?? rule.citation,
      };
      if (hit.dueOn !== undefined) finding.dueOn = hit.dueOn;
      if (hit.on !== undefined) finding.on = hit.on;
      findings.set(identityKey, finding);
    }
  }
  return [...findings.values()].sort(compare);
}
