export { loadBranchRecords, type LoadedBranch, type LoadedBranchRecords } from "./load-branch-records";
export { getOrganisationAuditSettings, type OrganisationAuditSettings } from "./organisation-settings";
export { auditBranchFindings, type BranchAuditSummary } from "./persist-findings";
export { listFindingsOfRecord, type RecordFindingRow, type RecordFindingEffect } from "./record-findings";
export { describeAuditFailure, failAuditWithReference, failureReference, type AuditFailure } from "./audit-failure";
export { whereFindingShowsIn, findingBranchIds } from "./finding-branches";
export {
  createAudit,
  getAuditRun,
  listAudits,
  claimAudit,
  touchAuditHeartbeat,
  listQueuedAuditIds,
  requeueInterruptedAudits,
  failAudit,
  runAuditBranches,
  healthOfBranchSummary,
  latestDoneAuditForBranch,
  type AuditRun,
  type AuditListRow,
  type AuditSummary,
  type AuditState,
} from "./audit-runs";
export {
  listFindings,
  findingRecordLabel,
  getFinding,
  getFindingRefs,
  listAssignableUsers,
  assignFindings,
  proposeFindingFix,
  acceptFindingFix,
  reopenFinding,
  waiveFinding,
  addFindingComment,
  addFindingEvidence,
  getFindingEvidence,
  insertFindingNotifications,
  listUnsentFindingMail,
  markFindingMailSent,
  type FindingListRow,
  type FindingListResult,
  type FindingGroup,
  type FindingDetail,
  type FindingEventRow,
  type FindingCommentRow,
  type FindingEvidenceRow,
  type FindingRef,
  type NotificationDraft,
  type TransitionResult,
  type EvidenceFile,
  type PendingMail,
} from "./findings";
export { listSavedViews, saveView, deleteSavedView, type SavedView } from "./saved-views";
export {
  getOrganisationOverview,
  getBranchDashboard,
  type OverviewBranch,
  type AuditSnapshot,
  type BranchDashboard,
  type RuleCount,
  type MonthFindings,
  type MonthFlows,
  type LeakWatchRow,
  type CoverageRow,
  type CylinderWatchRow,
} from "./dashboard";
export {
  auditFindingExportRows,
  auditFindingCounts,
  jobExportRows,
  leakRateExportRows,
  cylinderExportRows,
  certificationExportRows,
  disposalExportRows,
  type FindingExportRow,
  type JobExportRow,
  type LeakRateExportRow,
  type CylinderExportRow,
  type CertificationExportRow,
  type DisposalExportRow,
} from "./export-rows";
export { collectDigests, listOrganisationIds, type DigestForPerson } from "./digest";
export { reevaluateBranch } from "./reevaluate";
