import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { subject } from "@casl/ability";
import { defineAbilityFor, type AppAbility } from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  canOnCertification,
  createCertification,
  getCertificationRef,
  listCertifications,
  listImports,
  loadActor,
  scopeByAbility,
  type CertificationRef,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

/**
 * Certification cards belong to people, not branches: branch roles reach a card through the
 * branches its holder works in. The list scope must agree with the record-level check, card by card,
 * for every role of both organisations; and the actions on cards and imports go to the right roles.
 */

let t: TestDb;
let refs: CertificationRef[];

async function who(email: string) {
  const user = await t.db("users").where({ email }).first("id");
  const actor = (await loadActor(t.db, Number(user.id)))!;
  return { actor, ability: defineAbilityFor(actor, new Date("2026-12-01T12:00:00Z")) };
}

async function listedIds(ability: AppAbility, actorUserId: number): Promise<number[]> {
  const ids: number[] = [];
  for (let page = 1; ; page++) {
    const res = await listCertifications(t.db, {
      scope: scopeByAbility(ability, "read", "Certification", "certifications"),
      query: { page, pageSize: 100, sort: "uploadedAt", dir: "asc", mine: false },
      actorUserId,
    });
    ids.push(...res.rows.map((r) => r.id));
    if (res.rows.length < 100) break;
  }
  return ids.sort((a, b) => a - b);
}

beforeAll(async () => {
  t = await createSeededTestDb();
  // A card of a person who works in no branch as a technician (an officer's own card).
  const officer = await who(DEMO_SIGN_INS.compliance_officer);
  await createCertification(t.db, {
    actor: { userId: officer.actor.userId, organisationId: officer.actor.organisationId },
    input: { types: ["universal"], certifyingOrganisation: "Harrow Ridge Testing Council", certificateNumber: "OFF-1" },
    card: { fileKey: "certifications/x/off.pdf", mime: "application/pdf", thumbnailKey: null },
  });
  const rows = await t.db("certifications").whereNull("voided_at").select("id", "organisation_id");
  refs = [];
  for (const r of rows) refs.push((await getCertificationRef(t.db, { organisationId: Number(r.organisation_id), id: Number(r.id) }))!);
}, 120_000);

afterAll(async () => {
  await t?.destroy();
});

describe("certification list scope agrees with the record-level permission", () => {
  for (const [role, email] of Object.entries(DEMO_SIGN_INS)) {
    it(`${role}: listed exactly when readable`, async () => {
      const { actor, ability } = await who(email);
      const listed = await listedIds(ability, actor.userId);
      const readable = refs
        .filter((r) => canOnCertification(ability, "read", r))
        .map((r) => r.id)
        .sort((a, b) => a - b);
      expect(listed).toEqual(readable);
      if (role !== "other_org_manager") expect(readable.length).toBeGreaterThan(0);
    });
  }

  it("a technician reads only their own cards; another organisation's people read none of ours", async () => {
    const tech = await who(DEMO_SIGN_INS.technician);
    const listed = new Set(await listedIds(tech.ability, tech.actor.userId));
    expect(refs.filter((r) => listed.has(r.id)).every((r) => r.userId === tech.actor.userId)).toBe(true);
    for (const email of [DEMO_SIGN_INS.other_org_manager, DEMO_SIGN_INS.other_org_technician]) {
      const other = await who(email);
      const theirs = new Set(await listedIds(other.ability, other.actor.userId));
      expect(refs.filter((r) => theirs.has(r.id)).every((r) => r.organisationId === other.actor.organisationId)).toBe(true);
    }
  });

  it("a branch manager reads the cards of their branch's technicians only, not the officer's own card", async () => {
    const manager = await who(DEMO_SIGN_INS.branch_manager);
    const branchId = manager.actor.memberships.find((m) => m.role === "branch_manager")!.branchId!;
    const listed = new Set(await listedIds(manager.ability, manager.actor.userId));
    const inList = refs.filter((r) => listed.has(r.id));
    expect(inList.length).toBeGreaterThan(0);
    expect(inList.every((r) => r.branchIds.includes(branchId))).toBe(true);
    expect(inList.some((r) => r.branchIds.length === 0)).toBe(false);
  });
});

