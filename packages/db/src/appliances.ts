import type { Knex } from "knex";

export interface ApplianceRef {
  id: number;
  organisationId: number;
  branchId: number;
  refrigerant: string;
  status: string;
}

/**
 * Where an appliance belongs, for permission checks before a write. Only looks inside the given
 * organisation, so another organisation's appliance is simply not found.
 */
export async function getApplianceRef(db: Knex, opts: { organisationId: number; id: number }): Promise<ApplianceRef | undefined> {
  const row = await db("appliances")
    .where({ id: opts.id, organisation_id: opts.organisationId })
    .first("id", "organisation_id", "branch_id", "refrigerant", "status");
  if (!row) return undefined;
  return {
    id: Number(row.id),
    organisationId: Number(row.organisation_id),
    branchId: Number(row.branch_id),
    refrigerant: row.refrigerant,
    status: row.status,
  };
}
