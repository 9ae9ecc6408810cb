import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { defineAbilityFor, equipmentInput, equipmentListQuery, equipmentUpdateInput, requiredEvacuation } from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  attachEquipmentEvidence,
  createEquipment,
  getEquipment,
  getEquipmentEvidenceKey,
  listAmendments,
  listEquipment,
  loadActor,
  scopeByAbility,
  updateEquipment,
  type Knex,
  type QueryScope,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

let t: TestDb;
let actor: { userId: number; organisationId: number };
let scope: QueryScope;
let columbus: number;
const count = async (db: Knex, table: string) => Number((await db(table).count({ n: "*" }).first())!.n);

beforeAll(async () => {
  t = await createSeededTestDb();
  const manager = await loadActor(t.db, Number((await t.db("users").where({ email: DEMO_SIGN_INS.branch_manager }).first("id")).id));
  actor = { userId: manager!.userId, organisationId: manager!.organisationId };
  scope = scopeByAbility(defineAbilityFor(manager!), "read", "RecoveryEquipment", "recovery_equipment");
  columbus = Number((await t.db("branches").where({ code: "COL" }).first("id")).id);
}, 120_000);
afterAll(async () => {
  await t?.destroy();
});

const edit = async (id: number, over: Record<string, unknown>) => {
  const e = await t.db("recovery_equipment").where({ id }).first();
  return equipmentUpdateInput.parse({
    serial: e.serial,
    makeModel: e.make_model ?? "",
    manufacturedOn: e.manufactured_on ?? "",
    certificationState: e.certification_state,
    certifiedBy: e.certified_by ?? "",
    smallApplianceOnly: Boolean(e.small_appliance_only),
    systemDependent: Boolean(e.system_dependent),
    status: e.status,
    ...over,
  });
};

describe("recovery equipment register", () => {
  it("adds a unit; its manufacture date decides which evacuation column it claims", async () => {
    const id = await createEquipment(t.db, {
      actor,
      input: equipmentInput.parse({
        branchId: columbus,
        serial: "REG-RE-77",
        makeModel: "Invented Draw 9",
        manufacturedOn: "1992-06-01",
        certificationState: "certified",
      }),
    });
    const e = (await getEquipment(t.db, { scope, id }))!;
    expect(e).toMatchObject({
      serial: "REG-RE-77",
      era: "before_1993_11_15",
      certificationState: "certified",
      hasEvidence: false,
      evidenceType: null,
    });
    // 40 CFR 82.156 Table 1: medium pressure under 200 lb — 4 in Hg before 15 Nov 1993, 10 in Hg after.
    expect(
      requiredEvacuation({
        pressureClass: "medium",
        fullChargeG: 20_000,
        equipmentManufacturedOn: e.manufacturedOn,
        smallAppliance: false,
      }),
    ).toMatchObject({ level: { value: 4 } });
    const undated = await createEquipment(t.db, {
      actor,
      input: equipmentInput.parse({ branchId: columbus, serial: "REG-RE-78", certificationState: "unknown" }),
    });
    // Unknown date counts as the later, stricter column (rules core convention).
    expect((await getEquipment(t.db, { scope, id: undated }))!.era).toBe("on_or_after_1993_11_15");
  });

  it("refuses a duplicate serial and writes nothing", async () => {
    const before = await count(t.db, "recovery_equipment");
    await expect(
      createEquipment(t.db, {
        actor,
        input: equipmentInput.parse({ branchId: columbus, serial: "reg-re-77", certificationState: "unknown" }),
      }),
    ).rejects.toMatchObject({ code: "conflict", field: "serial" });
    expect(await count(t.db, "recovery_equipment")).toBe(before);
  });

  it("a new certification status needs a reason and is kept as an amendment; a new status is plain", async () => {
    const id = Number((await t.db("recovery_equipment").where({ serial: "REG-RE-78" }).first("id")).id);
    await expect(updateEquipment(t.db, { actor, id, input: await edit(id, { certificationState: "certified" }) })).rejects.toMatchObject({
      field: "reason",
    });
    const res = await updateEquipment(t.db, {
      actor,
      id,
      input: await edit(id, { certificationState: "certified", certifiedBy: "Invented Test Lab", reason: "Label photographed" }),
    });
    expect(res.changed.sort()).toEqual(["certification_state", "certified_by"]);
    const history = await listAmendments(t.db, { organisationId: actor.organisationId, subjectType: "RecoveryEquipment", subjectId: id });
    expect(history[0]).toMatchObject({
      previous: { certification_state: "unknown", certified_by: null },
      next: { certification_state: "certified", certified_by: "Invented Test Lab" },
    });
    const retired = await updateEquipment(t.db, { actor, id, input: await edit(id, { status: "retired" }) });
    expect(retired).toEqual({ amendmentId: null, changed: ["status"] });
  });

  it("records evidence under the server's key and keeps the previous key in the history", async () => {
    const id = Number((await t.db("recovery_equipment").where({ serial: "REG-RE-77" }).first("id")).id);
    await attachEquipmentEvidence(t.db, { actor, id, fileKey: "equipment/1/x/first.png", mime: "image/png", bytes: 100 });
    await attachEquipmentEvidence(t.db, { actor, id, fileKey: "equipment/1/x/second.pdf", mime: "application/pdf", bytes: 200 });
    expect(await getEquipmentEvidenceKey(t.db, { organisationId: actor.organisationId, id })).toBe("equipment/1/x/second.pdf");
    expect((await getEquipment(t.db, { scope, id }))!.evidenceType).toBe("pdf");
    const rows = await t
      .db("activity")
      .where({ subject_type: "RecoveryEquipment", subject_id: id, action: "recovery_equipment.evidence_attached" })
      .orderBy("id");
    expect(rows.map((r) => JSON.parse(r.data).previousKey)).toEqual([null, "equipment/1/x/first.png"]);
    expect(await getEquipmentEvidenceKey(t.db, { organisationId: 2, id })).toBeNull();
  });

  it("lists by certification status within the scope (demo gap G14 is the uncertified unit)", async () => {
    const owner = await loadActor(t.db, Number((await t.db("users").where({ email: DEMO_SIGN_INS.owner }).first("id")).id));
    const ownerScope = scopeByAbility(defineAbilityFor(owner!), "read", "RecoveryEquipment", "recovery_equipment");
    const uncertified = await listEquipment(t.db, {
      scope: ownerScope,
      query: equipmentListQuery.parse({ certificationState: "not_certified", pageSize: 200 }),
    });
    expect(uncertified.rows.map((r) => r.serial)).toContain("PIA-RE-914");
    expect(uncertified.rows.every((r) => r.certificationState === "not_certified")).toBe(true);
    const mine = await listEquipment(t.db, { scope, query: equipmentListQuery.parse({ pageSize: 200 }) });
    expect(mine.rows.every((r) => r.branchId === columbus)).toBe(true);
    expect(mine.rows.map((r) => r.serial)).not.toContain("PIA-RE-914");
    const sorted = await listEquipment(t.db, {
      scope,
      query: equipmentListQuery.parse({ sort: "manufacturedOn", dir: "desc", pageSize: 200 }),
    });
    const dates = sorted.rows.map((r) => r.manufacturedOn ?? "");
    expect(dates.filter(Boolean)).toEqual([...dates.filter(Boolean)].sort().reverse());
  });
});
