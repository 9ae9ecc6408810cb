import type { Knex } from "@coldtrail/db";

const AT = "2026-01-01T00:00:00.000Z";

/**
 * A hand-made organisation for the job, disposal, shipment and purchase tests: two branches, a
 * technician (Type II, verified) and a manager in NORTH, appliances of every size band, cylinders
 * and recovery equipment in each branch. Invented names only.
 */
export async function jobsFixture(db: Knex) {
  const id = async (table: string, row: Record<string, unknown>): Promise<number> => {
    const [r] = await db(table).insert(row).returning("id");
    return Number(r.id);
  };
  const org = await id("organisations", { name: "Fixture Cooling", created_at: AT });
  const otherOrg = await id("organisations", { name: "Elsewhere Cooling", created_at: AT });
  const branch = (organisation_id: number, code: string, mass_unit: string) =>
    id("branches", {
      organisation_id,
      name: code,
      code,
      address: `1 ${code} Yard, Fixtureville`,
      time_zone: "America/Chicago",
      mass_unit,
      created_at: AT,
    });
  const north = await branch(org, "NORTH", "lb_oz");
  const south = await branch(org, "SOUTH", "kg");
  const away = await branch(otherOrg, "AWAY", "lb_oz");
  const user = async (name: string, email: string, branchId: number, role: string, organisation_id = org) => {
    const u = await id("users", { organisation_id, email, name, password_hash: "x", active: true, created_at: AT });
    await id("memberships", { organisation_id, user_id: u, branch_id: branchId, role, created_at: AT });
    return u;
  };
  const tech = await user("Fixture Tech", "tech@fixture.example", north, "technician");
  const manager = await user("Fixture Manager", "manager@fixture.example", north, "branch_manager");
  const cert = await id("certifications", {
    organisation_id: org,
    user_id: tech,
    certifying_organisation: "Invented Exam Board",
    certificate_number: "F-1",
    state: "verified",
    uploaded_at: AT,
    updated_at: AT,
  });
  await db("certification_types").insert({ certification_id: cert, organisation_id: org, type: "type_ii" });

  const customer = await id("customers", { organisation_id: org, branch_id: north, name: "Birchwood Grocers", created_at: AT });
  const site = await id("sites", {
    organisation_id: org,
    branch_id: north,
    customer_id: customer,
    name: "Birchwood store",
    address: "12 Birch Rd, Fixtureville",
    created_at: AT,
  });
  const southSite = await id("sites", { organisation_id: org, branch_id: south, name: "South shop", created_at: AT });
  const awaySite = await id("sites", { organisation_id: otherOrg, branch_id: away, name: "Away site", created_at: AT });
  const appliance = (branch_id: number, site_id: number, tag: string, extra: Record<string, unknown>, organisation_id = org) =>
    id("appliances", {
      organisation_id,
      branch_id,
      site_id,
      tag,
      description: tag,
      category: "packaged_rooftop",
      refrigerant: "R-410A",
      full_charge_g: 9000,
      created_at: AT,
      updated_at: AT,
      ...extra,
    });
  const cylinder = (organisation_id: number, branch_id: number, serial: string, extra: Record<string, unknown> = {}) =>
    id("cylinders", {
      organisation_id,
      branch_id,
      serial,
      water_capacity_g: 22680,
      tare_g: 7938,
      last_requalified_on: "2024-05-01",
      created_at: AT,
      updated_at: AT,
      ...extra,
    });
  const equipment = (organisation_id: number, branch_id: number, serial: string) =>
    id("recovery_equipment", {
      organisation_id,
      branch_id,
      serial,
      manufactured_on: "2021-03-01",
      certification_state: "certified",
      created_at: AT,
      updated_at: AT,
    });

  return {
    org,
    otherOrg,
    north,
    south,
    away,
    tech,
    manager,
    site,
    /** 9 kg R-410A rooftop unit (between 5 and 50 lb). */
    rooftop: await appliance(north, site, "RTU-07", {}),
    /** 100 lb R-22 walk-in: a commercial-refrigeration appliance under the leak-repair rule. */
    walkIn: await appliance(north, site, "WALK-01", { category: "commercial_refrigeration", refrigerant: "R-22", full_charge_g: 45359 }),
    /** 280 g R-134a fridge: a small appliance. */
    fridge: await appliance(north, site, "FRIDGE-01", {
      category: "small_appliance",
      refrigerant: "R-134a",
      full_charge_g: 280,
      factory_sealed: true,
    }),
    /** Retired units waiting at the shop. */
    retiredSmall: await appliance(north, site, "SHOP-SA-1", {
      category: "small_appliance",
      refrigerant: "R-134a",
      full_charge_g: 200,
      factory_sealed: true,
      status: "retired",
      retired_on: "2025-12-01",
      awaiting_disposal_at_shop: true,
    }),
    retiredSplit: await appliance(north, site, "SHOP-RES-1", {
      category: "residential_split",
      refrigerant: "R-410A",
      full_charge_g: 3600,
      status: "retired",
      retired_on: "2025-12-01",
      awaiting_disposal_at_shop: true,
    }),
    southAppliance: await appliance(south, southSite, "RTU-S1", {}),
    awayAppliance: await appliance(away, awaySite, "RTU-A1", {}, otherOrg),
    northCylinder: await cylinder(org, north, "C-0142"),
    northCylinder2: await cylinder(org, north, "C-0143"),
    northR22Cylinder: await cylinder(org, north, "C-0200", { refrigerant: "R-22", contents_g: 5000 }),
    southCylinder: await cylinder(org, south, "C-0300"),
    northEquipment: await equipment(org, north, "RE-N1"),
    southEquipment: await equipment(org, south, "RE-S1"),
  };
}

export type JobsFixture = Awaited<ReturnType<typeof jobsFixture>>;

/** Row counts of the tables a write touches, to prove a refused write wrote nothing. */
export async function writeCounts(db: Knex) {
  const n = async (table: string) => Number((await db(table).count({ n: "*" }).first())?.n);
  return {
    jobs: await n("jobs"),
    movements: await n("refrigerant_movements"),
    activity: await n("activity"),
    amendments: await n("amendments"),
    disposalRecords: await n("disposal_records"),
    statements: await n("disposal_statements"),
    shipments: await n("reclaim_shipments"),
    purchases: await n("purchases"),
  };
}

export async function contentsOf(db: Knex, cylinderId: number): Promise<{ contents_g: number; refrigerant: string | null }> {
  const c = await db("cylinders").where({ id: cylinderId }).first("contents_g", "refrigerant");
  return { contents_g: Number(c.contents_g), refrigerant: c.refrigerant ?? null };
}
