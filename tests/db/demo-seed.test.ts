import { createHash } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runAudit } from "@coldtrail/core";
import { DEMO_PASSWORD, DEMO_SIGN_INS, loadBranchRecords, loadDemoData, verifyPassword, type Knex } from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";

let a: TestDb;
let b: TestDb;
let db: Knex;

beforeAll(async () => {
  a = await createTestDb();
  b = await createTestDb();
  await loadDemoData(a.db);
  await loadDemoData(b.db);
  db = a.db;
});
afterAll(async () => {
  await a.destroy();
  await b.destroy();
});

const TABLES = [
  "users",
  "appliances",
  "jobs",
  "cylinders",
  "refrigerant_movements",
  "reclaim_shipments",
  "purchases",
  "certifications",
  "activity",
];

async function fingerprint(d: Knex) {
  const counts: Record<string, number> = {};
  for (const table of TABLES) counts[table] = Number((await d(table).count({ n: "*" }).first())?.n);
  const hash = createHash("sha256");
  hash.update(JSON.stringify(await d("users").orderBy("id").select("id", "email", "name", "password_hash")));
  hash.update(JSON.stringify(await d("appliances").orderBy("id").select("id", "tag", "refrigerant", "full_charge_g", "status", "site_id")));
  hash.update(
    JSON.stringify(
      await d("jobs")
        .orderBy("id")
        .select(
          "id",
          "appliance_id",
          "technician_id",
          "kind",
          "performed_on",
          "recovered_g",
          "charged_g",
          "cylinder_id",
          "equipment_id",
          "created_at",
        ),
    ),
  );
  hash.update(
    JSON.stringify(await d("cylinders").orderBy("id").select("id", "serial", "contents_g", "refrigerant", "last_requalified_on")),
  );
  hash.update(JSON.stringify(await d("activity").orderBy("id").select("id", "at", "summary")));
  return { counts, checksum: hash.digest("hex") };
}

const one = async (q: Knex.QueryBuilder) => {
  const rows = await q;
  expect(rows).toHaveLength(1);
  return rows[0];
};
const jobsOn = (tag: string) =>
  db("jobs as j").join("appliances as a", "a.id", "j.appliance_id").join("branches as b", "b.id", "j.branch_id").where("a.tag", tag);

