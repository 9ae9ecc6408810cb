import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { certificationCardInput, certificationCorrectionInput, certificationDecisionInput, defineAbilityFor } from "@coldtrail/core";
import {
  DEMO_SIGN_INS,
  correctCertification,
  countUnreadNotifications,
  createCertification,
  decideCertification,
  getCertification,
  listCertifications,
  listNotifications,
  loadActor,
  markNotificationsRead,
  scopeByAbility,
  withdrawCertification,
  type Knex,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

let t: TestDb;

const idOf = async (db: Knex, email: string) => Number((await db("users").where({ email }).first("id")).id);
const count = async (db: Knex, table: string, where: Record<string, unknown> = {}) =>
  Number((await db(table).where(where).count({ n: "*" }).first())!.n);

async function actorOf(email: string) {
  const userId = await idOf(t.db, email);
  const actor = (await loadActor(t.db, userId))!;
  return { actor, ref: { userId: actor.userId, organisationId: actor.organisationId }, ability: defineAbilityFor(actor) };
}

const card = { fileKey: "certifications/1/test-card.jpg", mime: "image/jpeg", thumbnailKey: "certifications/1/test-card.thumb.jpg" };
const input = (number: string) =>
  certificationCardInput.parse({
    types: ["type_i", "type_ii"],
    certifyingOrganisation: "Harrow Ridge Testing Council",
    certificateNumber: number,
    issuedOn: "2019-05-04",
  });

beforeEach(async () => {
  t = await createSeededTestDb();
});
afterEach(async () => {
  await t.destroy();
});

describe("a technician uploads a certification card", () => {
  it("records it pending with its types, logs the activity and tells the compliance officers in the app", async () => {
    const tech = await actorOf(DEMO_SIGN_INS.technician);
    const officers = await t
      .db("memberships")
      .where({ organisation_id: tech.actor.organisationId, role: "compliance_officer" })
      .select("user_id");
    const before = await Promise.all(
      officers.map((o) => countUnreadNotifications(t.db, { userId: Number(o.user_id), organisationId: tech.actor.organisationId })),
    );

    const id = await createCertification(t.db, { actor: tech.ref, input: input("HR-55120"), card });
    const row = await t.db("certifications").where({ id }).first();
    expect(row).toMatchObject({
      user_id: tech.actor.userId,
      state: "pending",
      certificate_number: "HR-55120",
      card_file_key: card.fileKey,
      card_mime: "image/jpeg",
      verified_by: null,
    });
    const types = (await t.db("certification_types").where({ certification_id: id }).orderBy("type").select("type")).map((r) => r.type);
    expect(types).toEqual(["type_i", "type_ii"]);
    expect(await count(t.db, "activity", { subject_type: "Certification", subject_id: id, action: "certification.uploaded" })).toBe(1);
    const after = await Promise.all(
      officers.map((o) => countUnreadNotifications(t.db, { userId: Number(o.user_id), organisationId: tech.actor.organisationId })),
    );
    expect(after.map((n, i) => n - before[i]!)).toEqual(officers.map(() => 1));
  });

  it("refuses a second copy of a card already on file and writes nothing", async () => {
    const tech = await actorOf(DEMO_SIGN_INS.technician);
    await createCertification(t.db, { actor: tech.ref, input: input("HR-55121"), card });
    const certs = await count(t.db, "certifications");
    const activity = await count(t.db, "activity");
    await expect(createCertification(t.db, { actor: tech.ref, input: input("hr-55121"), card })).rejects.toMatchObject({
      code: "conflict",
      field: "certificateNumber",
    });
    expect(await count(t.db, "certifications")).toBe(certs);
    expect(await count(t.db, "activity")).toBe(activity);
  });

  it("Universal stands alone and an empty type list is refused by the schema", () => {
    expect(
      certificationCardInput.parse({ types: ["type_i", "universal"], certifyingOrganisation: "Harrow Ridge", certificateNumber: "A1" })
        .types,
    ).toEqual(["universal"]);
    const bad = certificationCardInput.safeParse({ types: [], certifyingOrganisation: "Harrow Ridge", certificateNumber: "A1" });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]!.path).toEqual(["types"]);
    expect(
      certificationCardInput.safeParse({ types: "type_i", certifyingOrganisation: "Harrow Ridge", certificateNumber: "../../etc" }).success,
    ).toBe(false);
  });
});

