// Shapes the findings and audits API routes return, as the browser receives them (type-only).
import type { RecordHealth, HealthTrend } from "@coldtrail/core";
import type { AuditRun, BranchDashboard, FindingDetail, FindingGroup, FindingListRow, OverviewBranch, SavedView } from "@coldtrail/db";

export type { FindingListRow, FindingGroup, SavedView, OverviewBranch, BranchDashboard, RecordHealth, HealthTrend };

export interface FindingPage {
  rows: FindingListRow[];
  total: number;
  page: number;
  pageSize: number;
  groupBy: string | null;
  groups: FindingGroup[];
}

export type AuditView = AuditRun & { partial: boolean; branchNames?: string[] };

export interface AuditPage {
  rows: (AuditView & { branchNames: string[] })[];
  total: number;
  page: number;
  pageSize: number;
}

export interface FindingView extends FindingDetail {
  rule: { id: string; title: string; explanation: string; citation: string; pack: string } | null;
  allowed: { assign: boolean; proposeFix: boolean; accept: boolean; reopen: boolean; waive: boolean; comment: boolean };
}

export interface Assignee {
  id: number;
  name: string;
  role: string;
  branchIds: number[];
}

export interface OverviewData {
  branches: OverviewBranch[];
  totals: { critical: number; major: number; minor: number; overdue: number; fixProposed: number };
  healthExplanation: string;
}

export type BranchDashboardData = BranchDashboard & { overview: OverviewBranch | null; healthExplanation: string };

/** Where the record a finding concerns is shown in the app. */
export function recordHref(recordType: string, recordId: number | null, branchId: number): string | null {
  if (recordId === null) return null;
  switch (recordType) {
    case "job":
      return `/jobs/${recordId}`;
    case "appliance":
      return `/appliances/${recordId}`;
    case "cylinder":
      return `/cylinders/${recordId}`;
    case "equipment":
      return `/equipment/${recordId}`;
    case "certification":
      return `/certifications/${recordId}`;
    case "branch":
      return `/branches/${branchId}`;
    default:
      return null;
  }
}
