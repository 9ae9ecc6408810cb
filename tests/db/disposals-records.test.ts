import { afterEach, beforeEach, describe, expect, it } from "vitest";
import {
  disposalRecordCompleteness,
  disposalRecordInput,
  shopDisposalBatchInput,
  smallApplianceStatementCompleteness,
  type JobInput,
} from "@coldtrail/core";
import {
  amendDisposalStatement,
  createDisposalRecord,
  createDisposalStatement,
  createJob,
  createShipment,
  getDisposalRecord,
  getDisposalStatement,
  listDisposals,
  listShopQueue,
  monthlyDisposalTotals,
  recordShopDisposals,
  voidDisposal,
  type ScopeFn,
} from "@coldtrail/db";
import { createTestDb, type TestDb } from "@coldtrail/db/testing";
import { contentsOf, jobsFixture, writeCounts, type JobsFixture } from "./jobs-fixture";

let t: TestDb;
let f: JobsFixture;

beforeEach(async () => {
  t = await createTestDb();
  f = await jobsFixture(t.db);
});
afterEach(async () => {
  await t.destroy();
});

const actor = () => ({ userId: f.tech, organisationId: f.org });
const dScope = (): ScopeFn => (qb) => qb.where("d.organisation_id", f.org);
const disposalJob = (applianceId: number, over: Partial<Extract<JobInput, { kind: "disposal" }>> = {}) =>
  createJob(t.db, {
    actor: actor(),
    branchId: f.north,
    input: {
      kind: "disposal",
      applianceId,
      performedOn: "2026-04-02",
      refrigerant: "R-410A",
      recoveredAmount: 8,
      recoveredUnit: "kg",
      cylinderId: f.northCylinder,
      equipmentId: f.northEquipment,
      evacuationValue: 0,
      evacuationUnit: "psig",
      accessMethod: "service_valve",
      disposalPath: "on_site",
      ...over,
    },
  });

describe("disposal records (more than 5 and less than 50 lb)", () => {
  it("keeps the fields 82.155(c) asks for, linked to the disposal job, and is complete by the rules core", async () => {
    const jobId = await disposalJob(f.rooftop);
    const input = disposalRecordInput.parse({
      applianceId: f.rooftop,
      disposedOn: "2026-04-02",
      companyName: "Birchwood Grocers",
      applianceLocation: "12 Birch Rd, Fixtureville",
      recoveredOn: "2026-04-02",
      refrigerant: "R-410A",
      recoveredAmount: "8",
      recoveredUnit: "kg",
    });
    const id = await createDisposalRecord(t.db, { actor: actor(), input });
    const record = await getDisposalRecord(t.db, { scope: dScope(), id });
    expect(record).toMatchObject({
      jobId,
      companyName: "Birchwood Grocers",
      recoveredG: 8000,
      recoveredByName: "Fixture Tech",
      applianceTag: "RTU-07",
    });
    // Source: 40 CFR 82.155(c) — company name, location, date of recovery, refrigerant type and quantity
    expect(
      disposalRecordCompleteness({
        id,
        applianceId: f.rooftop,
        companyName: record!.companyName,
        applianceLocation: record!.applianceLocation,
        recoveredOn: record!.recoveredOn,
        refrigerant: record!.refrigerant,
        recoveredG: record!.recoveredG,
      }),
    ).toEqual({ complete: true, missing: [] });
    expect((await t.db("activity").where({ subject_type: "DisposalRecord", subject_id: id }).first()).action).toBe(
      "disposal_record.created",
    );

    // One live record per appliance.
    await expect(createDisposalRecord(t.db, { actor: actor(), input })).rejects.toMatchObject({ code: "conflict", field: "applianceId" });
  });

  it("refuses a record for an appliance still in service and writes nothing", async () => {
    const before = await writeCounts(t.db);
    const input = disposalRecordInput.parse({
      applianceId: f.walkIn,
      disposedOn: "2026-04-02",
      companyName: "X",
      applianceLocation: "Y",
      recoveredOn: "2026-04-02",
      refrigerant: "R-22",
      recoveredAmount: 1,
      recoveredUnit: "kg",
    });
    await expect(createDisposalRecord(t.db, { actor: actor(), input })).rejects.toMatchObject({ code: "conflict", field: "applianceId" });
    expect(await writeCounts(t.db)).toEqual(before);
  });

  it("the form schema names each missing field", () => {
    const r = disposalRecordInput.safeParse({
      applianceId: f.rooftop,
      disposedOn: "2026-04-02",
      recoveredOn: "2026-04-02",
      recoveredUnit: "kg",
    });
    expect(r.success).toBe(false);
    const fields = new Set(r.error!.issues.map((i) => i.path.join(".")));
    for (const field of ["companyName", "applianceLocation", "refrigerant", "recoveredAmount"]) expect(fields.has(field), field).toBe(true);
  });
});

