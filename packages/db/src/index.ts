export { createDb, getDb, closeDb, databaseFile, repoRoot, sqliteConfig, pgConfig, isPostgresUrl, isPostgres } from "./connection";
export { migrationSource, MIGRATION_NAMES } from "./migration-source";
export {
  DomainError,
  RecordNotFoundError,
  RecordConflictError,
  InvalidInputError,
  ActionForbiddenError,
  isDomainError,
  type DomainErrorCode,
} from "./errors";
export { appendActivity, latestActivityId, branchesTouchedSince, type ActivityEntry } from "./activity";
export type { ScopeFn, ActorRef } from "./types";
export {
  findUserForSignIn,
  loadActor,
  credentialStampOf,
  currentCredentialStamp,
  type SignInUser,
  type Actor,
  type ActorMembership,
  type ActorInspectorGrant,
} from "./users";
export { listBranches, type BranchSummary } from "./branches";
export {
  listJobs,
  getJob,
  createRecoveryJob,
  createJob,
  amendJob,
  voidJob,
  checkJobDraftForActor,
  leakRateOfJob,
  JOB_FIELD_WORDS,
  type JobDraftCheck,
  type JobListRow,
  type JobListResult,
  type JobDetail,
  type JobMovement,
} from "./jobs";
export {
  listApplianceOptions,
  listCylinderOptions,
  listEquipmentOptions,
  type ApplianceOption,
  type CylinderOption,
  type EquipmentOption,
} from "./options";
export { describeMass } from "./mass";
export { DEMO_PASSWORD, DEMO_SIGN_INS, DEMO_TODAY } from "./demo/scenario";
export { loadDemoData } from "./demo/load";
export { hashPassword, verifyPassword, DUMMY_PASSWORD_HASH } from "./passwords";
export type { Knex } from "knex";
export { scopeByAbility, type QueryScope } from "./scope";
export { getApplianceRef, type ApplianceRef } from "./appliances";
export { amendRecord, voidRecord, listAmendments, type AmendOptions, type AmendmentRecord } from "./amendments";
export * from "./admin";
// Registers: appliances, recovery equipment, cylinders.
export * from "./registers";
// Records kept beside jobs: disposals, reclaim shipments, purchases (jobs).
export { type RecordPage } from "./records/common";
export {
  listDisposals,
  getDisposalRecord,
  getDisposalStatement,
  getStatementDocument,
  getDisposalRef,
  createDisposalRecord,
  createDisposalStatement,
  amendDisposalRecord,
  amendDisposalStatement,
  voidDisposal,
  monthlyDisposalTotals,
  listShopQueue,
  recordShopDisposals,
  type DisposalListRow,
  type DisposalRecordDetail,
  type DisposalStatementDetail,
  type MonthlyDisposalTotals,
  type ShopQueueRow,
  type ShopBatchResult,
} from "./records/disposals";
export {
  listShipments,
  getShipment,
  getShipmentRef,
  createShipment,
  amendShipment,
  voidShipment,
  type ShipmentListRow,
  type ShipmentDetail,
} from "./records/shipments";
export {
  listPurchases,
  getPurchase,
  getPurchaseRef,
  createPurchase,
  amendPurchase,
  voidPurchase,
  type PurchaseRow,
  type PurchaseDetail,
} from "./records/purchases";
// Certification cards, in-app notifications and spreadsheet imports (cards and imports):
export * from "./certifications";
export * from "./imports";
// Audits: runs, findings workflow, saved views, dashboards, export rows, digest, continuous audit (audits).
export * from "./audits";
// Sign-in security: server-side sessions, throttling, changing one's own password.
export * from "./sessions";
export * from "./throttle";
export * from "./account";
// Durable writes: busy locks, idempotency keys, background tasks, mail outbox.
export * from "./durable";
