export type DomainErrorCode = "not_found" | "conflict" | "invalid" | "forbidden";

/** Base of every error the domain layer throws on purpose; the app maps `code` to HTTP in one place. */
export class DomainError extends Error {
  readonly code: DomainErrorCode;
  /** The input field the error is about, when there is one (e.g. "cylinderId"). */
  readonly field?: string;

  constructor(code: DomainErrorCode, message: string, field?: string) {
    super(message);
    this.name = new.target.name;
    this.code = code;
    if (field !== undefined) this.field = field;
  }
}

/** The record does not exist in the actor's organisation (or the actor may not know it exists). */
export class RecordNotFoundError extends DomainError {
  constructor(message: string, field?: string) {
    super("not_found", message, field);
  }
}

/** The record exists but cannot be used this way (another branch, retired, not in the register …). */
export class RecordConflictError extends DomainError {
  constructor(message: string, field?: string) {
    super("conflict", message, field);
  }
}

export class InvalidInputError extends DomainError {
  constructor(message: string, field?: string) {
    super("invalid", message, field);
  }
}

export class ActionForbiddenError extends DomainError {
  constructor(message: string, field?: string) {
    super("forbidden", message, field);
  }
}

export function isDomainError(err: unknown): err is DomainError {
  return err instanceof DomainError;
}
