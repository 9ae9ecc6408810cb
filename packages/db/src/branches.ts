import type { Knex } from "knex";
import type { MassDisplayUnit } from "@coldtrail/core";

export interface BranchSummary {
  id: number;
  name: string;
  code: string;
  address: string | null;
  timeZone: string;
  massUnit: MassDisplayUnit;
  country: string;
  region: string | null;
  archivedAt: string | null;
}

/** The organisation's branches by name; archived ones only when asked for. */
export async function listBranches(db: Knex, opts: { organisationId: number; includeArchived?: boolean }): Promise<BranchSummary[]> {
  const q = db("branches").where({ organisation_id: opts.organisationId });
  if (!opts.includeArchived) q.whereNull("archived_at");
  const rows = await q.orderBy([{ column: "name" }, { column: "id" }]).select("*");
  return rows.map((r) => ({
    id: Number(r.id),
    name: r.name,
    code: r.code,
    address: r.address ?? null,
    timeZone: r.time_zone,
    massUnit: r.mass_unit as MassDisplayUnit,
    country: r.country,
    region: r.region ?? null,
    archivedAt: r.archived_at ?? null,
  }));
}
