import type { Knex } from "@coldtrail/db";

const AT = "2026-01-01T00:00:00.000Z";

/** A small hand-made organisation: two branches, a technician, an appliance, cylinders and equipment in each. */
export async function smallFixture(db: Knex) {
  const id = async (table: string, row: Record<string, unknown>): Promise<number> => {
    const [r] = await db(table).insert(row).returning("id");
    return Number(r.id);
  };
  const org = await id("organisations", { name: "Fixture Cooling", created_at: AT });
  const otherOrg = await id("organisations", { name: "Elsewhere Cooling", created_at: AT });
  const branch = (organisation_id: number, code: string, mass_unit: string) =>
    id("branches", { organisation_id, name: code, code, time_zone: "America/Chicago", mass_unit, created_at: AT });
  const north = await branch(org, "NORTH", "lb_oz");
  const south = await branch(org, "SOUTH", "kg");
  const away = await branch(otherOrg, "AWAY", "lb_oz");
  const tech = await id("users", {
    organisation_id: org,
    email: "tech@fixture.example",
    name: "Fixture Tech",
    password_hash: "x",
    active: true,
    created_at: AT,
  });
  await id("memberships", { organisation_id: org, user_id: tech, branch_id: north, role: "technician", created_at: AT });
  const site = (organisation_id: number, branch_id: number) => id("sites", { organisation_id, branch_id, name: "Site", created_at: AT });
  const appliance = async (organisation_id: number, branch_id: number, tag: string) =>
    id("appliances", {
      organisation_id,
      branch_id,
      site_id: await site(organisation_id, branch_id),
      tag,
      description: "Packaged rooftop unit",
      category: "packaged_rooftop",
      refrigerant: "R-410A",
      full_charge_g: 9000,
      created_at: AT,
      updated_at: AT,
    });
  const cylinder = (organisation_id: number, branch_id: number, serial: string, extra: Record<string, unknown> = {}) =>
    id("cylinders", {
      organisation_id,
      branch_id,
      serial,
      water_capacity_g: 22680,
      tare_g: 7938,
      created_at: AT,
      updated_at: AT,
      ...extra,
    });
  const equipment = (organisation_id: number, branch_id: number, serial: string) =>
    id("recovery_equipment", { organisation_id, branch_id, serial, certification_state: "certified", created_at: AT, updated_at: AT });
  return {
    org,
    otherOrg,
    north,
    south,
    away,
    tech,
    northAppliance: await appliance(org, north, "RTU-07"),
    southAppliance: await appliance(org, south, "RTU-S1"),
    awayAppliance: await appliance(otherOrg, away, "RTU-A1"),
    northCylinder: await cylinder(org, north, "C-0142"),
    northR22Cylinder: await cylinder(org, north, "C-0200", { refrigerant: "R-22", contents_g: 1000 }),
    southCylinder: await cylinder(org, south, "C-0300"),
    northEquipment: await equipment(org, north, "RE-N1"),
    southEquipment: await equipment(org, south, "RE-S1"),
  };
}