describe("signed statements (small appliances)", () => {
  it("keeps the statement and its signed document, and a document added later is an amendment", async () => {
    await disposalJob(f.fridge, { refrigerant: "R-134a", recoveredAmount: 250, recoveredUnit: "g" });
    const id = await createDisposalStatement(t.db, {
      actor: actor(),
      input: {
        applianceId: f.fridge,
        recoveredByName: "Fixture Tech",
        recoveredByAddress: "1 NORTH Yard, Fixtureville",
        recoveredOn: "2026-04-02",
        signedByName: "Fixture Tech",
        signedOn: "2026-04-02",
      },
    });
    const s = await getDisposalStatement(t.db, { scope: dScope(), id });
    expect(s).toMatchObject({ hasDocument: false, recoveredByName: "Fixture Tech" });
    // Source: 40 CFR 82.155(b) — signed statement with name and address of who recovered, and the date
    expect(
      smallApplianceStatementCompleteness({
        id,
        applianceId: f.fridge,
        signedBy: s!.signedByName,
        signedOn: s!.signedOn,
        recoveredByName: s!.recoveredByName,
        recoveredByAddress: s!.recoveredByAddress,
        recoveredOn: s!.recoveredOn,
        contractReference: null,
      }),
    ).toEqual({ complete: true, missing: [] });

    await amendDisposalStatement(t.db, {
      actor: actor(),
      id,
      input: { reason: "Signed copy came back", changes: {} },
      document: { key: "disposal-statements/abc.pdf", mime: "application/pdf" },
    });
    const after = await getDisposalStatement(t.db, { scope: dScope(), id });
    expect(after).toMatchObject({ hasDocument: true, documentMime: "application/pdf" });
    expect(after!.amendments[0]).toMatchObject({
      reason: "Signed copy came back",
      previous: { document_file_key: null },
      next: { document_file_key: "disposal-statements/abc.pdf" },
    });
  });

  it("a voided statement leaves the default list and shows under the voided filter", async () => {
    await disposalJob(f.fridge, { refrigerant: "R-134a", recoveredAmount: 250, recoveredUnit: "g" });
    const id = await createDisposalStatement(t.db, {
      actor: actor(),
      input: {
        applianceId: f.fridge,
        recoveredByName: "A",
        recoveredByAddress: "B street",
        recoveredOn: "2026-04-02",
        signedByName: "A",
        signedOn: "2026-04-02",
      },
    });
    await voidDisposal(t.db, { actor: actor(), type: "statement", id, reason: "Wrong appliance" });
    const q = { type: "statement" as const, page: 1, pageSize: 25, sort: "date" as const, dir: "desc" as const };
    expect((await listDisposals(t.db, { scope: dScope(), query: q })).total).toBe(0);
    expect((await listDisposals(t.db, { scope: dScope(), query: { ...q, voided: "only" } })).rows.map((r) => r.id)).toEqual([id]);
  });
});

