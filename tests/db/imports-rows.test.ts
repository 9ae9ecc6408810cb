import { afterEach, beforeEach, describe, expect, it } from "vitest";
import {
  CsvFormatError,
  IMPORT_FIELDS,
  defineAbilityFor,
  parseCsv,
  parseImportDate,
  parseMassText,
  suggestImportMapping,
  toGrams,
  type ImportKind,
} from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  ImportFileError,
  checkImportRows,
  commitImportRows,
  createImport,
  getImport,
  listImportIssues,
  loadActor,
  scopeByAbility,
  setImportMapping,
  startImportCommit,
  type Knex,
  type RowSource,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

let t: TestDb;
const count = async (db: Knex, table: string, where: Record<string, unknown> = {}) =>
  Number((await db(table).where(where).count({ n: "*" }).first())!.n);

async function managerOfColumbus() {
  const user = await t.db("users").where({ email: DEMO_SIGN_INS.branch_manager }).first("id");
  const actor = (await loadActor(t.db, Number(user.id)))!;
  const branchId = actor.memberships.find((m) => m.role === "branch_manager")!.branchId!;
  return { actor, ref: { userId: actor.userId, organisationId: actor.organisationId }, branchId, ability: defineAbilityFor(actor) };
}

/** Rows as the app's spreadsheet reader yields them; the heading row is row 1. Optionally breaks after n rows. */
function source(rows: string[][], breakAfter?: number): RowSource {
  return {
    rows: (async function* () {
      for (const [i, cells] of rows.entries()) {
        if (breakAfter !== undefined && i >= breakAfter) throw new ImportFileError(`The file is damaged after row ${i + 1}`);
        yield { rowNumber: i + 2, cells };
      }
    })(),
    fraction: () => 0.5,
  };
}

async function startImport(kind: ImportKind, csv: string) {
  const m = await managerOfColumbus();
  const [headings, ...rows] = parseCsv(csv);
  const id = await createImport(t.db, {
    actor: m.ref,
    branchId: m.branchId,
    kind,
    file: { key: `imports/test/${kind}.csv`, format: "csv", label: `${kind}.csv`, size: csv.length },
    headings: headings!,
    sample: rows.slice(0, 5),
    mapping: suggestImportMapping(kind, headings!),
  });
  const detail = (await getImport(t.db, { scope: scopeByAbility(m.ability, "read", "Import", "imports"), id }))!;
  return { m, id, rows, detail };
}

async function checkAndCommit(
  id: number,
  m: Awaited<ReturnType<typeof managerOfColumbus>>,
  rows: string[][],
  mapping: Record<string, number | null>,
) {
  await setImportMapping(t.db, { actor: m.ref, id, mapping });
  const checked = await checkImportRows(t.db, { importId: id, actor: m.ref, source: source(rows) });
  return checked;
}

beforeEach(async () => {
  t = await createSeededTestDb();
});
afterEach(async () => {
  await t.destroy();
});

describe("pure row reading", () => {
  it("reads dates, amounts and CSV the way people write them", () => {
    expect(parseImportDate("2025-06-18")).toBe("2025-06-18");
    expect(parseImportDate("6/18/2025")).toBe("2025-06-18");
    expect(parseImportDate("45826")).toBe("2025-06-18"); // a date cell read without its format
    expect(parseImportDate("2025-02-30")).toBeNull();
    expect(parseImportDate("18.06.25")).toBeNull();
    expect(parseMassText("12.5", "lb")).toBe(toGrams(12.5, "lb"));
    expect(parseMassText("3 lb 4 oz", "kg")).toBe(toGrams(3, "lb") + toGrams(4, "oz"));
    expect(parseMassText("2,5 kg", "lb")).toBeNull();
    expect(parseMassText("1,200 g", "lb")).toBe(1200);
    expect(parseCsv('a;b\n"x;1";"say ""hi""\nthere"\n')).toEqual([
      ["a", "b"],
      ["x;1", 'say "hi"\nthere'],
    ]);
    expect(() => parseCsv('a,b\n"open,1\n')).toThrow(CsvFormatError);
  });

  it("suggests every column of the template and other usual headings", () => {
    for (const kind of ["appliances", "cylinders", "jobs"] as const) {
      const labels = IMPORT_FIELDS[kind].map((f) => f.label);
      const mapping = suggestImportMapping(kind, labels);
      expect(Object.values(mapping)).toEqual(labels.map((_, i) => i));
    }
    const mapping = suggestImportMapping("cylinders", ["Cylinder #", "WC (lb)", "TW", "Last hydro"]);
    expect(mapping).toMatchObject({ serial: 0, waterCapacity: 1, tare: 2, lastRequalifiedOn: 3, specification: null });
  });
});

