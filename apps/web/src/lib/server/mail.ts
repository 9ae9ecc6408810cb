import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
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

export async function sendMail(mail: OutgoingMail): Promise<void> {
  await transport().sendMail({ from: env.MAIL_FROM, ...mail });
}

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
