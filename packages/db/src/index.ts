export { createDb, getDb, closeDb, databaseFile, repoRoot, sqliteConfig } from "./connection";
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
export { appendActivity, type ActivityEntry } from "./activity";
export type { ScopeFn, ActorRef } from "./types";
export { findUserForSignIn, loadActor, type SignInUser, type Actor, type ActorMembership, type ActorInspectorGrant } from "./users";
export { listBranches, type BranchSummary } from "./branches";
export {
  listJobs,
  getJob,
  createRecoveryJob,
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
export { hashPassword, verifyPassword } from "./passwords";
export type { Knex } from "knex";
export { scopeByAbility, type QueryScope } from "./scope";
export { getApplianceRef, type ApplianceRef } from "./appliances";
export { amendRecord, voidRecord, listAmendments, type AmendOptions, type AmendmentRecord } from "./amendments";
