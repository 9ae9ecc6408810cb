import "server-only";
import { SEVERITY_LABELS } from "@coldtrail/core";
import {
  collectDigests,
  insertFindingNotifications,
  listOrganisationIds,
  listUnsentFindingMail,
  markFindingMailSent,
  type Knex,
} from "@coldtrail/db";
import { appLink, mailHtml, sendMail } from "./mail";

/**
 * E-mail for the findings workflow. Writes create in-app notifications in the same transaction (the
 * outbox); after the commit these functions send each one as plain text + HTML with a link into the
 * app and mark it sent. A mail that cannot be sent stays unsent in the app and is logged.
 * In development and tests the mail goes to the local SMTP fake (caught mail: http://127.0.0.1:2580).
 */

const FOOTER = "You receive this because of your role in Coldtrail. Open the app to see the whole history.";

export async function deliverFindingMail(db: Knex, notificationIds: number[]): Promise<number> {
  if (notificationIds.length === 0) return 0;
  let sent = 0;
  for (const n of await listUnsentFindingMail(db, { ids: notificationIds })) {
    const href = appLink(n.link ?? "/findings");
    const paragraphs = n.body
      .split(/\n{2,}/)
      .map((p) => p.trim())
      .filter(Boolean);
    try {
      await sendMail({
        to: n.email,
        subject: n.title,
        text: [`Hello ${n.name},`, ...paragraphs, `Open it in Coldtrail: ${href}`, FOOTER].join("\n\n"),
        html: mailHtml({
          heading: n.title,
          paragraphs: [`Hello ${n.name},`, ...paragraphs, FOOTER],
          action: { label: "Open in Coldtrail", href },
        }),
      });
      await markFindingMailSent(db, { id: n.id });
      sent += 1;
    } catch (err) {
      console.error(`[mail] notification #${n.id} to ${n.email} was not sent`, err);
    }
  }
  return sent;
}

/** Sends after a write without holding up the response. */
export function deliverFindingMailLater(db: Knex, notificationIds: number[]): void {
  if (notificationIds.length === 0) return;
  setImmediate(() => {
    deliverFindingMail(db, notificationIds).catch((err: unknown) => console.error("[mail] findings mail failed", err));
  });
}

/**
 * The daily digest: to each person, the findings that are theirs and due within 7 days or overdue.
 * "Today" is the UTC calendar date; each person gets at most one digest a day. `onlyUserId` sends just
 * that person's digest (the "send me my digest now" button).
 */
export async function sendDailyDigests(
  db: Knex,
  opts: { now?: Date; onlyUserId?: number; organisationIds?: number[] } = {},
): Promise<{ sent: number; people: number }> {
  const now = opts.now ?? new Date();
  const today = now.toISOString().slice(0, 10);
  let sent = 0;
  let people = 0;
  for (const organisationId of opts.organisationIds ?? (await listOrganisationIds(db))) {
    for (const d of await collectDigests(db, { organisationId, today })) {
      if (opts.onlyUserId !== undefined && d.userId !== opts.onlyUserId) continue;
      people += 1;
      const overdue = d.lines.filter((l) => l.overdue).length;
      const title = `Coldtrail digest ${today}: ${overdue} overdue, ${d.lines.length - overdue} due within 7 days`;
      const lines = d.lines
        .slice(0, 50)
        .map(
          (l) =>
            `• ${l.overdue ? `OVERDUE since ${l.dueOn}` : l.daysLeft === 0 ? "Due today" : `Due ${l.dueOn} (in ${l.daysLeft} day${l.daysLeft === 1 ? "" : "s"})`} — ${SEVERITY_LABELS[l.severity]} — ${l.ruleId} ${l.title} — ${l.branchName} — ${appLink(`/findings/${l.id}`)}`,
        );
      if (d.lines.length > 50) lines.push(`… and ${d.lines.length - 50} more: ${appLink("/findings?due=overdue")}`);
      const body = [`These findings are yours to see through and are overdue or due within 7 days.`, lines.join("\n")].join("\n\n");
      const [id] = await db.transaction((trx) =>
        insertFindingNotifications(
          trx,
          organisationId,
          [{ userId: d.userId, kind: "finding_digest", title, body, link: "/findings?state=active&sort=due", subjectId: null }],
          now.toISOString(),
        ),
      );
      if (id === undefined) continue;
      try {
        await sendMail({
          to: d.email,
          subject: title,
          text: [`Hello ${d.name},`, body, `All your findings: ${appLink("/findings?state=active&sort=due")}`, FOOTER].join("\n\n"),
          html: mailHtml({
            heading: title,
            paragraphs: [
              `Hello ${d.name},`,
              "These findings are yours to see through and are overdue or due within 7 days.",
              ...d.lines
                .slice(0, 50)
                .map(
                  (l) =>
                    `${l.overdue ? `Overdue since ${l.dueOn}` : `Due ${l.dueOn}`} · ${SEVERITY_LABELS[l.severity]} · ${l.ruleId} ${l.title} · ${l.branchName} (finding #${l.id})`,
                ),
              FOOTER,
            ],
            action: { label: "Open your findings", href: appLink("/findings?state=active&sort=due") },
          }),
        });
        await markFindingMailSent(db, { id });
        sent += 1;
      } catch (err) {
        console.error(`[mail] digest to ${d.email} was not sent`, err);
      }
    }
  }
  return { sent, people };
}
