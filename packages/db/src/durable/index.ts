export { DatabaseBusyError, isBusyError, useImmediateTransactions, writeTransaction, type ImmediateOptions } from "./busy";
export {
  findIdempotentAnswer,
  saveIdempotentAnswer,
  lockIdempotencyKey,
  expireIdempotencyKeys,
  isUniqueViolation,
  IDEMPOTENCY_KEY_DAYS,
  type StoredAnswer,
} from "./idempotency";
export {
  enqueueTask,
  claimNextTask,
  renewTaskLease,
  completeTask,
  failTaskAttempt,
  retryFailedTask,
  getTask,
  listTasks,
  taskCounts,
  pruneFinishedTasks,
  backoffMs,
  type BackgroundTask,
  type TaskState,
} from "./tasks";
export { TaskRunner, PermanentTaskError, type TaskContext, type TaskHandler, type RunnerOptions } from "./runner";
export {
  queueMail,
  deliverOutboxMail,
  markOutboxMailFailed,
  listUndeliveredMail,
  pruneSentMail,
  requeueOutboxMail,
  MAIL_MAX_ATTEMPTS,
  type OutboxMail,
} from "./outbox";
