import type { Knex } from "knex";
import { findingViewQuery, type FindingViewQuery } from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { RecordConflictError, RecordNotFoundError } from "../errors";
import type { ActorRef } from "../types";

export interface SavedView {
  id: number;
  list: string;
  name: string;
  query: FindingViewQuery;
  updatedAt: string;
}

function toView(r: any): SavedView {
  let raw: unknown;
  try {
    raw = JSON.parse(r.query);
  } catch {
    raw = {};
  }
  const parsed = findingViewQuery.safeParse(raw);
  return {
    id: Number(r.id),
    list: r.list,
    name: r.name,
    query: parsed.success ? parsed.data : findingViewQuery.parse({}),
    updatedAt: r.updated_at,
  };
}

/** A person's own saved views of a list, by name. Nobody sees another person's views. */
export async function listSavedViews(db: Knex, opts: { actor: ActorRef; list: string }): Promise<SavedView[]> {
  const rows = await db("saved_views")
    .where({ user_id: opts.actor.userId, organisation_id: opts.actor.organisationId, list: opts.list })
    .orderBy([{ column: "name" }, { column: "id" }])
    .select("*");
  return rows.map(toView);
}

/** Saves a view under a name; saving again under the same name replaces it. */
export async function saveView(
  db: Knex,
  opts: { actor: ActorRef; list: string; name: string; query: FindingViewQuery; now?: Date },
): Promise<SavedView> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const existing = await trx("saved_views").where({ user_id: opts.actor.userId, list: opts.list, name: opts.name }).first("id");
    let id: number;
    if (existing) {
      id = Number(existing.id);
      await trx("saved_views")
        .where({ id })
        .update({ query: JSON.stringify(opts.query), updated_at: at });
    } else {
      const count = await trx("saved_views").where({ user_id: opts.actor.userId, list: opts.list }).count({ n: "*" }).first();
      if (Number(count?.n ?? 0) >= 50) throw new RecordConflictError("You already keep 50 views of this list; delete one first", "name");
      const [row] = await trx("saved_views")
        .insert({
          organisation_id: opts.actor.organisationId,
          user_id: opts.actor.userId,
          list: opts.list,
          name: opts.name,
          query: JSON.stringify(opts.query),
          created_at: at,
          updated_at: at,
        })
        .returning("id");
      id = rowId(row);
    }
    await appendActivity(trx, {
      organisationId: opts.actor.organisationId,
      actorId: opts.actor.userId,
      action: "saved_view.saved",
      subjectType: "saved_view",
      subjectId: id,
      at,
      summary: `Saved the view "${opts.name}" of the ${opts.list} list`,
    });
    return toView(await trx("saved_views").where({ id }).first("*"));
  });
}

/** Deletes one of the person's own views; another person's view is simply not found. */
export async function deleteSavedView(db: Knex, opts: { actor: ActorRef; id: number; now?: Date }): Promise<void> {
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const row = await trx("saved_views")
      .where({ id: opts.id, user_id: opts.actor.userId, organisation_id: opts.actor.organisationId })
      .first("id", "name", "list");
    if (!row) throw new RecordNotFoundError("No such saved view");
    await trx("saved_views").where({ id: opts.id }).delete();
    await appendActivity(trx, {
      organisationId: opts.actor.organisationId,
      actorId: opts.actor.userId,
      action: "saved_view.deleted",
      subjectType: "saved_view",
      subjectId: opts.id,
      at,
      summary: `Deleted the view "${row.name}" of the ${row.list} list`,
    });
  });
}
