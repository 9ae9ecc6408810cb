// The shapes the API routes return, as the browser receives them (JSON of the query results).
import type { MassDisplayUnit } from "@coldtrail/core";
import type {
  ApplianceOption as DbApplianceOption,
  BranchSummary,
  CylinderOption,
  EquipmentOption,
  JobDetail,
  JobListResult,
  JobListRow,
} from "@coldtrail/db";

export type { CylinderOption, EquipmentOption, JobDetail, JobListRow };
export type JobListPage = JobListResult;
export type BranchOption = BranchSummary;

/** An appliance in the job form's picker, with what the form needs about its branch. */
export interface ApplianceOption extends DbApplianceOption {
  branchName: string;
  massUnit: MassDisplayUnit;
  timeZone: string;
}

/** The mass a job moved: recovered for recoveries and disposals, added for charges. */
export function jobMassG(row: Pick<JobListRow, "recoveredG" | "chargedG">): number | null {
  const g = row.recoveredG + row.chargedG;
  return g === 0 ? null : g;
}
