import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { DEFAULT_SETTINGS, branchInput, isValidTimeZone, organisationSettingsInput } from "@coldtrail/core";
import {
  acceptInvitation,
  createBranch,
  createOrganisationWithOwner,
  describeInvitation,
  getAdminBranch,
  getOrganisationSettings,
  listAdminBranches,
  listBranches,
  loadActor,
  scopeByAbility,
  updateBranch,
  updateOrganisationSettings,
} from "@coldtrail/db";
import { createSeededTestDb, createTestDb, type TestDb } from "@coldtrail/db/testing";
import { MANAGER_COL, OTHER_OWNER, OWNER, branchId, count, lastActivity, signedIn } from "./admin-fixture";

let t: TestDb;
beforeEach(async () => {
  t = await createSeededTestDb();
});
afterEach(async () => {
  await t.destroy();
});

const NEW_BRANCH = {
  name: "Lansing",
  code: "lan",
  address: "1 Frost Lane, Lansing",
  timeZone: "America/Detroit",
  massUnit: "kg",
  country: "us",
  region: "mi",
};

describe("branch input", () => {
  it("accepts IANA zones the runtime knows and refuses offsets, abbreviations and made-up names", () => {
    for (const tz of ["America/Chicago", "America/Boise", "Europe/Berlin", "UTC"]) expect(isValidTimeZone(tz), tz).toBe(true);
    for (const tz of ["Mars/Olympus_Mons", "EST", "+01:00", "", "America/", "GMT+2"]) expect(isValidTimeZone(tz), tz).toBe(false);
    const bad = branchInput.safeParse({ ...NEW_BRANCH, timeZone: "Mars/Olympus_Mons", massUnit: "stone" });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => i.path.join("."))).toEqual(["timeZone", "massUnit"]);
    expect(branchInput.parse(NEW_BRANCH).code).toBe("LAN");
  });

  it("needs a country from ISO 3166-1, and the state of a US branch by its two-letter code", () => {
    expect(branchInput.parse(NEW_BRANCH)).toMatchObject({ country: "US", region: "mi" });
    const fields = (input: object) => {
      const r = branchInput.safeParse({ ...NEW_BRANCH, ...input });
      return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
    };
    expect(fields({ country: undefined })).toEqual(["country"]);
    expect(fields({ country: "XX" })).toEqual(["country"]);
    expect(fields({ country: "EU" })).toEqual(["country"]);
    expect(fields({ region: "" })).toEqual(["region"]);
    expect(fields({ region: "Michigan" })).toEqual(["region"]);
    // Outside the US the region is optional words.
    expect(fields({ country: "NL", region: "" })).toEqual([]);
    expect(fields({ country: "de", region: "Bavaria" })).toEqual([]);
  });
});

describe("branches", () => {
  it("the owner opens a branch; duplicates of code or name are refused; the history records it", async () => {
    const { actor } = await signedIn(t.db, OWNER);
    const id = await createBranch(t.db, { actor, input: branchInput.parse(NEW_BRANCH) });
    const row = await t.db("branches").where({ id }).first();
    expect(row).toMatchObject({
      organisation_id: 1,
      code: "LAN",
      time_zone: "America/Detroit",
      mass_unit: "kg",
      country: "US",
      region: "MI",
      archived_at: null,
    });
    expect(await lastActivity(t.db)).toMatchObject({ action: "branch.created", actor_id: actor.userId, branch_id: id, subject_id: id });

    await expect(createBranch(t.db, { actor, input: branchInput.parse({ ...NEW_BRANCH, name: "Elsewhere" }) })).rejects.toMatchObject({
      code: "conflict",
      field: "code",
    });
    await expect(
      createBranch(t.db, { actor, input: branchInput.parse({ ...NEW_BRANCH, code: "LN2", name: "lansing" }) }),
    ).rejects.toMatchObject({ code: "conflict", field: "name" });
    // Codes are per organisation: another company may use the same.
    const other = await signedIn(t.db, OTHER_OWNER);
    await createBranch(t.db, { actor: other.actor, input: branchInput.parse(NEW_BRANCH) });
  });

  it("renaming, moving and archiving are recorded; archived branches leave the pickers but stay listed and readable", async () => {
    const { actor, ability } = await signedIn(t.db, OWNER);
    const den = await branchId(t.db, "DEN");
    await updateBranch(t.db, { actor, id: den, input: { name: "Denver Metro", timeZone: "America/Denver", massUnit: "lb_oz" } });
    const act = await lastActivity(t.db);
    expect(act.action).toBe("branch.updated");
    expect(act.summary).toBe("Changed the branch Denver: name from Denver to Denver Metro; unit from kg to lb_oz");

    // Moving a branch to another country changes its place (and so its rule packs); a US place needs its state.
    await expect(updateBranch(t.db, { actor, id: den, input: { region: null } })).rejects.toMatchObject({ field: "region" });
    await updateBranch(t.db, { actor, id: den, input: { country: "DE", region: "Bavaria" } });
    expect(await t.db("branches").where({ id: den }).first("country", "region")).toEqual({ country: "DE", region: "Bavaria" });
    expect((await lastActivity(t.db)).summary).toBe(
      "Changed the branch Denver Metro: country from US to DE; state or region from CO to Bavaria",
    );
    await updateBranch(t.db, { actor, id: den, input: { country: "US", region: "co" } });
    expect(await t.db("branches").where({ id: den }).first("country", "region")).toEqual({ country: "US", region: "CO" });

    const jobs = await count(t.db, "jobs", { branch_id: den });
    await updateBranch(t.db, { actor, id: den, input: { archived: true } });
    expect(await lastActivity(t.db)).toMatchObject({ action: "branch.archived" });
    expect((await listBranches(t.db, { organisationId: 1 })).map((b) => b.id)).not.toContain(den);
    const listed = await listAdminBranches(t.db, {
      scope: scopeByAbility(ability, "read", "Branch", "branches"),
      query: { page: 1, pageSize: 25, archived: "include" },
    });
    expect(listed.rows.at(-1)).toMatchObject({ id: den, name: "Denver Metro" });
    expect(listed.rows.at(-1)!.archivedAt).not.toBeNull();
    expect(await count(t.db, "jobs", { branch_id: den })).toBe(jobs);

    await updateBranch(t.db, { actor, id: den, input: { archived: false } });
    expect(await lastActivity(t.db)).toMatchObject({ action: "branch.restored" });
    expect((await listBranches(t.db, { organisationId: 1 })).map((b) => b.id)).toContain(den);
  });

  it("a branch manager's scope holds only their branch; another organisation's branch cannot be changed", async () => {
    const { ability } = await signedIn(t.db, MANAGER_COL);
    const listed = await listAdminBranches(t.db, {
      scope: scopeByAbility(ability, "read", "Branch", "branches"),
      query: { page: 1, pageSize: 25, archived: "include" },
    });
    expect(listed.rows.map((b) => b.code)).toEqual(["COL"]);
    expect(listed.rows[0]!.peopleCount).toBeGreaterThan(1);
    expect(
      await getAdminBranch(t.db, { scope: scopeByAbility(ability, "read", "Branch", "branches"), id: await branchId(t.db, "TUC") }),
    ).toBeUndefined();

    const { actor } = await signedIn(t.db, OWNER);
    const boise = await branchId(t.db, "BOI", 2);
    await expect(updateBranch(t.db, { actor, id: boise, input: { name: "Taken Over" } })).rejects.toMatchObject({ code: "not_found" });
    expect((await t.db("branches").where({ id: boise }).first()).name).not.toBe("Taken Over");
  });
});

