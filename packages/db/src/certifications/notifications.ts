import type { Knex } from "knex";
import { appendActivity, rowId } from "../activity";

/**
 * In-app notifications: a person's own inbox. Every query is pinned to the signed-in person's user id
 * and organisation (never widened: there is no "all notifications" view for any role).
 */

export interface NotificationRow {
  id: number;
  kind: string;
  title: string;
  body: string | null;
  link: string | null;
  subjectType: string | null;
  subjectId: number | null;
  createdAt: string;
  readAt: string | null;
}

export interface NotificationPage {
  rows: NotificationRow[];
  total: number;
  unread: number;
  page: number;
  pageSize: number;
}

export interface NewNotification {
  organisationId: number;
  userId: number;
  kind: string;
  title: string;
  body?: string | null;
  link?: string | null;
  subjectType?: string | null;
  subjectId?: number | null;
  at: string;
}

/** Adds a notification inside the caller's transaction; returns its id. */
export async function createNotification(trx: Knex | Knex.Transaction, n: NewNotification): Promise<number> {
  const [row] = await trx("notifications")
    .insert({
      organisation_id: n.organisationId,
      user_id: n.userId,
      kind: n.kind,
      title: n.title.slice(0, 300),
      body: n.body ?? null,
      link: n.link ?? null,
      subject_type: n.subjectType ?? null,
      subject_id: n.subjectId ?? null,
      created_at: n.at,
      read_at: null,
      emailed_at: null,
    })
    .returning("id");
  return rowId(row);
}

/** Records that the notification also went out by e-mail. */
export async function markNotificationEmailed(db: Knex, opts: { id: number; at?: string }): Promise<void> {
  await db("notifications")
    .where({ id: opts.id })
    .update({ emailed_at: opts.at ?? new Date().toISOString() });
}

/** One page of the person's notifications, newest first, with the number still unread. */
export async function listNotifications(
  db: Knex,
  opts: { userId: number; organisationId: number; page: number; pageSize: number; unreadOnly?: boolean },
): Promise<NotificationPage> {
  const mine = () => db("notifications").where({ user_id: opts.userId, organisation_id: opts.organisationId });
  const base = mine();
  if (opts.unreadOnly) base.whereNull("read_at");
  const total = (await base.clone().count({ n: "*" }).first())?.n ?? 0;
  const unread = (await mine().whereNull("read_at").count({ n: "*" }).first())?.n ?? 0;
  const rows = await base
    .orderBy([
      { column: "created_at", order: "desc" },
      { column: "id", order: "desc" },
    ])
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize)
    .select("id", "kind", "title", "body", "link", "subject_type", "subject_id", "created_at", "read_at");
  return {
    rows: rows.map((r) => ({
      id: Number(r.id),
      kind: r.kind,
      title: r.title,
      body: r.body ?? null,
      link: r.link ?? null,
      subjectType: r.subject_type ?? null,
      subjectId: r.subject_id === null || r.subject_id === undefined ? null : Number(r.subject_id),
      createdAt: r.created_at,
      readAt: r.read_at ?? null,
    })),
    total: Number(total),
    unread: Number(unread),
    page: opts.page,
    pageSize: opts.pageSize,
  };
}

export async function countUnreadNotifications(db: Knex, opts: { userId: number; organisationId: number }): Promise<number> {
  const row = await db("notifications")
    .where({ user_id: opts.userId, organisation_id: opts.organisationId })
    .whereNull("read_at")
    .count({ n: "*" })
    .first();
  return Number(row?.n ?? 0);
}

/** Marks some (or all) of the person's unread notifications read; returns how many changed. */
export async function markNotificationsRead(
  db: Knex,
  opts: { userId: number; organisationId: number; ids?: number[]; all?: boolean; now?: Date },
): Promise<number> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const q = trx("notifications").where({ user_id: opts.userId, organisation_id: opts.organisationId }).whereNull("read_at");
    if (!opts.all) q.whereIn("id", opts.ids ?? []);
    const changed = await q.update({ read_at: at });
    if (changed > 0) {
      await appendActivity(trx, {
        organisationId: opts.organisationId,
        actorId: opts.userId,
        action: "notification.read",
        subjectType: "Notification",
        summary: changed === 1 ? "Marked a notification as read" : `Marked ${changed} notifications as read`,
        data: opts.all ? { all: true } : { ids: opts.ids },
        at,
      });
    }
    return changed;
  });
}