describe("who may do what to a card", () => {
  const pendingOf = (userId: number) => refs.find((r) => r.userId === userId && r.state === "pending");

  it("the compliance officer and the owner verify; a branch manager, a technician and another organisation cannot", async () => {
    const card = refs.find((r) => r.state === "pending" && r.organisationId === 1 && r.branchIds.length > 0)!;
    expect(card, "a pending card in the demo data").toBeTruthy();
    expect(canOnCertification((await who(DEMO_SIGN_INS.compliance_officer)).ability, "verify", card)).toBe(true);
    expect(canOnCertification((await who(DEMO_SIGN_INS.owner)).ability, "verify", card)).toBe(true);
    expect(canOnCertification((await who(DEMO_SIGN_INS.branch_manager)).ability, "verify", card)).toBe(false);
    expect(canOnCertification((await who(DEMO_SIGN_INS.technician)).ability, "verify", card)).toBe(false);
    expect(canOnCertification((await who(DEMO_SIGN_INS.inspector)).ability, "verify", card)).toBe(false);
    expect(canOnCertification((await who("beatrix.holloway@quillfield-refrigeration.example")).ability, "verify", card)).toBe(false);
  });

  it("a technician uploads only their own card and corrects it only while it awaits verification", async () => {
    const tech = await who(DEMO_SIGN_INS.technician);
    const { organisationId, userId } = tech.actor;
    expect(tech.ability.can("create", subject("Certification", { organisationId, userId }))).toBe(true);
    const colleague = await t.db("users").where({ email: "yusuf.okonkwo-hale@kestrelmoor.example" }).first("id");
    expect(tech.ability.can("create", subject("Certification", { organisationId, userId: Number(colleague.id) }))).toBe(false);
    const own = refs.find((r) => r.userId === userId)!;
    expect(canOnCertification(tech.ability, "update", { ...own, state: "pending" })).toBe(true);
    expect(canOnCertification(tech.ability, "update", { ...own, state: "verified" })).toBe(false);
    const pending = pendingOf((await t.db("users").where({ email: "diego.castellanos-reyes@kestrelmoor.example" }).first("id")).id);
    expect(pending, "the Tucson technician's pending card").toBeTruthy();
    expect(canOnCertification(tech.ability, "update", pending!)).toBe(false);
    expect(canOnCertification(tech.ability, "read", pending!)).toBe(false);
  });
});

describe("who may import", () => {
  it("a branch manager imports into their own branch only; the officer reads; technicians and inspectors cannot", async () => {
    const manager = await who(DEMO_SIGN_INS.branch_manager);
    const own = manager.actor.memberships.find((m) => m.role === "branch_manager")!.branchId!;
    const other = Number((await t.db("branches").where({ organisation_id: 1 }).whereNot({ id: own }).first("id")).id);
    const org = manager.actor.organisationId;
    expect(manager.ability.can("create", subject("Import", { organisationId: org, branchId: own }))).toBe(true);
    expect(manager.ability.can("create", subject("Import", { organisationId: org, branchId: other }))).toBe(false);
    expect(manager.ability.can("create", subject("Appliance", { organisationId: org, branchId: own }))).toBe(true);
    const officer = await who(DEMO_SIGN_INS.compliance_officer);
    expect(officer.ability.can("read", subject("Import", { organisationId: org, branchId: own }))).toBe(true);
    expect(officer.ability.can("create", subject("Import", { organisationId: org, branchId: own }))).toBe(false);
    for (const email of [DEMO_SIGN_INS.technician, DEMO_SIGN_INS.inspector]) {
      const person = await who(email);
      expect(person.ability.can("create", "Import")).toBe(false);
    }
    const owner = await who(DEMO_SIGN_INS.owner);
    expect(owner.ability.can("create", subject("Import", { organisationId: org, branchId: other }))).toBe(true);
    const stranger = await who(DEMO_SIGN_INS.other_org_manager);
    expect(stranger.ability.can("create", subject("Import", { organisationId: org, branchId: own }))).toBe(false);
  });

  it("import lists are scoped: nothing from another branch or organisation", async () => {
    const manager = await who(DEMO_SIGN_INS.branch_manager);
    const own = manager.actor.memberships.find((m) => m.role === "branch_manager")!.branchId!;
    const other = Number((await t.db("branches").where({ organisation_id: 1 }).whereNot({ id: own }).first("id")).id);
    const at = new Date().toISOString();
    const base = {
      organisation_id: 1,
      kind: "appliances",
      state: "mapping",
      file_key: "imports/x.csv",
      file_format: "csv",
      file_label: "x.csv",
      file_size: 10,
      headings: "[]",
      sample: "[]",
      created_by: manager.actor.userId,
      created_at: at,
      updated_at: at,
    };
    await t.db("imports").insert([
      { ...base, branch_id: own },
      { ...base, branch_id: other },
    ]);
    const list = await listImports(t.db, {
      scope: scopeByAbility(manager.ability, "read", "Import", "imports"),
      query: { page: 1, pageSize: 50 },
    });
    expect(list.rows.length).toBeGreaterThan(0);
    expect(list.rows.every((r) => r.branchId === own)).toBe(true);
    const tech = await who(DEMO_SIGN_INS.technician);
    expect(
      (await listImports(t.db, { scope: scopeByAbility(tech.ability, "read", "Import", "imports"), query: { page: 1, pageSize: 50 } }))
        .total,
    ).toBe(0);
    const stranger = await who(DEMO_SIGN_INS.other_org_manager);
    expect(
      (await listImports(t.db, { scope: scopeByAbility(stranger.ability, "read", "Import", "imports"), query: { page: 1, pageSize: 50 } }))
        .total,
    ).toBe(0);
  });
});