describe("the compliance officer decides", () => {
  it("verifies a pending card: state, who and when, activity, and the technician's notification", async () => {
    const tech = await actorOf(DEMO_SIGN_INS.technician);
    const officer = await actorOf(DEMO_SIGN_INS.compliance_officer);
    const id = await createCertification(t.db, { actor: tech.ref, input: input("HR-55122"), card });
    const unread = await countUnreadNotifications(t.db, { userId: tech.actor.userId, organisationId: tech.actor.organisationId });

    const result = await decideCertification(t.db, {
      actor: officer.ref,
      id,
      input: certificationDecisionInput.parse({ decision: "verify" }),
    });
    expect(result).toMatchObject({ state: "verified", holder: { email: DEMO_SIGN_INS.technician }, types: ["type_i", "type_ii"] });
    const row = await t.db("certifications").where({ id }).first();
    expect(row).toMatchObject({ state: "verified", verified_by: officer.actor.userId, rejection_reason: null });
    expect(row.verified_at).toBeTruthy();
    expect(await count(t.db, "activity", { subject_id: id, action: "certification.verified" })).toBe(1);
    expect(await countUnreadNotifications(t.db, { userId: tech.actor.userId, organisationId: tech.actor.organisationId })).toBe(unread + 1);
    const inbox = await listNotifications(t.db, {
      userId: tech.actor.userId,
      organisationId: tech.actor.organisationId,
      page: 1,
      pageSize: 5,
    });
    expect(inbox.rows[0]).toMatchObject({ kind: "certification.verified", link: `/certifications/${id}`, readAt: null });

    // Decided once: a second decision is refused.
    await expect(
      decideCertification(t.db, { actor: officer.ref, id, input: { decision: "reject", reason: "Changed my mind about it" } }),
    ).rejects.toMatchObject({ code: "conflict" });
  });

  it("does not accept a card with a reason, and the reason is required", async () => {
    const tech = await actorOf(DEMO_SIGN_INS.technician);
    const officer = await actorOf(DEMO_SIGN_INS.compliance_officer);
    const id = await createCertification(t.db, { actor: tech.ref, input: input("HR-55123"), card });
    expect(certificationDecisionInput.safeParse({ decision: "reject", reason: "" }).success).toBe(false);

    const result = await decideCertification(t.db, {
      actor: officer.ref,
      id,
      input: { decision: "reject", reason: "The certificate number is cut off in the photo." },
    });
    expect(result.state).toBe("rejected");
    expect(await t.db("certifications").where({ id }).first("state", "rejection_reason")).toEqual({
      state: "rejected",
      rejection_reason: "The certificate number is cut off in the photo.",
    });
    const inbox = await listNotifications(t.db, {
      userId: tech.actor.userId,
      organisationId: tech.actor.organisationId,
      page: 1,
      pageSize: 5,
    });
    expect(inbox.rows[0]!.kind).toBe("certification.rejected");
    expect(inbox.rows[0]!.body).toContain("cut off");
    // A card not accepted can be uploaded again.
    await expect(createCertification(t.db, { actor: tech.ref, input: input("HR-55123"), card })).resolves.toBeGreaterThan(id);
  });

  it("nobody verifies their own card", async () => {
    const officer = await actorOf(DEMO_SIGN_INS.compliance_officer);
    const id = await createCertification(t.db, { actor: officer.ref, input: input("HR-55124"), card });
    await expect(decideCertification(t.db, { actor: officer.ref, id, input: { decision: "verify" } })).rejects.toMatchObject({
      code: "forbidden",
    });
    expect((await t.db("certifications").where({ id }).first("state")).state).toBe("pending");
  });
});

