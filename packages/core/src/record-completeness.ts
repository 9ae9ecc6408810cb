import type { Appliance, DisposalRecord, DisposalStatement, Job } from "./audit/records";

export interface Completeness {
  complete: boolean;
  /** Plain-words names of the missing fields, in a fixed order. */
  missing: string[];
}

const blank = (v: unknown) => v === null || v === undefined || (typeof v === "string" && v.trim() === "");

function check(fields: [string, unknown][]): Completeness {
  const missing = fields.filter(([, v]) => blank(v)).map(([name]) => name);
  return { complete: missing.length === 0, missing };
}

/**
 * Disposal record for an appliance of more than 5 and less than 50 lb: company name, location of
 * the appliance, date of recovery, type and quantity of refrigerant recovered. Source: 40 CFR
 * 82.155(c) [S4] (band, 3 years); field list partly from memory (REFERENCE.md §4). Monthly totals
 * and transfers for reclamation come from jobs and shipments.
 */
export function disposalRecordCompleteness(record: DisposalRecord): Completeness {
  return check([
    ["company name", record.companyName],
    ["location of the appliance", record.applianceLocation],
    ["date of recovery", record.recoveredOn],
    ["type of refrigerant", record.refrigerant],
    ["quantity recovered", record.recoveredG],
  ]);
}

/**
 * Small-appliance disposal: a signed statement that the refrigerant was recovered, with the name and
 * address of the person who recovered it and the date; or a contract reference instead.
 * Source: 40 CFR 82.155(b) as quoted from EPA's safe-disposal brochure [S27].
 */
export function smallApplianceStatementCompleteness(statement: DisposalStatement): Completeness {
  if (!blank(statement.contractReference)) return { complete: true, missing: [] };
  return check([
    ["signature", statement.signedBy],
    ["date signed", statement.signedOn],
    ["name of the person who recovered the refrigerant", statement.recoveredByName],
    ["address of the person who recovered the refrigerant", statement.recoveredByAddress],
    ["date of recovery", statement.recoveredOn],
  ]);
}

/**
 * Service record on a covered appliance: identity and location of the appliance, date, type of
 * service, amount and type of refrigerant added or removed, full charge. Source: 82.157(b)/(l)(2)
 * [S3]; field list from memory (REFERENCE.md §4).
 */
export function serviceRecordCompleteness(job: Job, appliance: Appliance): Completeness {
  const movesRefrigerant = job.kind === "charge" || job.kind === "recovery" || job.kind === "leak_repair";
  return check([
    ["appliance identity", appliance.label],
    ["appliance location", appliance.location],
    ["date of service", job.performedOn],
    ["type of service", job.kind],
    ["type of refrigerant", job.refrigerant ?? appliance.refrigerant],
    ["amount added or removed", movesRefrigerant && job.kind !== "leak_repair" ? (job.movements.length ? job.movements : null) : "n/a"],
    ["full charge", appliance.fullChargeG],
  ]);
}
