import { defineAbilityFor, type AppAbility } from "@coldtrail/core";
import { loadActor, type Knex } from "@coldtrail/db";

/** Facts of the demo data the admin tests lean on (packages/db/README.md). */
export const KM = "kestrelmoor.example";
export const OWNER = `marguerite.halvorsen@${KM}`;
export const OFFICER = `teodora.vasquez-lind@${KM}`;
export const MANAGER_COL = `grant.oyelaran@${KM}`;
export const TECH_COL = `marcus.delacroix-byrd@${KM}`;
export const INSPECTOR = "harold.penwick@statewide-review.example";
export const OTHER_OWNER = "beatrix.holloway@quillfield-refrigeration.example";

export async function userId(db: Knex, email: string): Promise<number> {
  const row = await db("users").where({ email }).first("id");
  if (!row) throw new Error(`no user ${email}`);
  return Number(row.id);
}

export async function branchId(db: Knex, code: string, organisationId = 1): Promise<number> {
  const row = await db("branches").where({ code, organisation_id: organisationId }).first("id");
  if (!row) throw new Error(`no branch ${code}`);
  return Number(row.id);
}

/** The actor reference and the ability of a user as the app builds them on each request. */
export async function signedIn(
  db: Knex,
  email: string,
  now = new Date(),
): Promise<{ actor: { userId: number; organisationId: number }; ability: AppAbility }> {
  const loaded = await loadActor(db, await userId(db, email));
  if (!loaded) throw new Error(`${email} cannot sign in`);
  return { actor: { userId: loaded.userId, organisationId: loaded.organisationId }, ability: defineAbilityFor(loaded, now) };
}

export async function count(db: Knex, table: string, where: Record<string, unknown> = {}): Promise<number> {
  return Number((await db(table).where(where).count({ n: "*" }).first())?.n ?? 0);
}

/** The last activity row, for checking that a write recorded who, when and what. */
export async function lastActivity(db: Knex) {
  return db("activity").orderBy("id", "desc").first();
}