describe("importing appliances", () => {
  it("checks first, then imports exactly the valid rows in one go and reports the others by row, field and why", async () => {
    const existing = await t.db("appliances as a").join("branches as b", "b.id", "a.branch_id").where("b.code", "COL").first("a.tag");
    const csv = [
      "Tag,Description,Category,Refrigerant,Full charge,Full charge unit,Site,Customer",
      "IMP-RTU-01,Rooftop unit over the bakery,Packaged rooftop,R410a,12.5,lb,Linden Row Bakery,Linden Row Foods",
      `${existing.tag},Duplicate of a registered tag,Packaged rooftop,R-410A,10,lb,Linden Row Bakery,`,
      "IMP-RTU-02,Second rooftop unit,Spaceship,R-410A,10,lb,Linden Row Bakery,",
      "IMP-SPLIT-03,Split system in the office,Residential split,R-32,2.1,kg,Linden Row Bakery,",
      "IMP-WALKIN-04,Walk-in cooler,Commercial refrigeration,R-448A,,lb,Linden Row Bakery,",
      ",,,,,,,",
      "IMP-RTU-01,Same tag again,Packaged rooftop,R-410A,8,lb,Linden Row Bakery,",
    ].join("\n");
    const { m, id, rows, detail } = await startImport("appliances", csv);
    expect(detail.state).toBe("mapping");
    expect(detail.mapping).toMatchObject({
      tag: 0,
      description: 1,
      category: 2,
      refrigerant: 3,
      fullCharge: 4,
      fullChargeUnit: 5,
      site: 6,
      customer: 7,
    });

    const appliancesBefore = await count(t.db, "appliances");
    const checked = await checkAndCommit(id, m, rows, detail.mapping!);
    expect(checked).toEqual({ state: "checked", validRows: 2, invalidRows: 4 });
    expect(await count(t.db, "appliances")).toBe(appliancesBefore); // a check writes no records

    const issues = await listImportIssues(t.db, {
      organisationId: m.actor.organisationId,
      importId: id,
      kind: "appliances",
      query: { page: 1, pageSize: 50 },
    });
    expect(issues.rows.map((i) => [i.rowNumber, i.field, i.columnLabel])).toEqual([
      [3, "tag", "Tag"],
      [4, "category", "Category"],
      [6, "fullCharge", "Full charge"],
      [8, "tag", "Tag"],
    ]);
    expect(issues.rows[0]!.message).toContain("already in the register");
    expect(issues.rows[1]).toMatchObject({ value: "Spaceship" });
    expect(issues.rows[1]!.message).toContain("not a known appliance category");
    expect(issues.rows[3]!.message).toContain("row 2 of this file");

    await startImportCommit(t.db, { actor: m.ref, id });
    const activityBefore = await count(t.db, "activity", { action: "appliance.imported" });
    const result = await commitImportRows(t.db, { importId: id, actor: m.ref, source: source(rows) });
    expect(result).toEqual({ state: "imported", importedRows: 2, invalidRows: 4 });
    expect(await count(t.db, "appliances")).toBe(appliancesBefore + 2);
    const imported = await t
      .db("appliances")
      .whereIn("tag", ["IMP-RTU-01", "IMP-SPLIT-03"])
      .orderBy("tag")
      .select("tag", "branch_id", "refrigerant", "full_charge_g", "site_id");
    expect(imported.map((a) => [a.tag, Number(a.branch_id), a.refrigerant, Number(a.full_charge_g)])).toEqual([
      ["IMP-RTU-01", m.branchId, "R-410A", toGrams(12.5, "lb")],
      ["IMP-SPLIT-03", m.branchId, "R-32", 2100],
    ]);
    expect(imported[0]!.site_id).toBe(imported[1]!.site_id); // one new site, shared
    const site = await t
      .db("sites as s")
      .join("customers as c", "c.id", "s.customer_id")
      .where("s.id", imported[0]!.site_id)
      .first("s.name", "c.name as customer");
    expect(site).toEqual({ name: "Linden Row Bakery", customer: "Linden Row Foods" });
    expect(await count(t.db, "activity", { action: "appliance.imported" })).toBe(activityBefore + 2);
    expect(await count(t.db, "activity", { subject_type: "Import", subject_id: id, action: "import.completed" })).toBe(1);
    expect(await count(t.db, "appliances", { tag: "IMP-RTU-02" })).toBe(0);

    // The same file again imports nothing twice.
    await expect(startImportCommit(t.db, { actor: m.ref, id })).rejects.toMatchObject({ code: "conflict" });
  });

  it("a file that breaks part-way writes nothing, even while writing", async () => {
    const lines = ["Tag,Description,Category,Refrigerant,Full charge,Site"];
    for (let i = 0; i < 600; i++) lines.push(`BRK-${i},Unit ${i},Packaged rooftop,R-410A,10,Harbour Lane Depot`);
    const { m, id, rows, detail } = await startImport("appliances", lines.join("\n"));
    await setImportMapping(t.db, { actor: m.ref, id, mapping: detail.mapping! });
    // Broken while checking: failed with the reason, nothing written.
    const broken = await checkImportRows(t.db, { importId: id, actor: m.ref, source: source(rows, 300) });
    expect(broken.state).toBe("failed");
    const failed = (await getImport(t.db, { scope: scopeByAbility(m.ability, "read", "Import", "imports"), id }))!;
    expect(failed.error).toMatch(/damaged after row 301.*Nothing was imported/);

    // Checked fine, then broken while writing (after more than one batch was written): rolled back.
    await setImportMapping(t.db, { actor: m.ref, id, mapping: detail.mapping! });
    expect((await checkImportRows(t.db, { importId: id, actor: m.ref, source: source(rows) })).validRows).toBe(600);
    await startImportCommit(t.db, { actor: m.ref, id });
    const appliances = await count(t.db, "appliances");
    const sites = await count(t.db, "sites");
    const activity = await count(t.db, "activity", { action: "appliance.imported" });
    const result = await commitImportRows(t.db, { importId: id, actor: m.ref, source: source(rows, 550) });
    expect(result.state).toBe("failed");
    expect(await count(t.db, "appliances")).toBe(appliances);
    expect(await count(t.db, "sites")).toBe(sites);
    expect(await count(t.db, "activity", { action: "appliance.imported" })).toBe(activity);
    expect(await t.db("imports").where({ id }).first("state", "imported_rows")).toEqual({ state: "failed", imported_rows: 0 });
  });

  it("reports progress batch by batch while it checks, for the page to poll", async () => {
    const lines = ["Tag,Description,Category,Refrigerant,Full charge,Site"];
    for (let i = 0; i < 600; i++) lines.push(`PRG-${i},Unit ${i},Packaged rooftop,R-410A,10,Harbour Lane Depot`);
    const { m, id, rows, detail } = await startImport("appliances", lines.join("\n"));
    await setImportMapping(t.db, { actor: m.ref, id, mapping: detail.mapping! });
    const seen: Array<[string, number, number]> = [];
    let read = 0;
    const progressing: RowSource = {
      rows: (async function* () {
        for (const [i, cells] of rows.entries()) {
          read = i + 1;
          yield { rowNumber: i + 2, cells };
        }
      })(),
      fraction: () => read / rows.length,
    };
    await checkImportRows(t.db, {
      importId: id,
      actor: m.ref,
      source: progressing,
      onProgress: (p) => seen.push([p.state, p.rowsRead, p.progress]),
    });
    expect(seen.map(([, r]) => r)).toEqual([250, 500, 600]);
    expect(seen.every(([state]) => state === "checking")).toBe(true);
    expect(seen.map(([, , p]) => p)).toEqual([...seen.map(([, , p]) => p)].sort((a, b) => a - b));
    expect(seen.at(-1)![2]).toBeLessThan(100); // 100 only once the import row says "checked"
    expect(await t.db("imports").where({ id }).first("state", "progress", "total_rows")).toEqual({
      state: "checked",
      progress: 100,
      total_rows: 600,
    });
  });

  it("refuses a mapping without a required column and writes nothing", async () => {
    const { m, id } = await startImport("appliances", "Tag,Description\nA-1,Something\n");
    await expect(setImportMapping(t.db, { actor: m.ref, id, mapping: { tag: 0, description: 1 } })).rejects.toMatchObject({
      code: "invalid",
      field: "mapping.category",
    });
    expect((await t.db("imports").where({ id }).first("state")).state).toBe("mapping");
    await expect(setImportMapping(t.db, { actor: m.ref, id, mapping: { tag: 0, description: 0 } })).rejects.toMatchObject({
      code: "invalid",
    });
  });
});

