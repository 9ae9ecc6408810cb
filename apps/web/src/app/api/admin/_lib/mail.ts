import "server-only";
import type { CreatedGrant, IssuedInvitation, IssuedReset, Knex } from "@coldtrail/db";
import { appLink, mailHtml, queueOutgoingMail, type OutgoingMail } from "@/lib/server/mail";
import { kickTaskRunner } from "@/lib/server/task-kick";

/** Readable UTC instant for e-mails: "1 December 2026, 14:05 UTC". */
export function whenUtc(iso: string): string {
  return `${new Intl.DateTimeFormat("en-GB", { timeZone: "UTC", day: "numeric", month: "long", year: "numeric", hour: "2-digit", minute: "2-digit", hour12: false }).format(new Date(iso))} UTC`;
}

/**
 * Queues the mail in the outbox (delivered by the background runner, retried while SMTP is down; the
 * owner sees undelivered mail on the background work page). Says whether it was queued: call it in
 * the transaction of the change, so a failure here undoes nothing but the mail.
 */
async function trySend(db: Knex, organisationId: number | null, mail: OutgoingMail): Promise<boolean> {
  try {
    await queueOutgoingMail(db, { ...mail, organisationId });
    kickTaskRunner();
    return true;
  } catch (err) {
    console.error("mail not queued:", err instanceof Error ? err.message : err);
    return false;
  }
}

export function sendInvitationMail(db: Knex, organisationId: number, inv: IssuedInvitation): Promise<boolean> {
  const href = appLink(`/invitation/${inv.token}`);
  const paragraphs = [
    `${inv.invitedByName} has invited you to ${inv.organisationName} on Coldtrail, where the company keeps its refrigerant records.`,
    `Your access: ${inv.access}.`,
    `Open the link to choose your password. It works once and expires on ${whenUtc(inv.expiresAt)}.`,
    "If you were not expecting this, you can ignore this e-mail.",
  ];
  return trySend(db, organisationId, {
    to: inv.email,
    subject: `You're invited to ${inv.organisationName} on Coldtrail`,
    text: `Hello ${inv.name},\n\n${paragraphs.join("\n\n")}\n\n${href}\n`,
    html: mailHtml({ heading: `Hello ${inv.name}`, paragraphs, action: { label: "Choose your password", href } }),
  });
}

export function sendResetMail(db: Knex, reset: IssuedReset): Promise<boolean> {
  const href = appLink(`/password/reset/${reset.token}`);
  const paragraphs = [
    "Someone asked to reset the password of your Coldtrail account. If it was you, open the link and choose a new password.",
    `The link works once and expires on ${whenUtc(reset.expiresAt)}.`,
    "If it was not you, ignore this e-mail: your password stays as it is.",
  ];
  return trySend(db, null, {
    to: reset.email,
    subject: "Reset your Coldtrail password",
    text: `Hello ${reset.name},\n\n${paragraphs.join("\n\n")}\n\n${href}\n`,
    html: mailHtml({ heading: "Choose a new password", paragraphs, action: { label: "Choose a new password", href } }),
  });
}

/** A new inspector gets an invitation; one who can already sign in gets a notice of the new access. */
export function sendGrantMail(db: Knex, organisationId: number, grant: CreatedGrant): Promise<boolean> {
  const scope = `${grant.branchNames.join(", ")} — records dated ${grant.recordsFrom} to ${grant.recordsTo}`;
  const until = `until ${whenUtc(grant.expiresAt)}`;
  if (grant.kind === "invited" && grant.token) {
    const href = appLink(`/invitation/${grant.token}`);
    const paragraphs = [
      `${grant.grantedByName} of ${grant.organisationName} has given you read-only access to their refrigerant records on Coldtrail.`,
      `What you can read: ${scope}, ${until}.`,
      `Open the link to choose your password. It works once and expires on ${whenUtc(grant.invitationExpiresAt ?? grant.expiresAt)}.`,
    ];
    return trySend(db, organisationId, {
      to: grant.email,
      subject: `Read access to ${grant.organisationName}'s records on Coldtrail`,
      text: `Hello ${grant.inspectorName},\n\n${paragraphs.join("\n\n")}\n\n${href}\n`,
      html: mailHtml({ heading: `Hello ${grant.inspectorName}`, paragraphs, action: { label: "Choose your password", href } }),
    });
  }
  const href = appLink("/sign-in");
  const paragraphs = [
    `${grant.grantedByName} of ${grant.organisationName} has given you further read-only access on Coldtrail.`,
    `What you can read: ${scope}, ${until}.`,
    "Sign in with your existing password.",
  ];
  return trySend(db, organisationId, {
    to: grant.email,
    subject: `New read access to ${grant.organisationName}'s records`,
    text: `Hello ${grant.inspectorName},\n\n${paragraphs.join("\n\n")}\n\n${href}\n`,
    html: mailHtml({ heading: `Hello ${grant.inspectorName}`, paragraphs, action: { label: "Sign in", href } }),
  });
}

/** What the forgot-password form always answers. */
export const FORGOT_PASSWORD_ANSWER =
  "If that address belongs to an account that can sign in, a link to choose a new password is on its way. It works once, for one hour.";
