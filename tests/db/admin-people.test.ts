import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { personAccessInput } from "@coldtrail/core";
import {
  ActionForbiddenError,
  RecordConflictError,
  acceptInvitation,
  createInvitation,
  findUserForSignIn,
  getPerson,
  listPeople,
  listPersonCertifications,
  loadActor,
  scopeByAbility,
  setPersonActive,
  updateBranch,
  updatePersonAccess,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";
import { MANAGER_COL, OFFICER, OTHER_OWNER, OWNER, TECH_COL, branchId, count, lastActivity, signedIn, userId } from "./admin-fixture";

let t: TestDb;
beforeEach(async () => {
  t = await createSeededTestDb();
});
afterEach(async () => {
  await t.destroy();
});

const query = { page: 1, pageSize: 200, sort: "name" as const, dir: "asc" as const };

async function peopleAs(email: string, extra: Record<string, unknown> = {}) {
  const { ability } = await signedIn(t.db, email);
  return listPeople(t.db, { scope: scopeByAbility(ability, "read", "User", "pb"), query: { ...query, ...extra } });
}

describe("people list", () => {
  it("the owner sees every person of the organisation, with roles and branches, and nobody from another", async () => {
    const page = await peopleAs(OWNER);
    const inOrg = await count(t.db, "users", { organisation_id: 1 });
    expect(page.total).toBe(inOrg);
    expect(page.rows.every((p) => p.organisationId === 1)).toBe(true);
    const grant = page.rows.find((p) => p.email === MANAGER_COL)!;
    expect(grant.roles).toEqual(["branch_manager"]);
    expect(grant.branches.map((b) => b.code)).toEqual(["COL"]);
    expect(grant.status).toBe("active");
  });

  it("a branch manager sees only the people of their branch", async () => {
    const page = await peopleAs(MANAGER_COL);
    const col = await branchId(t.db, "COL");
    expect(page.total).toBeGreaterThan(2);
    for (const p of page.rows) expect(p.branches.map((b) => b.id)).toContain(col);
    expect(page.rows.some((p) => p.roles.includes("owner"))).toBe(false);
  });

  it("a technician and the inspector are given nobody by the scope", async () => {
    expect((await peopleAs(TECH_COL)).total).toBe(0);
    expect((await peopleAs("harold.penwick@statewide-review.example")).total).toBe(0);
  });

  it("pages, sorts and filters on the server", async () => {
    const first = await peopleAs(OWNER, { pageSize: 5 });
    const second = await peopleAs(OWNER, { pageSize: 5, page: 2 });
    expect(first.rows).toHaveLength(5);
    expect(second.rows[0]!.name >= first.rows[4]!.name).toBe(true);
    const techsInDenver = await peopleAs(OWNER, { role: "technician", branchId: await branchId(t.db, "DEN") });
    expect(techsInDenver.total).toBeGreaterThan(0);
    expect(techsInDenver.rows.every((p) => p.roles.includes("technician") && p.branches.some((b) => b.code === "DEN"))).toBe(true);
    const search = await peopleAs(OWNER, { q: "oyelaran" });
    expect(search.rows.map((p) => p.email)).toEqual([MANAGER_COL]);
  });

  it("one person from another organisation is not found", async () => {
    const { ability } = await signedIn(t.db, OWNER);
    const other = await userId(t.db, OTHER_OWNER);
    expect(await getPerson(t.db, { scope: scopeByAbility(ability, "read", "User", "pb"), id: other })).toBeUndefined();
  });
});

describe("changing roles and branches", () => {
  it("replaces a technician's memberships and records who changed what", async () => {
    const { actor } = await signedIn(t.db, OWNER);
    const tech = await userId(t.db, TECH_COL);
    const [col, den] = [await branchId(t.db, "COL"), await branchId(t.db, "DEN")];
    await updatePersonAccess(t.db, {
      actor,
      id: tech,
      input: personAccessInput.parse({ roles: ["branch_manager", "technician"], branchIds: [col, den] }),
    });
    const loaded = await loadActor(t.db, tech);
    expect(loaded!.memberships.map((m) => `${m.role}:${m.branchId}`).sort()).toEqual(
      [`branch_manager:${col}`, `branch_manager:${den}`, `technician:${col}`, `technician:${den}`].sort(),
    );
    const act = await lastActivity(t.db);
    expect(act).toMatchObject({ action: "person.access_changed", actor_id: actor.userId, subject_type: "User", subject_id: tech });
    expect(act.summary).toContain("from Technician (Columbus) to Branch manager (Columbus, Denver), Technician (Columbus, Denver)");
  });

  it("refuses a branch of another organisation and writes nothing", async () => {
    const { actor } = await signedIn(t.db, OWNER);
    const tech = await userId(t.db, TECH_COL);
    const boise = await branchId(t.db, "BOI", 2);
    const before = { m: await count(t.db, "memberships"), a: await count(t.db, "activity") };
    await expect(updatePersonAccess(t.db, { actor, id: tech, input: { roles: ["technician"], branchIds: [boise] } })).rejects.toMatchObject(
      {
        code: "invalid",
        field: "branchIds",
      },
    );
    expect({ m: await count(t.db, "memberships"), a: await count(t.db, "activity") }).toEqual(before);
  });

  it("refuses to add anyone to an archived branch", async () => {
    const { actor } = await signedIn(t.db, OWNER);
    const pia = await branchId(t.db, "PIA");
    await updateBranch(t.db, { actor, id: pia, input: { archived: true } });
    await expect(
      updatePersonAccess(t.db, { actor, id: await userId(t.db, TECH_COL), input: { roles: ["technician"], branchIds: [pia] } }),
    ).rejects.toMatchObject({ code: "conflict", field: "branchIds" });
  });

  it("nobody raises their own role or adds a branch to themselves", async () => {
    const owner = await signedIn(t.db, OWNER);
    const col = await branchId(t.db, "COL");
    const err = await updatePersonAccess(t.db, {
      actor: owner.actor,
      id: owner.actor.userId,
      input: { roles: ["owner", "technician"], branchIds: [col] },
    }).catch((e) => e);
    expect(err).toBeInstanceOf(ActionForbiddenError);
    expect(err.message).toMatch(/cannot raise your own role/);

    const officer = await signedIn(t.db, OFFICER);
    await expect(
      updatePersonAccess(t.db, { actor: officer.actor, id: officer.actor.userId, input: { roles: ["owner"], branchIds: [] } }),
    ).rejects.toBeInstanceOf(ActionForbiddenError);
    expect((await loadActor(t.db, officer.actor.userId))!.memberships.map((m) => m.role)).toEqual(["compliance_officer"]);
  });

  it("nobody gives a role above their own", async () => {
    const officer = await signedIn(t.db, OFFICER);
    await expect(
      updatePersonAccess(t.db, { actor: officer.actor, id: await userId(t.db, TECH_COL), input: { roles: ["owner"], branchIds: [] } }),
    ).rejects.toMatchObject({ code: "forbidden", message: "You cannot give a role above your own" });
  });

  it("the last owner keeps the owner role and stays active; with a second owner the first may step down", async () => {
    const owner = await signedIn(t.db, OWNER);
    const stepDown = () =>
      updatePersonAccess(t.db, { actor: owner.actor, id: owner.actor.userId, input: { roles: ["compliance_officer"], branchIds: [] } });
    const err = await stepDown().catch((e) => e);
    expect(err).toBeInstanceOf(RecordConflictError);
    expect(err.message).toContain("is the last owner");

    // An invited owner who has not set a password does not count: they cannot sign in yet.
    const invited = await createInvitation(t.db, {
      actor: owner.actor,
      input: { email: "second.owner@kestrelmoor.example", name: "Second Owner", roles: ["owner"], branchIds: [] },
    });
    await expect(stepDown()).rejects.toBeInstanceOf(RecordConflictError);

    await acceptInvitation(t.db, {
      input: { token: invited.token, name: "Second Owner", password: "a-long-password", confirmPassword: "a-long-password" },
    });
    await stepDown();
    expect((await loadActor(t.db, owner.actor.userId))!.memberships.map((m) => m.role)).toEqual(["compliance_officer"]);

    // Now the second owner is the last one: nobody can deactivate them, and they cannot deactivate themselves.
    const second = await signedIn(t.db, "second.owner@kestrelmoor.example");
    await expect(setPersonActive(t.db, { actor: second.actor, id: second.actor.userId, active: false })).rejects.toBeInstanceOf(
      ActionForbiddenError,
    );
    await expect(
      updatePersonAccess(t.db, { actor: second.actor, id: second.actor.userId, input: { roles: ["compliance_officer"], branchIds: [] } }),
    ).rejects.toMatchObject({ code: "conflict" });
  });
});

describe("deactivating", () => {
  it("stops sign-in at once and keeps the person's records; letting them back in restores it", async () => {
    const { actor } = await signedIn(t.db, OWNER);
    const tech = await userId(t.db, TECH_COL);
    const jobs = await count(t.db, "jobs", { technician_id: tech });
    expect(jobs).toBeGreaterThan(0);

    await setPersonActive(t.db, { actor, id: tech, active: false });
    expect(await loadActor(t.db, tech)).toBeUndefined();
    expect((await findUserForSignIn(t.db, TECH_COL))!.active).toBe(false);
    expect(await count(t.db, "jobs", { technician_id: tech })).toBe(jobs);
    expect(await lastActivity(t.db)).toMatchObject({ action: "person.deactivated", actor_id: actor.userId, subject_id: tech });
    await expect(setPersonActive(t.db, { actor, id: tech, active: false })).rejects.toBeInstanceOf(RecordConflictError);

    await setPersonActive(t.db, { actor, id: tech, active: true });
    expect(await loadActor(t.db, tech)).toBeDefined();
    expect(await lastActivity(t.db)).toMatchObject({ action: "person.reactivated" });
  });

  it("a person of another organisation cannot be touched", async () => {
    const { actor } = await signedIn(t.db, OWNER);
    await expect(setPersonActive(t.db, { actor, id: await userId(t.db, OTHER_OWNER), active: false })).rejects.toMatchObject({
      code: "not_found",
    });
  });
});

describe("a technician's certifications", () => {
  it("are read in the holder's branches: their manager and the officer see them, another branch's manager does not", async () => {
    const kai = await userId(t.db, "kai.lindqvist@kestrelmoor.example");
    const certsAs = async (email: string) => {
      const { ability } = await signedIn(t.db, email);
      return listPersonCertifications(t.db, { scope: scopeByAbility(ability, "read", "Certification", "pb"), userId: kai });
    };
    const seen = await certsAs(OFFICER);
    expect(seen.map((c) => c.state).sort()).toEqual(["rejected", "verified"]);
    expect(seen.find((c) => c.state === "rejected")!.rejectionReason).toBeTruthy();
    expect(seen.every((c) => c.types.length > 0)).toBe(true);
    expect(await certsAs("henrik.solvang@kestrelmoor.example")).toHaveLength(2);
    expect(await certsAs(MANAGER_COL)).toHaveLength(0);
    expect(await certsAs(TECH_COL)).toHaveLength(0);
  });
});