describe("corrections are amendments with history", () => {
  it("keeps previous and next values of columns and types, with the reason", async () => {
    const tech = await actorOf(DEMO_SIGN_INS.technician);
    const officer = await actorOf(DEMO_SIGN_INS.compliance_officer);
    const id = await createCertification(t.db, { actor: tech.ref, input: input("HR-55125"), card });
    await correctCertification(t.db, {
      actor: officer.ref,
      id,
      input: certificationCorrectionInput.parse({
        reason: "Number misread from the photo",
        certificateNumber: "HR-55126",
        types: ["type_ii"],
      }),
    });
    const detail = await getCertification(t.db, { scope: scopeByAbility(officer.ability, "read", "Certification", "certifications"), id });
    expect(detail).toMatchObject({ certificateNumber: "HR-55126", types: ["type_ii"] });
    expect(detail!.amendments).toHaveLength(1);
    expect(detail!.amendments[0]).toMatchObject({
      reason: "Number misread from the photo",
      previous: { certificate_number: "HR-55125", types: ["type_i", "type_ii"] },
      next: { certificate_number: "HR-55126", types: ["type_ii"] },
      actorName: "Teodora Vasquez-Lind",
    });
    expect(await count(t.db, "activity", { subject_id: id, action: "certification.amended" })).toBe(1);
    await expect(
      correctCertification(t.db, {
        actor: officer.ref,
        id,
        input: certificationCorrectionInput.parse({ reason: "again", certificateNumber: "HR-55126" }),
      }),
    ).rejects.toMatchObject({ code: "invalid", field: "reason" });
  });

  it("a withdrawn card leaves the lists, keeps its row and cannot be corrected", async () => {
    const tech = await actorOf(DEMO_SIGN_INS.technician);
    const id = await createCertification(t.db, { actor: tech.ref, input: input("HR-55127"), card });
    await withdrawCertification(t.db, { actor: tech.ref, id, reason: "Uploaded the wrong card" });
    const mine = await listCertifications(t.db, {
      scope: scopeByAbility(tech.ability, "read", "Certification", "certifications"),
      query: { page: 1, pageSize: 100, sort: "uploadedAt", dir: "asc", mine: true },
      actorUserId: tech.actor.userId,
    });
    expect(mine.rows.map((r) => r.id)).not.toContain(id);
    expect((await t.db("certifications").where({ id }).first("voided_at")).voided_at).toBeTruthy();
    await expect(
      correctCertification(t.db, { actor: tech.ref, id, input: { reason: "fix it", certificateNumber: "X1" } }),
    ).rejects.toMatchObject({ code: "conflict" });
  });
});

describe("notifications", () => {
  it("are marked read for their owner only", async () => {
    const tech = await actorOf(DEMO_SIGN_INS.technician);
    const officer = await actorOf(DEMO_SIGN_INS.compliance_officer);
    const id = await createCertification(t.db, { actor: tech.ref, input: input("HR-55128"), card });
    await decideCertification(t.db, { actor: officer.ref, id, input: { decision: "verify" } });
    const mine = await listNotifications(t.db, {
      userId: tech.actor.userId,
      organisationId: tech.actor.organisationId,
      page: 1,
      pageSize: 5,
      unreadOnly: true,
    });
    const target = mine.rows[0]!.id;
    // Someone else's id is ignored.
    expect(
      await markNotificationsRead(t.db, { userId: officer.actor.userId, organisationId: officer.actor.organisationId, ids: [target] }),
    ).toBe(0);
    expect(await markNotificationsRead(t.db, { userId: tech.actor.userId, organisationId: tech.actor.organisationId, ids: [target] })).toBe(
      1,
    );
    const after = await listNotifications(t.db, {
      userId: tech.actor.userId,
      organisationId: tech.actor.organisationId,
      page: 1,
      pageSize: 5,
    });
    expect(after.rows.find((r) => r.id === target)!.readAt).toBeTruthy();
    expect(after.unread).toBe(mine.unread - 1);
  });
});