describe("settings", () => {
  it("start from the rules core's defaults and keep what the owner chooses, with the change in the history", async () => {
    const before = await getOrganisationSettings(t.db, 1);
    expect(before.settings).toEqual(DEFAULT_SETTINGS);
    expect(before.rulePacks).toEqual(["us_federal"]);

    const { actor } = await signedIn(t.db, OWNER);
    const input = organisationSettingsInput.parse({
      ...DEFAULT_SETTINGS,
      name: "Kestrelmoor Climate Services",
      rulePacks: ["eu", "us_federal"],
      ptTolerancePsi: "3",
      requalificationYears: "10",
      strictFill130F: true,
    });
    await updateOrganisationSettings(t.db, { actor, input });
    const after = await getOrganisationSettings(t.db, 1);
    expect(after.rulePacks).toEqual(["us_federal", "eu"]);
    expect(after.settings).toEqual({ ...DEFAULT_SETTINGS, ptTolerancePsi: 3, requalificationYears: 10, strictFill130F: true });
    const act = await lastActivity(t.db);
    expect(act).toMatchObject({ action: "settings.updated", actor_id: actor.userId });
    expect(act.summary).toContain("pressure–temperature tolerance (psi) from 5 to 3");
    expect(act.summary).toContain("stricter cylinder fill at 130 °F from off to on");
    // The other organisation is untouched.
    expect((await getOrganisationSettings(t.db, 2)).settings).toEqual(DEFAULT_SETTINGS);
  });

  it("refuses bad values naming the field", () => {
    const bad = organisationSettingsInput.safeParse({
      ...DEFAULT_SETTINGS,
      name: "K",
      rulePacks: [],
      ptTolerancePsi: -1,
      requalificationYears: 7,
      strictFill130F: true,
    });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => i.path.join(".")).sort()).toEqual(["name", "ptTolerancePsi", "requalificationYears", "rulePacks"]);
  });

  it("ignores unknown or mistyped keys stored by hand", async () => {
    await t
      .db("organisations")
      .where({ id: 1 })
      .update({ settings: JSON.stringify({ ptTolerancePsi: "lots", requalificationYears: 12, colour: "red" }) });
    expect((await getOrganisationSettings(t.db, 1)).settings).toEqual({ ...DEFAULT_SETTINGS, requalificationYears: 12 });
  });
});

describe("a new company", () => {
  it("starts with an owner who sets a password through a single-use link", async () => {
    const empty = await createTestDb();
    try {
      const created = await createOrganisationWithOwner(empty.db, {
        name: "Brightwater Cooling",
        ownerName: "Ines Marlowe",
        ownerEmail: "Ines@Brightwater.example",
      });
      expect((await describeInvitation(empty.db, { token: created.token })).state).toBe("valid");
      await acceptInvitation(empty.db, {
        input: { token: created.token, name: "Ines Marlowe", password: "first-owner-pass", confirmPassword: "first-owner-pass" },
      });
      const actor = await loadActor(empty.db, created.ownerId);
      expect(actor).toMatchObject({ email: "ines@brightwater.example", roles: ["owner"] });
    } finally {
      await empty.destroy();
    }
  });
});
