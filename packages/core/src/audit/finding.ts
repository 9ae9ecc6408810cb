import type { RulePack, Severity } from "../vocabulary";
import type { AuditSettings } from "../settings";
import type { RecordIndex } from "./record-index";
import type { BranchRecords } from "./records";

export type FindingRecordType = "job" | "appliance" | "cylinder" | "equipment" | "technician" | "certification" | "branch";

export interface Finding {
  ruleId: string;
  severity: Severity;
  pack: RulePack;
  recordType: FindingRecordType;
  recordId: number;
  /** Stable across re-runs: rule id + record (+ a qualifier when one record can fail a rule twice). */
  identityKey: string;
  title: string;
  /** What is wrong, in plain words. */
  detail: string;
  fix: string;
  citation: string;
  /** Deadline the rule sets, as a calendar date in the branch's zone. */
  dueOn?: string;
  /** Date of the event the finding is about (absent for standing obligations). */
  on?: string;
}

/** What a rule's check returns; the engine adds the rule's id, title, severity, pack and citation. */
export interface RuleHit {
  recordType: FindingRecordType;
  recordId: number;
  qualifier?: string;
  detail: string;
  fix?: string;
  citation?: string;
  dueOn?: string;
  on?: string;
}

export interface AuditPeriod {
  from: string;
  to: string;
}

export interface AuditContext {
  /** Calendar date the audit is run for, in the branch's zone. */
  asOf: string;
  period: AuditPeriod;
  timeZone: string;
  settings: AuditSettings;
  index: RecordIndex;
}

export interface AuditRule {
  id: string;
  title: string;
  severity: Severity;
  pack: RulePack;
  effectiveFrom: string;
  effectiveUntil: string | null;
  citation: string;
  explanation: string;
  fix: string;
  check(records: BranchRecords, context: AuditContext): RuleHit[];
}
