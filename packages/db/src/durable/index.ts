export { DatabaseBusyError, isBusyError, useImmediateTransactions, writeTransaction, type ImmediateOptions } from "./busy";
export {
  findIdempotentAnswer,
  saveIdempotentAnswer,
  expireIdempotencyKeys,
  isUniqueViolation,
  IDEMPOTENCY_KEY_DAYS,
  type StoredAnswer,
} from "./idempotency";
