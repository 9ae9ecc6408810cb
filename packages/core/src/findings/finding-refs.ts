import type { Finding } from "../audit/finding";
import type { BranchRecords, Job } from "../audit/records";
import { isIsoDate } from "../dates/local-date";

export interface FindingRefs {
  /** The technician the finding names (the one who did the work it is about), if any. */
  technicianId: number | null;
  /** The appliance the finding concerns, directly or through its job. */
  applianceId: number | null;
}

type FindingRefInput = Pick<Finding, "recordType" | "recordId" | "identityKey" | "ruleId"> & { on?: string | undefined };

const KIND_PREFERENCE: Record<Job["kind"], number> = { disposal: 0, charge: 1, recovery: 2, leak_repair: 3, verification_test: 4 };

/**
 * Who and what a finding names, so permissions can follow it: a technician reads the findings about
 * their own work. Jobs name their technician; certifications their holder; appliance findings name
 * the technician of the job on the date the finding is about (the addition that started a leak, the
 * disposal), falling back to the appliance's disposal job for disposal rules.
 * Indexes the records once; the returned function answers each finding in constant time per job of
 * the appliance.
 */
export function findingRefResolver(records: BranchRecords): (finding: FindingRefInput) => FindingRefs {
  const jobs = new Map<number, Job>();
  const jobsByAppliance = new Map<number, Job[]>();
  for (const job of records.jobs) {
    jobs.set(job.id, job);
    if (job.applianceId === null) continue;
    const list = jobsByAppliance.get(job.applianceId);
    if (list) list.push(job);
    else jobsByAppliance.set(job.applianceId, [job]);
  }
  const certHolder = new Map<number, number>();
  for (const t of records.technicians) for (const c of t.certifications) certHolder.set(c.id, t.id);

  return (finding) => {
    switch (finding.recordType) {
      case "job": {
        const job = jobs.get(finding.recordId);
        return { technicianId: job?.technicianId ?? null, applianceId: job?.applianceId ?? null };
      }
      case "technician":
        return { technicianId: finding.recordId, applianceId: null };
      case "certification":
        return { technicianId: certHolder.get(finding.recordId) ?? null, applianceId: null };
      case "appliance": {
        const own = jobsByAppliance.get(finding.recordId) ?? [];
        const qualifierDate = finding.identityKey
          .split(":")
          .slice(3)
          .find((part) => isIsoDate(part));
        const date = finding.on ?? qualifierDate;
        let candidates = date ? own.filter((j) => j.performedOn === date) : [];
        if (candidates.length === 0 && finding.ruleId.startsWith("CT-DISP-")) candidates = own.filter((j) => j.kind === "disposal");
        const job = [...candidates].sort((a, b) => KIND_PREFERENCE[a.kind] - KIND_PREFERENCE[b.kind] || a.id - b.id)[0];
        return { technicianId: job?.technicianId ?? null, applianceId: finding.recordId };
      }
      default:
        return { technicianId: null, applianceId: null };
    }
  };
}

/** One finding's references (indexes the records each call; use `findingRefResolver` for many). */
export function findingRefs(finding: FindingRefInput, records: BranchRecords): FindingRefs {
  return findingRefResolver(records)(finding);
}