describe("importing cylinders and past jobs", () => {
  it("imports cylinders with their opening contents and refuses duplicate serials", async () => {
    const csv = [
      "Serial number,Specification,Water capacity,Tare weight,Unit of the weights,Last requalified on,Refrigerant held,Net contents",
      "IMP-C-01,dot 4ba400,50,17.5,lb,2023-04-02,R-410A,8.25",
      "IMP-C-02,DOT-4BW,30,14,lb,2027-01-01,,",
      "IMP-C-01,DOT-4BA400,50,17.5,lb,2023-04-02,,",
      "IMP-C-03,DOT-4BA,22.7,8,kg,,,",
    ].join("\n");
    const { m, id, rows, detail } = await startImport("cylinders", csv);
    expect(await checkAndCommit(id, m, rows, detail.mapping!)).toEqual({ state: "checked", validRows: 2, invalidRows: 2 });
    await startImportCommit(t.db, { actor: m.ref, id });
    expect((await commitImportRows(t.db, { importId: id, actor: m.ref, source: source(rows) })).importedRows).toBe(2);
    const c1 = await t.db("cylinders").where({ serial: "IMP-C-01" }).first();
    expect(c1).toMatchObject({
      specification: "DOT-4BA400",
      refrigerant: "R-410A",
      contents_g: toGrams(8.25, "lb"),
      water_capacity_g: toGrams(50, "lb"),
      branch_id: m.branchId,
    });
    const c3 = await t.db("cylinders").where({ serial: "IMP-C-03" }).first();
    expect(c3).toMatchObject({ water_capacity_g: 22700, tare_g: 8000, contents_g: 0, refrigerant: null });
    const issues = await listImportIssues(t.db, {
      organisationId: m.actor.organisationId,
      importId: id,
      kind: "cylinders",
      query: { page: 1, pageSize: 50 },
    });
    expect(issues.rows.map((i) => [i.rowNumber, i.field])).toEqual([
      [3, "lastRequalifiedOn"],
      [4, "serial"],
    ]);
  });

  it("imports past jobs with their refrigerant movements; other branches, strangers and repeats are reported", async () => {
    const m = await managerOfColumbus();
    const col = m.branchId;
    const appliance = await t
      .db("appliances")
      .where({ branch_id: col, status: "in_service", category: "packaged_rooftop" })
      .orderBy("id")
      .first("id", "tag", "refrigerant");
    const tucson = await t.db("appliances as a").join("branches as b", "b.id", "a.branch_id").where("b.code", "TUC").first("a.tag");
    const cylinder = await t
      .db("cylinders")
      .where({ branch_id: col, status: "in_service", unregistered: false, purpose: "recovery" })
      .orderBy("id")
      .first("id", "serial", "contents_g", "refrigerant");
    const equipment = await t
      .db("recovery_equipment")
      .where({ branch_id: col, status: "in_service", unregistered: false })
      .orderBy("id")
      .first("serial");
    const csv = [
      "Date,Job kind,Appliance tag,Technician,Amount recovered,Amount added,Unit of the amounts,Cylinder serial,Recovery equipment serial,Evacuation level reached,Access method",
      `2025-03-04,Recovery,${appliance.tag},${DEMO_SIGN_INS.technician},2.5,,lb,${cylinder.serial},${equipment.serial},10,Service valve`,
      `2025-03-05,Charge,${appliance.tag},Marcus Delacroix-Byrd,,1.25,lb,,,,`,
      `2025-03-06,Recovery,${tucson.tag},${DEMO_SIGN_INS.technician},1,,lb,${cylinder.serial},,,`,
      `2025-03-07,Recovery,${appliance.tag},rafael.ibarra-quint@kestrelmoor.example,1,,lb,${cylinder.serial},,,`,
      `2025-03-08,Recovery,${appliance.tag},${DEMO_SIGN_INS.technician},1,,lb,,,,`,
      `2025-03-09,Leak repair,${appliance.tag},${DEMO_SIGN_INS.technician},3,,lb,,,,`,
      `2099-01-01,Recovery,${appliance.tag},${DEMO_SIGN_INS.technician},1,,lb,${cylinder.serial},,,`,
    ].join("\n");
    const { id, rows, detail } = await startImport("jobs", csv);
    expect(await checkAndCommit(id, m, rows, detail.mapping!)).toEqual({ state: "checked", validRows: 2, invalidRows: 5 });
    const issues = await listImportIssues(t.db, {
      organisationId: m.actor.organisationId,
      importId: id,
      kind: "jobs",
      query: { page: 1, pageSize: 50 },
    });
    expect(issues.rows.map((i) => [i.rowNumber, i.field])).toEqual([
      [4, "applianceTag"],
      [5, "technician"],
      [6, "cylinderSerial"],
      [7, "recovered"],
      [8, "performedOn"],
    ]);
    expect(issues.rows[0]!.message).toContain("Tucson");
    expect(issues.rows[1]!.message).toContain("not a technician of the Columbus branch");

    await startImportCommit(t.db, { actor: m.ref, id });
    expect((await commitImportRows(t.db, { importId: id, actor: m.ref, source: source(rows) })).importedRows).toBe(2);
    const jobs = await t
      .db("jobs")
      .where({ appliance_id: appliance.id, source: "import" })
      .orderBy("performed_on")
      .select("id", "kind", "recovered_g", "charged_g", "technician_id", "created_by", "refrigerant");
    expect(jobs.map((j) => [j.kind, j.recovered_g, j.charged_g, j.technician_id, j.created_by, j.refrigerant])).toEqual([
      [
        "recovery",
        toGrams(2.5, "lb"),
        0,
        (await t.db("users").where({ email: DEMO_SIGN_INS.technician }).first("id")).id,
        m.actor.userId,
        appliance.refrigerant,
      ],
      [
        "charge",
        0,
        toGrams(1.25, "lb"),
        (await t.db("users").where({ email: DEMO_SIGN_INS.technician }).first("id")).id,
        m.actor.userId,
        appliance.refrigerant,
      ],
    ]);
    const movements = await t
      .db("refrigerant_movements")
      .whereIn(
        "job_id",
        jobs.map((j) => j.id),
      )
      .orderBy("id")
      .select("direction", "cylinder_id", "mass_g");
    expect(movements).toEqual([
      { direction: "recovered_into_cylinder", cylinder_id: cylinder.id, mass_g: toGrams(2.5, "lb") },
      { direction: "charged_from_stock", cylinder_id: null, mass_g: toGrams(1.25, "lb") },
    ]);
    expect(Number((await t.db("cylinders").where({ id: cylinder.id }).first("contents_g")).contents_g)).toBe(
      Number(cylinder.contents_g) + toGrams(2.5, "lb"),
    );
    expect(await count(t.db, "activity", { action: "job.recovery.imported" })).toBe(1);

    // The same rows again: already on record, nothing doubled.
    const again = await startImport("jobs", csv);
    expect(await checkAndCommit(again.id, m, again.rows, again.detail.mapping!)).toMatchObject({ validRows: 0 });
    const repeat = await listImportIssues(t.db, {
      organisationId: m.actor.organisationId,
      importId: again.id,
      kind: "jobs",
      query: { page: 1, pageSize: 3 },
    });
    expect(repeat.rows[0]).toMatchObject({ rowNumber: 2, field: null });
    expect(repeat.rows[0]!.message).toContain("already on record");
  });
});