describe("the demo seed", () => {
  it("is deterministic: two seeds give the same rows", async () => {
    const [x, y] = [await fingerprint(a.db), await fingerprint(b.db)];
    expect(x).toEqual(y);
    expect(x.counts.jobs).toBeGreaterThan(1500);
    expect(x.counts.appliances).toBeGreaterThan(300);
  });

  it("refuses to load into a database that already holds data", async () => {
    await expect(loadDemoData(a.db)).rejects.toThrow(/already holds data/);
  });

  it("has one company with four US branches in different states and time zones, one branch in the EU, and a second company", async () => {
    const orgs = await db("organisations").orderBy("id").pluck("name");
    expect(orgs).toEqual(["Kestrelmoor Climate Services", "Quillfield Refrigeration"]);
    const branches = await db("branches")
      .where({ organisation_id: 1 })
      .orderBy("id")
      .select("code", "time_zone", "mass_unit", "address", "country", "region");
    const us = branches.filter((r) => r.country === "US");
    expect(us.map((r) => r.time_zone)).toEqual(["America/New_York", "America/Phoenix", "America/Denver", "America/Chicago"]);
    expect(new Set(us.map((r) => r.address.match(/, ([A-Z]{2}) \d{5}$/)?.[1])).size).toBe(4);
    // The region of a US branch is its state, the one in its address.
    for (const r of us) expect(r.address).toMatch(new RegExp(`, ${r.region} \\d{5}$`));
    expect(branches.filter((r) => r.mass_unit === "kg").map((r) => r.code)).toEqual(["DEN", "RTM"]);
    const eu = branches.filter((r) => r.country !== "US");
    expect(eu).toEqual([expect.objectContaining({ code: "RTM", country: "NL", time_zone: "Europe/Amsterdam", mass_unit: "kg" })]);
    const euAppliances = await db("appliances")
      .where({ branch_id: db("branches").where({ code: "RTM" }).select("id") })
      .count({ n: "*" })
      .first();
    expect(Number(euAppliances?.n)).toBe(3);
    expect(await db("branches").where({ organisation_id: 2 }).pluck("code")).toEqual(["BOI"]);
    expect(await db("branches").where({ organisation_id: 2 }).pluck("country")).toEqual(["US"]);
  });

  it("has a technician who works in two branches, with a card awaiting verification", async () => {
    const rows = await db("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .join("branches as b", "b.id", "m.branch_id")
      .where({ "m.role": "technician", "u.name": "Diego Castellanos-Reyes" })
      .orderBy("b.code")
      .pluck("b.code");
    expect(rows).toEqual(["PIA", "TUC"]);
    const cards = await db("certifications as c")
      .join("users as u", "u.id", "c.user_id")
      .where("u.name", "Diego Castellanos-Reyes")
      .pluck("c.state");
    expect(cards).toEqual(["pending"]);
  });

  it("has people in all five roles, on .example addresses, all with the demo password", async () => {
    const roles: Array<{ role: string; n: number }> = await db("memberships")
      .where({ organisation_id: 1 })
      .select("role")
      .count({ n: "*" })
      .groupBy("role");
    const byRole = Object.fromEntries(roles.map((r) => [r.role, Number(r.n)]));
    expect(byRole.owner).toBe(1);
    expect(byRole.compliance_officer).toBe(2);
    expect(byRole.branch_manager).toBe(5);
    expect(byRole.inspector).toBe(1);
    expect(byRole.technician).toBeGreaterThanOrEqual(12);
    const people = await db("users").where({ organisation_id: 1 }).count({ n: "*" }).first();
    expect(Number(people?.n)).toBe(27);
    const emails = await db("users").pluck("email");
    expect(emails.every((e: string) => e.endsWith(".example") && e === e.toLowerCase())).toBe(true);
    const hashes = new Set(await db("users").pluck("password_hash"));
    expect(hashes.size).toBe(1);
    expect(await verifyPassword(DEMO_PASSWORD, [...hashes][0] as string)).toBe(true);
    expect(await verifyPassword("wrong-password", [...hashes][0] as string)).toBe(false);
    for (const email of Object.values(DEMO_SIGN_INS)) expect(emails).toContain(email);
  });

  it("has appliances of every category, including a low-pressure chiller", async () => {
    const cats = await db("appliances").distinct("category").pluck("category");
    expect(cats.sort()).toEqual([
      "chiller",
      "commercial_refrigeration",
      "industrial_process",
      "packaged_rooftop",
      "residential_split",
      "small_appliance",
    ]);
    expect(
      await db("appliances").whereIn("refrigerant", ["R-123", "R-1233zd(E)"]).where({ category: "chiller" }).count({ n: "*" }).first(),
    ).toMatchObject({ n: 2 });
  });

  it("keeps every cylinder's contents equal to its movements, except where Peoria shipments went unrecorded", async () => {
    const rows = await db("cylinders as c")
      .leftJoin("refrigerant_movements as m", "m.cylinder_id", "c.id")
      .groupBy("c.id", "c.serial", "c.contents_g")
      .select("c.serial", "c.contents_g")
      .select(
        db.raw(
          "coalesce(sum(case when m.direction = 'recovered_into_cylinder' then m.mass_g when m.direction in ('shipped_for_reclaim', 'charged_from_cylinder') then -m.mass_g else 0 end), 0) as ledger",
        ),
      );
    const off = rows.filter((r) => Number(r.ledger) !== Number(r.contents_g)).map((r) => r.serial);
    expect(off.length).toBeGreaterThan(0);
    expect(off.every((s: string) => s.startsWith("PIA-C-0"))).toBe(true);
  });
});

describe("planted gaps (packages/db/README.md, Demo data)", () => {
  it("G01: a Type I-only technician recovered from a rooftop unit", async () => {
    const job = await one(
      jobsOn("COL-RTU-901").join("users as u", "u.id", "j.technician_id").select("j.kind", "u.id as tech", "a.category"),
    );
    expect(job).toMatchObject({ kind: "recovery", category: "packaged_rooftop" });
    const types = await db("certifications as c")
      .join("certification_types as t", "t.certification_id", "c.id")
      .where({ "c.user_id": job.tech, "c.state": "verified" })
      .pluck("t.type");
    expect(types).toEqual(["type_i"]);
  });

  it("G02: a technician with only a pending card logged a recovery", async () => {
    const job = await one(jobsOn("TUC-RES-902").where("j.kind", "recovery").select("j.technician_id"));
    const states = await db("certifications").where({ user_id: job.technician_id }).pluck("state");
    expect(states).toEqual(["pending"]);
  });

  it("G03: a small appliance was disposed of with no disposal statement", async () => {
    const job = await one(jobsOn("DEN-SA-903").select("j.kind", "a.id", "a.status", "a.category"));
    expect(job).toMatchObject({ kind: "disposal", status: "disposed", category: "small_appliance" });
    expect(await db("disposal_statements").where({ appliance_id: job.id })).toEqual([]);
  });

  it("G04: a 5–50 lb appliance was disposed of with no disposal record", async () => {
    const job = await one(jobsOn("COL-RES-904").select("j.kind", "a.id", "a.full_charge_g"));
    expect(job.kind).toBe("disposal");
    expect(job.full_charge_g / 453.59237).toBeGreaterThan(5);
    expect(job.full_charge_g / 453.59237).toBeLessThan(50);
    expect(await db("disposal_records").where({ appliance_id: job.id })).toEqual([]);
  });

  it("G05: TUC-C-905 holds more than 90 % of its water capacity", async () => {
    const c = await one(db("cylinders").where({ serial: "TUC-C-905" }));
    expect(c.contents_g / c.water_capacity_g).toBeGreaterThan(0.9);
    const others = await db("cylinders").whereNot({ serial: "TUC-C-905" }).whereRaw("contents_g > water_capacity_g * 0.5");
    expect(others).toEqual([]);
  });

  it("G06: PIA-C-906, last requalified in 2020, was used after its five years ran out", async () => {
    const c = await one(db("cylinders").where({ serial: "PIA-C-906", status: "in_service" }));
    expect(c.last_requalified_on).toBe("2020-02-18");
    const dates = await db("jobs").where({ cylinder_id: c.id }).orderBy("performed_on").pluck("performed_on");
    expect(dates).toEqual(["2025-09-23", "2026-05-12"]);
  });

  it("G07: COL-C-907 received two refrigerants", async () => {
    const c = await one(db("cylinders").where({ serial: "COL-C-907" }));
    const refrigerants = await db("refrigerant_movements").where({ cylinder_id: c.id }).orderBy("moved_on").pluck("refrigerant");
    expect(refrigerants).toEqual(["R-410A", "R-22"]);
  });

  it("G08: TUC-RACK-908 had 23 % of its charge added and no repair", async () => {
    const jobs = await jobsOn("TUC-RACK-908").select("j.kind", "j.charged_g", "a.full_charge_g", "a.category");
    expect(jobs.map((j) => j.kind)).toEqual(["charge"]);
    expect(jobs[0].category).toBe("commercial_refrigeration");
    expect(jobs[0].charged_g / jobs[0].full_charge_g).toBeGreaterThan(0.2);
  });

  it("G09: DEN-RACK-909 was repaired but never verified", async () => {
    const jobs = await jobsOn("DEN-RACK-909").orderBy("j.performed_on").select("j.kind", "j.charged_g", "a.full_charge_g");
    expect(jobs.map((j) => j.kind)).toEqual(["charge", "leak_repair"]);
    expect(jobs[0].charged_g / jobs[0].full_charge_g).toBeGreaterThan(0.2);
  });

  it("G10: PIA-RACK-910 had 130 % of its full charge added in 2025", async () => {
    const rows = await jobsOn("PIA-RACK-910")
      .where("j.kind", "charge")
      .whereBetween("j.performed_on", ["2025-01-01", "2025-12-31"])
      .select("j.charged_g", "a.full_charge_g");
    const added = rows.reduce((s, r) => s + r.charged_g, 0);
    expect(added / rows[0].full_charge_g).toBeGreaterThanOrEqual(1.25);
    const verified = await jobsOn("PIA-RACK-910")
      .where("j.kind", "verification_test")
      .where("j.verification_passed", true)
      .count({ n: "*" })
      .first();
    expect(Number(verified?.n)).toBe(10);
  });

  it("G11: only 4 in Hg reached on the 650 lb R-134a chiller COL-CH-911, with post-1993 certified equipment", async () => {
    const job = await one(
      jobsOn("COL-CH-911")
        .join("recovery_equipment as e", "e.id", "j.equipment_id")
        .select(
          "j.evacuation_value",
          "j.evacuation_unit",
          "a.full_charge_g",
          "a.refrigerant",
          "e.manufactured_on",
          "e.certification_state",
        ),
    );
    expect(job).toMatchObject({
      evacuation_value: 4,
      evacuation_unit: "in_hg_vacuum",
      refrigerant: "R-134a",
      certification_state: "certified",
    });
    expect(job.full_charge_g / 453.59237).toBeGreaterThanOrEqual(200);
    expect(job.manufactured_on > "1993-11-15").toBe(true);
  });

  it("G12: the temporary line tap on TUC-SA-912 was left in place — the only such job", async () => {
    const left = await db("jobs as j")
      .join("appliances as a", "a.id", "j.appliance_id")
      .whereIn("j.access_method", ["piercing_pliers", "bolt_on_line_tap"])
      .where("j.temporary_access_removed", false)
      .pluck("a.tag");
    expect(left).toEqual(["TUC-SA-912"]);
  });

  it("G13: DEN-SA-913 recovered 57 % with the compressor off and no 4 in Hg vacuum", async () => {
    const job = await one(
      jobsOn("DEN-SA-913")
        .where("j.kind", "recovery")
        .select("j.recovered_g", "j.compressor_operating", "j.evacuation_value", "a.full_charge_g"),
    );
    expect(job.recovered_g / job.full_charge_g).toBeLessThan(0.8);
    expect(job.compressor_operating).toBe(0);
    expect(job.evacuation_value).toBeLessThan(4);
  });

  it("G14: PIA-RE-914 was never certified and was used", async () => {
    const e = await one(db("recovery_equipment").where({ serial: "PIA-RE-914", certification_state: "not_certified" }));
    const tags = await db("jobs as j").join("appliances as a", "a.id", "j.appliance_id").where("j.equipment_id", e.id).pluck("a.tag");
    expect(tags).toEqual(["PIA-RES-914"]);
  });

  it("G15: a Tucson job used a Denver cylinder, and a Columbus job used equipment missing from the register", async () => {
    const job = await one(
      jobsOn("TUC-RES-915")
        .where("j.kind", "recovery")
        .join("cylinders as c", "c.id", "j.cylinder_id")
        .select("j.branch_id", "c.branch_id as cylinder_branch", "c.serial"),
    );
    expect(job.serial).toBe("DEN-C-915");
    expect(job.cylinder_branch).not.toBe(job.branch_id);
    const e = await one(db("recovery_equipment").where({ serial: "RE-UNREG-925", unregistered: true }));
    const tags = await db("jobs as j").join("appliances as a", "a.id", "j.appliance_id").where("j.equipment_id", e.id).pluck("a.tag");
    expect(tags).toEqual(["COL-RES-925"]);
  });

  it("G16: Peoria's recovered refrigerant is not all shipped or on hand; other branches balance within 3 kg", async () => {
    const balance = async (code: string) => {
      const branch = await db("branches").where({ code }).first("id");
      const sum = async (direction: string) =>
        Number((await db("refrigerant_movements").where({ branch_id: branch.id, direction }).sum({ g: "mass_g" }).first())?.g ?? 0);
      const onHand = Number((await db("cylinders").where({ branch_id: branch.id }).sum({ g: "contents_g" }).first())?.g ?? 0);
      return (await sum("recovered_into_cylinder")) - (await sum("shipped_for_reclaim")) - onHand;
    };
    expect(await balance("PIA")).toBeGreaterThan(20_000);
    for (const code of ["COL", "TUC", "DEN", "BOI"]) expect(Math.abs(await balance(code))).toBeLessThanOrEqual(3_000);
  });

  it("plants no uncovered technician besides G01 and G02 in the US branches", async () => {
    const rows = await db("jobs as j")
      .join("appliances as a", "a.id", "j.appliance_id")
      .join("branches as b", "b.id", "j.branch_id")
      .where("b.country", "US")
      // Carbon dioxide is exempt from section 608 (40 CFR 82.154(a)(1)): the CO2 rack is checked below.
      .whereNot("a.refrigerant", "R-744")
      .whereNotExists(
        db("certifications as c")
          .join("certification_types as t", "t.certification_id", "c.id")
          .whereRaw("c.user_id = j.technician_id")
          .where("c.state", "verified")
          .where((w) =>
            w
              .where("t.type", "universal")
              .orWhere((x) => x.where("a.category", "small_appliance").where("t.type", "type_i"))
              .orWhere((x) => x.whereIn("a.refrigerant", ["R-123", "R-1233zd(E)"]).where("t.type", "type_iii"))
              .orWhere((x) =>
                x
                  .whereNot("a.category", "small_appliance")
                  .whereNotIn("a.refrigerant", ["R-123", "R-1233zd(E)"])
                  .where("t.type", "type_ii"),
              ),
          ),
      )
      .distinct("a.tag")
      .pluck("a.tag");
    expect(rows.sort()).toEqual(["COL-RTU-901", "TUC-RES-902"]);
  });

  it("has a CO2 rack repaired by a technician without Type II, which raises no finding", async () => {
    const rack = await db("appliances").where({ tag: "COL-RACK-930" }).first("id", "branch_id", "refrigerant");
    expect(rack.refrigerant).toBe("R-744");
    const repair = await db("jobs as j")
      .join("users as u", "u.id", "j.technician_id")
      .where({ "j.appliance_id": rack.id })
      .first("j.id", "j.kind", "u.email");
    expect(repair).toMatchObject({ kind: "leak_repair", email: "caleb.runyon@kestrelmoor.example" });
    const period = { from: "2024-12-01", to: "2026-11-30" };
    const loaded = await loadBranchRecords(db, {
      organisationId: 1,
      branchId: Number(rack.branch_id),
      period,
      asOf: "2026-11-30T17:00:00Z",
    });
    const findings = runAudit(loaded.records, { packs: ["us_federal"], period, asOf: "2026-11-30T17:00:00Z" });
    const about = findings.filter(
      (f) =>
        (f.recordType === "appliance" && f.recordId === Number(rack.id)) || (f.recordType === "job" && f.recordId === Number(repair.id)),
    );
    expect(about).toEqual([]); // Source: 40 CFR 82.154(a)(1) (CO2 exempt in any application; REFERENCE.md §6.1 [S30])
  });
});