describe("monthly quantities", () => {
  it("sums refrigerant recovered from disposed 5–50 lb appliances by month and type, and lists transfers for reclaim", async () => {
    await disposalJob(f.rooftop); // 9 kg charge, in the band: 8 kg in April
    await disposalJob(f.fridge, { refrigerant: "R-134a", recoveredAmount: 250, recoveredUnit: "g", cylinderId: f.northCylinder2 }); // small appliance: outside the band
    await createShipment(t.db, {
      actor: { userId: f.manager, organisationId: f.org },
      input: {
        branchId: f.north,
        shippedOn: "2026-04-30",
        reclaimerName: "Invented Reclaim Co",
        cylinderIds: [f.northCylinder, f.northR22Cylinder],
      },
    });
    const totals = await monthlyDisposalTotals(t.db, { organisationId: f.org, branchId: f.north, year: 2026 });
    // Source: 40 CFR 82.155(c)(2)–(3) — monthly quantity by type from disposed appliances; transfers for reclamation
    expect(totals.recovered).toEqual([{ month: "2026-04", refrigerant: "R-410A", recoveredG: 8000, appliances: 1 }]);
    expect(totals.transfers.map((x) => [x.month, x.refrigerant, x.shippedG, x.reclaimer])).toEqual([
      ["2026-04", "R-22", 5000, "Invented Reclaim Co"],
      ["2026-04", "R-410A", 8000, "Invented Reclaim Co"],
    ]);
  });
});

describe("retired units scrapped at the shop", () => {
  const batch = (items: Array<Record<string, unknown>>) =>
    shopDisposalBatchInput.parse({
      performedOn: "2026-05-05",
      cylinderId: f.northCylinder,
      equipmentId: f.northEquipment,
      accessMethod: "piercing_pliers",
      temporaryAccessRemoved: true,
      confirmStatement: true,
      items,
    });

  it("records a disposal job for each unit and the statement or record each one needs", async () => {
    const queue = await listShopQueue(t.db, { scope: (qb) => qb.where("appliances.organisation_id", f.org) });
    expect(queue.map((q) => [q.tag, q.needs])).toEqual([
      ["SHOP-RES-1", "record"],
      ["SHOP-SA-1", "statement"],
    ]);
    const result = await recordShopDisposals(t.db, {
      actor: actor(),
      branchId: f.north,
      input: batch([
        {
          applianceId: f.retiredSmall,
          recoveredAmount: 190,
          recoveredUnit: "g",
          evacuationValue: 4,
          evacuationUnit: "in_hg_vacuum",
          compressorOperating: false,
        },
        { applianceId: f.retiredSplit, recoveredAmount: 3.4, recoveredUnit: "kg", evacuationValue: 0, evacuationUnit: "psig" },
      ]),
    });
    expect(result.jobIds).toHaveLength(2);
    expect(result.statementIds).toHaveLength(1);
    expect(result.recordIds).toHaveLength(1);
    expect(await contentsOf(t.db, f.northCylinder)).toEqual({ contents_g: 3590, refrigerant: "R-134a" });
    const statuses = await t.db("appliances").whereIn("id", [f.retiredSmall, f.retiredSplit]).pluck("status");
    expect(statuses).toEqual(["disposed", "disposed"]);
    const record = await t.db("disposal_records").where({ id: result.recordIds[0] }).first();
    expect(record).toMatchObject({
      disposal_path: "shop",
      company_name: "Birchwood Grocers",
      appliance_location: "1 NORTH Yard, Fixtureville",
      recovered_g: 3400,
    });
    const statement = await t.db("disposal_statements").where({ id: result.statementIds[0] }).first();
    expect(statement).toMatchObject({ recovered_by_name: "Fixture Tech", signed_by_name: "Fixture Tech", signed_on: "2026-05-05" });
    expect(await listShopQueue(t.db, { scope: (qb) => qb.where("appliances.organisation_id", f.org) })).toEqual([]);
  });

  it("is all or nothing: one unit still in service refuses the batch, naming its row", async () => {
    const before = await writeCounts(t.db);
    await expect(
      recordShopDisposals(t.db, {
        actor: actor(),
        branchId: f.north,
        input: batch([
          { applianceId: f.retiredSmall, recoveredAmount: 190, recoveredUnit: "g", evacuationValue: 4, evacuationUnit: "in_hg_vacuum" },
          { applianceId: f.walkIn, recoveredAmount: 10, recoveredUnit: "kg", evacuationValue: 0, evacuationUnit: "psig" },
        ]),
      }),
    ).rejects.toMatchObject({ code: "conflict", field: "items.1.applianceId" });
    expect(await writeCounts(t.db)).toEqual(before);
    expect((await t.db("appliances").where({ id: f.retiredSmall }).first()).status).toBe("retired");
  });
});
