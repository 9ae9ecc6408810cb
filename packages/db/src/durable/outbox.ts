import type { Knex } from "knex";
import { enqueueTask } from "./tasks";

/**
 * The mail outbox. Every e-mail is a row here, written in the transaction of the change it reports,
 * with a `mail` task for the runner; the runner sends it, retrying with backoff while SMTP is down,
 * and marks it sent (and the in-app notification it belongs to as e-mailed). The owner's status page
 * lists what is still undelivered and why.
 */

export interface OutboxMail {
  id: number;
  organisationId: number | null;
  to: string;
  subject: string;
  text: string;
  html: string;
  notificationId: number | null;
  state: "queued" | "sent" | "failed";
  attempts: number;
  lastError: string | null;
  createdAt: string;
  sentAt: string | null;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toMail(r: any): OutboxMail {
  return {
    id: Number(r.id),
    organisationId: r.organisation_id === null ? null : Number(r.organisation_id),
    to: r.to_address,
    subject: r.subject,
    text: r.text,
    html: r.html,
    notificationId: r.notification_id === null ? null : Number(r.notification_id),
    state: r.state,
    attempts: Number(r.attempts),
    lastError: r.last_error ?? null,
    createdAt: r.created_at,
    sentAt: r.sent_at ?? null,
  };
}

/** Attempts at one mail before it is given up (with a 15-minute cap on the backoff, about 11 hours). */
export const MAIL_MAX_ATTEMPTS = 50;

/** Queues one e-mail; call it inside the transaction of the change it reports. Returns the outbox id. */
export async function queueMail(
  db: Knex | Knex.Transaction,
  mail: {
    organisationId: number | null;
    to: string;
    subject: string;
    text: string;
    html: string;
    notificationId?: number | null;
    now?: Date;
  },
): Promise<number> {
  const at = (mail.now ?? new Date()).toISOString();
  const [row] = await db("mail_outbox")
    .insert({
      organisation_id: mail.organisationId,
      to_address: mail.to,
      subject: mail.subject.slice(0, 500),
      text: mail.text,
      html: mail.html,
      notification_id: mail.notificationId ?? null,
      state: "queued",
      attempts: 0,
      created_at: at,
    })
    .returning("id");
  const id = Number(typeof row === "object" ? (row as { id: number }).id : row);
  await enqueueTask(db, {
    kind: "mail",
    payload: { outboxId: id },
    uniqueKey: `mail:${id}`,
    organisationId: mail.organisationId,
    maxAttempts: MAIL_MAX_ATTEMPTS,
    now: mail.now,
  });
  return id;
}

/**
 * Sends one queued mail through `send` (the app's SMTP transport). Success marks it sent (and its
 * notification e-mailed); a failure records the reason and attempt and rethrows, so the task retries.
 */
export async function deliverOutboxMail(
  db: Knex,
  opts: { id: number; send: (mail: OutboxMail) => Promise<void>; now?: () => Date },
): Promise<"sent" | "already"> {
  const clock = opts.now ?? (() => new Date());
  const r = await db("mail_outbox").where({ id: opts.id }).first();
  if (!r) return "already";
  const mail = toMail(r);
  if (mail.state === "sent") return "already";
  try {
    await opts.send(mail);
  } catch (err) {
    const reason = err instanceof Error ? err.message : String(err);
    await db("mail_outbox")
      .where({ id: opts.id })
      .update({ attempts: mail.attempts + 1, last_error: reason.slice(0, 1000) });
    throw err;
  }
  const at = clock().toISOString();
  await db.transaction(async (trx) => {
    await trx("mail_outbox")
      .where({ id: opts.id })
      .update({ state: "sent", sent_at: at, attempts: mail.attempts + 1, last_error: null });
    if (mail.notificationId !== null)
      await trx("notifications").where({ id: mail.notificationId }).whereNull("emailed_at").update({ emailed_at: at });
  });
  return "sent";
}

/** The mail was given up: it stays in the outbox as failed, with its last reason. */
export async function markOutboxMailFailed(db: Knex, opts: { id: number; reason: string }): Promise<void> {
  await db("mail_outbox")
    .where({ id: opts.id })
    .whereNot("state", "sent")
    .update({ state: "failed", last_error: opts.reason.slice(0, 1000) });
}

/** Mail of an organisation not delivered yet (queued or failed), oldest first, for the status page. */
export async function listUndeliveredMail(db: Knex, opts: { organisationId: number; limit?: number }): Promise<OutboxMail[]> {
  const rows = await db("mail_outbox")
    .where({ organisation_id: opts.organisationId })
    .whereIn("state", ["queued", "failed"])
    .orderBy([{ column: "created_at" }, { column: "id" }])
    .limit(opts.limit ?? 100)
    .select("*");
  return rows.map(toMail);
}

/** Housekeeping: forgets sent mail older than `days`. */
export async function pruneSentMail(db: Knex, opts: { days?: number; now?: Date } = {}): Promise<number> {
  const before = new Date((opts.now ?? new Date()).getTime() - (opts.days ?? 30) * 86_400_000).toISOString();
  return db("mail_outbox").where({ state: "sent" }).where("sent_at", "<", before).delete();
}

/** The owner's "try again" for a mail given up: back to queued (its task is re-queued separately). */
export async function requeueOutboxMail(db: Knex, opts: { id: number }): Promise<void> {
  await db("mail_outbox").where({ id: opts.id, state: "failed" }).update({ state: "queued" });
}
