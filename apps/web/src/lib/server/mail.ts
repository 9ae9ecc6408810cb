import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import { deliverOutboxMail, markOutboxMailFailed, queueMail, type Knex, type TaskHandler } from "@coldtrail/db";
import { env } from "../env";

/**
 * Outgoing mail through any SMTP service. In development and tests that is the local SMTP fake
 * started by `npm run demo` / the e2e server (caught mail: http://127.0.0.1:2580).
 */
export interface OutgoingMail {
  to: string | string[];
  subject: string;
  /** Plain-text body; always sent. */
  text: string;
  /** HTML body; sent beside the text. */
  html: string;
}

const globalForMail = globalThis as unknown as { coldtrailMail?: Transporter };

function transport(): Transporter {
  globalForMail.coldtrailMail ??= nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: false,
    ignoreTLS: env.SMTP_HOST === "127.0.0.1" || env.SMTP_HOST === "localhost",
  });
  return globalForMail.coldtrailMail;
}

/** Sends at once through SMTP. App code queues mail instead (`queueOutgoingMail`); the runner calls this. */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  await transport().sendMail({ from: env.MAIL_FROM, ...mail });
}

/**
 * Puts a mail in the outbox (packages/db durable/outbox.ts), to be sent by the background runner with
 * retries while SMTP is down. Call it inside the transaction of the change the mail reports.
 */
export async function queueOutgoingMail(
  db: Knex,
  mail: OutgoingMail & { organisationId: number | null; notificationId?: number | null },
): Promise<number> {
  return queueMail(db, {
    organisationId: mail.organisationId,
    to: Array.isArray(mail.to) ? mail.to.join(", ") : mail.to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html,
    notificationId: mail.notificationId ?? null,
  });
}

/** The runner's `mail` task: one outbox mail through SMTP; a failure is retried with backoff. */
export const mailTask: TaskHandler = {
  async run({ task, db }) {
    await deliverOutboxMail(db, {
      id: Number(task.payload.outboxId),
      send: (m) => sendMail({ to: m.to, subject: m.subject, text: m.text, html: m.html }),
    });
  },
  async giveUp({ task, db, reason }) {
    await markOutboxMailFailed(db, { id: Number(task.payload.outboxId), reason });
  },
  describeError: (err) => `The mail server did not take the message: ${err instanceof Error ? err.message : String(err)}`,
};

/** An absolute link into the app for e-mails. */
export function appLink(path: string): string {
  return new URL(path, env.NEXTAUTH_URL).toString();
}

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

/** A plain, readable HTML body in Coldtrail's look, from paragraphs and an optional action link. */
export function mailHtml(opts: { heading: string; paragraphs: string[]; action?: { label: string; href: string } }): string {
  const paras = opts.paragraphs.map((p) => `<p style="margin:0 0 12px">${escape(p)}</p>`).join("");
  const action = opts.action
    ? `<p style="margin:20px 0"><a href="${escape(opts.action.href)}" style="background:#0f6e8c;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none;font-weight:600">${escape(opts.action.label)}</a></p><p style="font-size:12px;color:#4b5b6b">Or open ${escape(opts.action.href)}</p>`
    : "";
  return `<!doctype html><html lang="en"><body style="font-family:Inter,Arial,sans-serif;color:#17212b;max-width:560px;margin:0 auto;padding:24px"><p style="font-weight:700;color:#0f6e8c;margin:0 0 16px">Coldtrail</p><h1 style="font-size:20px;margin:0 0 16px">${escape(opts.heading)}</h1>${paras}${action}</body></html>`;
}
