import type { Knex } from "knex";
import {
  MASS_DISPLAY_UNIT_LABELS,
  US_REGION_CODES,
  normalRegion,
  placeWords,
  type BranchInput,
  type BranchListQuery,
  type BranchUpdate,
  type MassDisplayUnit,
} from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import type { ActorRef, ScopeFn } from "../types";
import { countRows, whereContains } from "../paging";

export interface AdminBranchRow {
  id: number;
  organisationId: number;
  name: string;
  code: string;
  address: string | null;
  timeZone: string;
  massUnit: MassDisplayUnit;
  /** ISO 3166-1 alpha-2 country and state/region: decide the rule packs the branch is audited against. */
  country: string;
  region: string | null;
  createdAt: string;
  archivedAt: string | null;
  /** Active people with a role in the branch. */
  peopleCount: number;
}

export interface AdminBranchPage {
  rows: AdminBranchRow[];
  total: number;
  page: number;
  pageSize: number;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toRow(r: any): AdminBranchRow {
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    name: r.name,
    code: r.code,
    address: r.address ?? null,
    timeZone: r.time_zone,
    massUnit: r.mass_unit as MassDisplayUnit,
    country: r.country,
    region: r.region ?? null,
    createdAt: r.created_at,
    archivedAt: r.archived_at ?? null,
    peopleCount: Number(r.people_count ?? 0),
  };
}

function withPeopleCount(db: Knex, qb: Knex.QueryBuilder): Knex.QueryBuilder {
  const people = db("memberships as pm")
    .join("users as pu", "pu.id", "pm.user_id")
    .whereRaw("pm.branch_id = branches.id")
    .where("pu.active", true)
    .countDistinct({ n: "pm.user_id" });
  return qb.select("branches.*", people.as("people_count"));
}

/**
 * One page of branches the scope allows (the scope sees the table as `branches`), active ones first,
 * then by name. Archived branches are listed unless asked not to: their records stay in past audits.
 */
export async function listAdminBranches(db: Knex, opts: { scope: ScopeFn; query: BranchListQuery }): Promise<AdminBranchPage> {
  const { query } = opts;
  const filtered = (qb: Knex.QueryBuilder) => {
    qb.where((w) => opts.scope(w));
    if (query.archived === "exclude") qb.whereNull("branches.archived_at");
    if (query.archived === "only") qb.whereNotNull("branches.archived_at");
    if (query.q) whereContains(qb, query.q, ["branches.name", "branches.code"]);
    return qb;
  };
  const total = await countRows(filtered(db("branches as branches")));
  const rows = await withPeopleCount(db, filtered(db("branches as branches")))
    .orderByRaw("case when branches.archived_at is null then 0 else 1 end")
    .orderBy([{ column: "branches.name" }, { column: "branches.id" }])
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { rows: rows.map(toRow), total, page: query.page, pageSize: query.pageSize };
}

/** One branch the scope allows, archived or not; undefined otherwise. */
export async function getAdminBranch(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<AdminBranchRow | undefined> {
  const qb = db("branches as branches").where("branches.id", opts.id);
  qb.where((w) => opts.scope(w));
  const row = await withPeopleCount(db, qb).first();
  return row ? toRow(row) : undefined;
}

async function refuseDuplicates(
  trx: Knex.Transaction,
  organisationId: number,
  fields: { name?: string; code?: string },
  exceptId?: number,
) {
  if (fields.code !== undefined) {
    const q = trx("branches").where({ organisation_id: organisationId }).whereRaw("upper(code) = ?", [fields.code.toUpperCase()]);
    if (exceptId) q.whereNot("id", exceptId);
    if (await q.first("id")) throw new RecordConflictError(`Another branch already uses the code ${fields.code}`, "code");
  }
  if (fields.name !== undefined) {
    const q = trx("branches").where({ organisation_id: organisationId }).whereRaw("lower(name) = ?", [fields.name.toLowerCase()]);
    if (exceptId) q.whereNot("id", exceptId);
    if (await q.first("id")) throw new RecordConflictError(`Another branch is already called ${fields.name}`, "name");
  }
}

/** Opens a branch in the actor's organisation. */
export async function createBranch(db: Knex, opts: { actor: ActorRef; input: BranchInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    await refuseDuplicates(trx, actor.organisationId, { name: input.name, code: input.code });
    const [row] = await trx("branches")
      .insert({
        organisation_id: actor.organisationId,
        name: input.name,
        code: input.code,
        address: input.address || null,
        time_zone: input.timeZone,
        mass_unit: input.massUnit,
        country: input.country,
        region: normalRegion(input.country, input.region),
        created_at: at,
        archived_at: null,
      })
      .returning("id");
    const id = rowId(row);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: id,
      action: "branch.created",
      subjectType: "Branch",
      subjectId: id,
      summary: `Opened the branch ${input.name} (${input.code}), in ${placeWords({ country: input.country, region: normalRegion(input.country, input.region) })}, time zone ${input.timeZone}, amounts in ${MASS_DISPLAY_UNIT_LABELS[input.massUnit]}`,
      data: { after: input },
      at,
    });
    return id;
  });
}

