import { randomBytes } from "node:crypto";
import type { Knex } from "knex";
import { DomainError } from "../errors";
import { failAudit } from "./audit-runs";

/**
 * What people see and what the server log keeps when an audit or a re-check fails. The officer reads
 * a plain sentence with a short reference they can quote; the log gets one line with the same
 * reference and the kind of error (its class and code), never the driver's message, which may hold
 * a whole SQL statement with names and values.
 */
export interface AuditFailure {
  /** Short id shared by the message and the log line, e.g. "AUD-7K2Q9X". */
  reference: string;
  /** The sentence stored on the audit and shown to the officer. */
  message: string;
  /** The one line written to the server log. */
  logLine: string;
}

const ALPHABET = "ABCDEFGHJKLMNPQRSTUVWXYZ23456789";

/** A short reference people can read out: AUD- and six letters or digits without look-alikes. */
export function failureReference(bytes: Uint8Array = randomBytes(6)): string {
  return `AUD-${[...bytes.slice(0, 6)].map((b) => ALPHABET[b % ALPHABET.length]).join("")}`;
}

/** The error's kind for the log: class name and driver code, nothing from its message. */
function errorKind(err: unknown): string {
  if (!(err instanceof Error)) return typeof err;
  const code = "code" in err && (typeof err.code === "string" || typeof err.code === "number") ? ` ${String(err.code)}` : "";
  return `${err.name || "Error"}${code}`.replace(/[^\w .:-]/g, "").slice(0, 80);
}

/**
 * Describes a failure of `what` (e.g. "audit #12", "re-check of branch #3"). Our own domain errors
 * carry plain words meant for people and are shown as they are; anything else gets the general
 * sentence.
 */
export function describeAuditFailure(err: unknown, what: string, reference: string = failureReference()): AuditFailure {
  const plain =
    err instanceof DomainError
      ? `${err.message.replace(/\s+/g, " ").slice(0, 300)}.`.replace(/\.\.$/, ".")
      : "Something went wrong while the records were checked, so the audit stopped.";
  return {
    reference,
    message: `${plain} Findings already saved for finished branches are kept. Start the audit again; if it stops again, quote reference ${reference}.`,
    logLine: `[audits] ${what} failed, reference ${reference}: ${errorKind(err)}`,
  };
}

/** Marks an audit failed with a plain message and a reference, and logs one concise line. */
export async function failAuditWithReference(
  db: Knex,
  opts: { id: number; error: unknown; now?: Date; log?: (line: string) => void },
): Promise<AuditFailure> {
  const failure = describeAuditFailure(opts.error, `audit #${opts.id}`);
  (opts.log ?? console.error)(failure.logLine);
  await failAudit(db, { id: opts.id, message: failure.message, now: opts.now });
  return failure;
}
