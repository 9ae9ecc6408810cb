import "server-only";
import { SEVERITY_LABELS } from "@coldtrail/core";
import {
  collectDigests,
  enqueueTask,
  insertFindingNotifications,
  listOrganisationIds,
  listUnsentFindingMail,
  writeTransaction,
  type Knex,
  type TaskHandler,
} from "@coldtrail/db";
import { appLink, mailHtml, queueOutgoingMail } from "./mail";

/**
 * E-mail for the findings workflow. Writes create in-app notifications in their transaction; the route
 * then queues one mail per notification in the outbox (in the same transaction, see
 * `queueFindingMail`), and the background runner sends them — plain text + HTML with a link into the
 * app — retrying while SMTP is down, and marks each notification e-mailed once sent.
 * In development and tests the mail goes to the local SMTP fake (caught mail: http://127.0.0.1:2580).
 */

const FOOTER = "You receive this because of your role in Coldtrail. Open the app to see the whole history.";

/** Queues the mail of these (not yet e-mailed) notifications. Call it in the transaction that created them. */
export async function queueFindingMail(db: Knex, notificationIds: number[]): Promise<number> {
  if (notificationIds.length === 0) return 0;
  let queued = 0;
  const orgs = new Map(
    (await db("notifications").whereIn("id", notificationIds).select("id", "organisation_id")).map((r) => [
      Number(r.id),
      Number(r.organisation_id),
    ]),
  );
  for (const n of await listUnsentFindingMail(db, { ids: notificationIds })) {
    const href = appLink(n.link ?? "/findings");
    const paragraphs = n.body
      .split(/\n{2,}/)
      .map((p) => p.trim())
      .filter(Boolean);
    await queueOutgoingMail(db, {
      organisationId: orgs.get(n.id) ?? null,
      notificationId: n.id,
      to: n.email,
      subject: n.title,
      text: [`Hello ${n.name},`, ...paragraphs, `Open it in Coldtrail: ${href}`, FOOTER].join("\n\n"),
      html: mailHtml({
        heading: n.title,
        paragraphs: [`Hello ${n.name},`, ...paragraphs, FOOTER],
        action: { label: "Open in Coldtrail", href },
      }),
    });
    queued += 1;
  }
  return queued;
}

/**
 * The daily digest: to each person, the findings that are theirs and due within 7 days or overdue.
 * "Today" is the UTC calendar date (or `today`); each person gets at most one digest a day: the
 * digest notification and its outbox mail are written in one transaction, and people who already have
 * today's notification are left out. `onlyUserId` sends just that person's digest (the "send me my
 * digest now" button). `sent` counts the mails queued; the runner delivers them.
 */
export async function sendDailyDigests(
  db: Knex,
  opts: { now?: Date; today?: string; onlyUserId?: number; organisationIds?: number[] } = {},
): Promise<{ sent: number; people: number }> {
  const now = opts.now ?? new Date();
  const today = opts.today ?? now.toISOString().slice(0, 10);
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
      const queued = await writeTransaction(db, async (trx) => {
        // Checked again inside the write transaction, so two senders never both send it.
        const already = await trx("notifications")
          .where({ user_id: d.userId, kind: "finding_digest" })
          .where("created_at", ">=", `${today}T00:00:00.000Z`)
          .first("id");
        if (already) return false;
        const [id] = await insertFindingNotifications(
          trx,
          organisationId,
          [{ userId: d.userId, kind: "finding_digest", title, body, link: "/findings?state=active&sort=due", subjectId: null }],
          now.toISOString(),
        );
        if (id === undefined) return false;
        await queueOutgoingMail(trx, {
          organisationId,
          notificationId: id,
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
        return true;
      });
      if (queued) sent += 1;
    }
  }
  return { sent, people };
}

/** The hour (UTC) from which the day's digest is queued. */
export const DIGEST_FROM_HOUR_UTC = 7;

/**
 * Queues today's digest task of every organisation once it is past 07:00 UTC. The task's unique key
 * (`digest:<organisation>:<day>`) makes it one per organisation and day, however many server
 * instances run this.
 */
export async function scheduleDailyDigests(db: Knex, now: Date = new Date()): Promise<number> {
  if (now.getUTCHours() < DIGEST_FROM_HOUR_UTC) return 0;
  const day = now.toISOString().slice(0, 10);
  let queued = 0;
  for (const organisationId of await listOrganisationIds(db)) {
    const id = await enqueueTask(db, {
      kind: "digest",
      payload: { organisationId, day },
      uniqueKey: `digest:${organisationId}:${day}`,
      organisationId,
    });
    if (id !== null) queued += 1;
  }
  return queued;
}

/** The runner's `digest` task: one organisation's digests for one day. */
export const digestTask: TaskHandler = {
  async run({ task, db }) {
    await sendDailyDigests(db, { today: String(task.payload.day), organisationIds: [Number(task.payload.organisationId)] });
  },
};
