import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { jobDraftInput } from "@coldtrail/core";
import { checkJobDraftForActor, type Knex } from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

/** The instant feedback on the demo data, with each technician's certifications as recorded. */

let t: TestDb;
beforeAll(async () => {
  t = await createSeededTestDb();
}, 120_000);
afterAll(async () => {
  await t?.destroy();
});

async function actorOf(db: Knex, email: string) {
  const u = await db("users").where({ email }).first("id", "organisation_id");
  return { userId: Number(u.id), organisationId: Number(u.organisation_id) };
}
const idOf = async (table: string, where: Record<string, unknown>) => Number((await t.db(table).where(where).first("id")).id);
const counts = async () => {
  const n = async (table: string) => Number((await t.db(table).count({ n: "*" }).first())?.n);
  return [await n("jobs"), await n("refrigerant_movements"), await n("activity")];
};

describe("checking a job draft against the demo registers", () => {
  it("the medium-pressure chiller needs 15 in Hg with the branch's 2021 recovery unit; 4 in Hg is named, and nothing is written", async () => {
    const before = await counts();
    const actor = await actorOf(t.db, "marcus.delacroix-byrd@kestrelmoor.example");
    const draft = jobDraftInput.parse({
      kind: "recovery",
      applianceId: await idOf("appliances", { tag: "COL-CH-911" }),
      equipmentId: await idOf("recovery_equipment", { serial: "COL-RE-02" }),
      recoveredAmount: "",
      evacuationValue: "4",
      evacuationUnit: "in_hg_vacuum",
    });
    const r = await checkJobDraftForActor(t.db, { actor, draft });
    // Source: 40 CFR 82.156 Table 1 — medium-pressure, ≥ 200 lb, equipment made after 15 Nov 1993: 15 in Hg
    expect(r.warnings.map((w) => w.message)).toEqual(["This appliance needs 15 in Hg vacuum with this equipment; 4 in Hg entered."]);
    expect(r.evacuationRequired).toBe("15 in Hg vacuum");
    expect(await counts()).toEqual(before);
  });

  it("a Type I-only technician hears that the rooftop unit is not covered", async () => {
    const actor = await actorOf(t.db, "caleb.runyon@kestrelmoor.example");
    const draft = jobDraftInput.parse({ kind: "recovery", applianceId: await idOf("appliances", { tag: "COL-RTU-901" }) });
    const r = await checkJobDraftForActor(t.db, { actor, draft });
    // Source: 40 CFR 82.161 — Type II or Universal for high-pressure appliances
    expect(r.warnings.map((w) => w.ruleId)).toEqual(["CT-CERT-01"]);
    expect(r.warnings[0]!.message).toMatch(
      /^Your Type I certification does not cover this high-pressure appliance: Type II or Universal is needed\./,
    );
  });

  it("a technician with only a pending card hears that it does not count yet", async () => {
    const actor = await actorOf(t.db, "diego.castellanos-reyes@kestrelmoor.example");
    const draft = jobDraftInput.parse({
      kind: "charge",
      applianceId: await idOf("appliances", { tag: "TUC-RES-902" }),
      chargedAmount: "abc",
    });
    const r = await checkJobDraftForActor(t.db, { actor, draft });
    expect(r.warnings[0]).toMatchObject({ ruleId: "CT-CERT-01" });
    expect(r.warnings[0]!.message).toContain("You hold no verified certification");
    expect(r.warnings[0]!.message).toContain("awaiting verification");
  });

  it("without an appliance there is nothing to judge; another organisation's appliance is not found", async () => {
    const actor = await actorOf(t.db, "marcus.delacroix-byrd@kestrelmoor.example");
    expect((await checkJobDraftForActor(t.db, { actor, draft: jobDraftInput.parse({ kind: "recovery" }) })).warnings).toEqual([]);
    const foreign = await t.db("appliances").whereNot({ organisation_id: actor.organisationId }).first("id");
    await expect(
      checkJobDraftForActor(t.db, { actor, draft: jobDraftInput.parse({ kind: "recovery", applianceId: foreign.id }) }),
    ).rejects.toMatchObject({ code: "not_found", field: "applianceId" });
  });
});