const FIELD_WORDS: Record<string, string> = {
  name: "name",
  address: "address",
  time_zone: "time zone",
  mass_unit: "unit",
  country: "country",
  region: "state or region",
};

/** Renames, moves, changes the unit of, archives or brings back a branch of the actor's organisation. */
export async function updateBranch(db: Knex, opts: { actor: ActorRef; id: number; input: BranchUpdate; now?: Date }): Promise<void> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const current = await trx("branches").where({ id: opts.id, organisation_id: actor.organisationId }).first();
    if (!current) throw new RecordNotFoundError("No such branch");
    if (input.name !== undefined && input.name !== current.name)
      await refuseDuplicates(trx, actor.organisationId, { name: input.name }, opts.id);

    const next: Record<string, unknown> = {};
    if (input.name !== undefined && input.name !== current.name) next.name = input.name;
    if (input.address !== undefined && (input.address || null) !== (current.address ?? null)) next.address = input.address || null;
    if (input.timeZone !== undefined && input.timeZone !== current.time_zone) next.time_zone = input.timeZone;
    if (input.massUnit !== undefined && input.massUnit !== current.mass_unit) next.mass_unit = input.massUnit;
    const country = input.country ?? current.country;
    if (input.country !== undefined && input.country !== current.country) next.country = input.country;
    if (input.region !== undefined || next.country !== undefined) {
      const region = normalRegion(country, input.region === undefined ? current.region : input.region);
      if (country === "US" && (region === null || !US_REGION_CODES.includes(region)))
        throw new InvalidInputError("Choose the state the branch is in", "region");
      if (region !== (current.region ?? null)) next.region = region;
    }
    const archiving = input.archived === true && !current.archived_at;
    const restoring = input.archived === false && Boolean(current.archived_at);
    if (archiving) next.archived_at = at;
    if (restoring) next.archived_at = null;
    if (Object.keys(next).length === 0) return;

    await trx("branches").where({ id: opts.id }).update(next);

    const before: Record<string, unknown> = {};
    for (const key of Object.keys(next)) before[key] = current[key] ?? null;
    const changes = Object.keys(next)
      .filter((k) => k in FIELD_WORDS)
      .map((k) => `${FIELD_WORDS[k]} from ${String(before[k] ?? "none")} to ${String(next[k] ?? "none")}`);
    const parts: string[] = [];
    if (changes.length) parts.push(`Changed the branch ${current.name}: ${changes.join("; ")}`);
    if (archiving) parts.push(`Archived the branch ${next.name ?? current.name}; its records stay in past audits`);
    if (restoring) parts.push(`Brought back the branch ${next.name ?? current.name}`);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: opts.id,
      action: archiving ? "branch.archived" : restoring ? "branch.restored" : "branch.updated",
      subjectType: "Branch",
      subjectId: opts.id,
      summary: parts.join(". "),
      data: { before, after: next },
      at,
    });
  });
}
