import { createHash } from "node:crypto";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { subject } from "@casl/ability";
import { defineAbilityFor, invitationInput } from "@coldtrail/core";
import {
  RESET_REQUESTS_PER_HOUR,
  acceptInvitation,
  createInvitation,
  describeInvitation,
  describePasswordReset,
  findUserForSignIn,
  loadActor,
  requestPasswordReset,
  resendInvitation,
  resetPassword,
  setPersonActive,
  verifyPassword,
  withdrawInvitation,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";
import { OTHER_OWNER, OWNER, TECH_COL, branchId, count, lastActivity, signedIn } from "./admin-fixture";

let t: TestDb;
beforeEach(async () => {
  t = await createSeededTestDb();
});
afterEach(async () => {
  await t.destroy();
});

const NOW = new Date("2026-12-01T09:00:00.000Z");
const days = (n: number) => new Date(NOW.getTime() + n * 24 * 3600 * 1000);
const minutes = (n: number) => new Date(NOW.getTime() + n * 60 * 1000);
const PASSWORD = "violet-condenser-42";
const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

async function inviteManager(email = "noor.fairbanks@kestrelmoor.example") {
  const { actor } = await signedIn(t.db, OWNER);
  const tuc = await branchId(t.db, "TUC");
  const input = invitationInput.parse({ email, name: "Noor Fairbanks", roles: ["branch_manager"], branchIds: [tuc] });
  return { actor, tuc, issued: await createInvitation(t.db, { actor, input, now: NOW }) };
}

const accept = (token: string, now = NOW) =>
  acceptInvitation(t.db, { input: { token, name: "Noor Fairbanks", password: PASSWORD, confirmPassword: PASSWORD }, now });

describe("invitations", () => {
  it("create the account without a password, its roles, and a link stored only as a hash that expires in 7 days", async () => {
    const { actor, tuc, issued } = await inviteManager();
    expect(issued.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    const row = await t.db("invitations").where({ id: issued.invitationId }).first();
    expect(row.token_hash).toBe(sha256(issued.token));
    expect(JSON.stringify(row)).not.toContain(issued.token);
    expect(row.expires_at).toBe(days(7).toISOString());
    expect(issued.access).toBe("Branch manager (Tucson)");

    const user = await findUserForSignIn(t.db, "noor.fairbanks@kestrelmoor.example");
    expect(user).toMatchObject({ passwordHash: null, active: true, organisationId: 1 });
    expect((await loadActor(t.db, user!.id))!.memberships).toEqual([{ role: "branch_manager", branchId: tuc }]);
    expect(await lastActivity(t.db)).toMatchObject({ action: "person.invited", actor_id: actor.userId, subject_id: user!.id });
  });

  it("accepting sets the password once; the same link is then refused as used", async () => {
    const { issued } = await inviteManager();
    expect((await describeInvitation(t.db, { token: issued.token, now: NOW })).state).toBe("valid");
    const { userId, email } = await accept(issued.token, days(1));
    expect(email).toBe("noor.fairbanks@kestrelmoor.example");
    const user = await findUserForSignIn(t.db, email);
    expect(await verifyPassword(PASSWORD, user!.passwordHash)).toBe(true);
    expect(await lastActivity(t.db)).toMatchObject({ action: "person.invitation_accepted", actor_id: userId });

    expect((await describeInvitation(t.db, { token: issued.token, now: days(1) })).state).toBe("used");
    const again = await acceptInvitation(t.db, {
      input: { token: issued.token, name: "Someone Else", password: "another-password-1", confirmPassword: "another-password-1" },
      now: days(1),
    }).catch((e) => e);
    expect(again).toMatchObject({ code: "conflict", field: "token" });
    expect(again.message).toContain("already been used");
    expect(await verifyPassword(PASSWORD, (await findUserForSignIn(t.db, email))!.passwordHash)).toBe(true);
  });

  it("an expired link is refused with a clear message and changes nothing", async () => {
    const { issued } = await inviteManager();
    const later = new Date(days(7).getTime() + 1000);
    expect((await describeInvitation(t.db, { token: issued.token, now: later })).state).toBe("expired");
    const before = await count(t.db, "activity");
    await expect(accept(issued.token, later)).rejects.toMatchObject({ code: "conflict", message: expect.stringContaining("expired") });
    expect((await findUserForSignIn(t.db, issued.email))!.passwordHash).toBeNull();
    expect(await count(t.db, "activity")).toBe(before);
  });

  it("an unknown link is not found", async () => {
    await expect(accept("x".repeat(43))).rejects.toMatchObject({ code: "not_found", message: expect.stringContaining("not valid") });
  });

  it("resending withdraws the old link; withdrawing deactivates the account", async () => {
    const { actor, issued } = await inviteManager();
    const fresh = await resendInvitation(t.db, { actor, userId: issued.userId, now: minutes(5) });
    expect(fresh.token).not.toBe(issued.token);
    expect((await describeInvitation(t.db, { token: issued.token, now: minutes(6) })).state).toBe("withdrawn");
    await expect(accept(issued.token, minutes(6))).rejects.toMatchObject({ message: expect.stringContaining("withdrawn") });

    await withdrawInvitation(t.db, { actor, userId: issued.userId, now: minutes(7) });
    expect((await describeInvitation(t.db, { token: fresh.token, now: minutes(8) })).state).toBe("withdrawn");
    expect((await findUserForSignIn(t.db, issued.email))!.active).toBe(false);
  });

  it("an address that already has an account is refused, in this organisation or another", async () => {
    const { actor } = await signedIn(t.db, OWNER);
    const users = await count(t.db, "users");
    for (const email of [TECH_COL, OTHER_OWNER]) {
      await expect(
        createInvitation(t.db, { actor, input: invitationInput.parse({ email, name: "Anyone Here", roles: ["compliance_officer"] }) }),
      ).rejects.toMatchObject({ code: "conflict", field: "email" });
    }
    expect(await count(t.db, "users")).toBe(users);
  });

  it("the invitee signs in with the chosen password and reads only their branch", async () => {
    const { issued, tuc } = await inviteManager();
    const { userId } = await accept(issued.token);
    const ability = defineAbilityFor((await loadActor(t.db, userId))!);
    expect(ability.can("read", subject("Job", { organisationId: 1, branchId: tuc }))).toBe(true);
    expect(ability.can("read", subject("Job", { organisationId: 1, branchId: await branchId(t.db, "DEN") }))).toBe(false);
  });
});

describe("password reset", () => {
  it("an unknown address, a deactivated account and one still invited get nothing, and nothing is written", async () => {
    const { actor, issued } = await inviteManager();
    await setPersonActive(t.db, { actor, id: (await findUserForSignIn(t.db, TECH_COL))!.id, active: false });
    const before = { tokens: await count(t.db, "password_reset_tokens"), activity: await count(t.db, "activity") };
    expect(await requestPasswordReset(t.db, { email: "nobody@nowhere.example", now: NOW })).toBeNull();
    expect(await requestPasswordReset(t.db, { email: TECH_COL, now: NOW })).toBeNull();
    expect(await requestPasswordReset(t.db, { email: issued.email, now: NOW })).toBeNull();
    expect({ tokens: await count(t.db, "password_reset_tokens"), activity: await count(t.db, "activity") }).toEqual(before);
  });

  it("a link works once within an hour and stores only the hash; other open links stop working", async () => {
    const first = await requestPasswordReset(t.db, { email: OWNER.toUpperCase(), now: NOW });
    const second = await requestPasswordReset(t.db, { email: OWNER, now: minutes(1) });
    expect(first && second).toBeTruthy();
    const row = await t
      .db("password_reset_tokens")
      .where({ token_hash: sha256(second!.token) })
      .first();
    expect(row.expires_at).toBe(minutes(61).toISOString());
    expect(await lastActivity(t.db)).toMatchObject({ action: "person.password_reset_requested", actor_id: null });

    await resetPassword(t.db, { input: { token: second!.token, password: PASSWORD, confirmPassword: PASSWORD }, now: minutes(2) });
    expect(await verifyPassword(PASSWORD, (await findUserForSignIn(t.db, OWNER))!.passwordHash)).toBe(true);
    expect(await verifyPassword("coldtrail-demo", (await findUserForSignIn(t.db, OWNER))!.passwordHash)).toBe(false);

    for (const token of [second!.token, first!.token]) {
      expect((await describePasswordReset(t.db, { token, now: minutes(3) })).state).toBe("used");
      await expect(
        resetPassword(t.db, { input: { token, password: "another-password-1", confirmPassword: "another-password-1" }, now: minutes(3) }),
      ).rejects.toMatchObject({
        code: "conflict",
        field: "token",
      });
    }
    expect(await verifyPassword(PASSWORD, (await findUserForSignIn(t.db, OWNER))!.passwordHash)).toBe(true);
  });

  it("an expired link is refused with a clear message", async () => {
    const issued = await requestPasswordReset(t.db, { email: OWNER, now: NOW });
    expect((await describePasswordReset(t.db, { token: issued!.token, now: minutes(60) })).state).toBe("expired");
    const err = await resetPassword(t.db, {
      input: { token: issued!.token, password: PASSWORD, confirmPassword: PASSWORD },
      now: minutes(61),
    }).catch((e) => e);
    expect(err).toMatchObject({ code: "conflict", message: "This link has expired. Ask for a new one." });
    expect(await verifyPassword("coldtrail-demo", (await findUserForSignIn(t.db, OWNER))!.passwordHash)).toBe(true);
  });

  it(`sends at most ${RESET_REQUESTS_PER_HOUR} links an hour to one account`, async () => {
    for (let i = 0; i < RESET_REQUESTS_PER_HOUR; i++)
      expect(await requestPasswordReset(t.db, { email: OWNER, now: minutes(i) })).not.toBeNull();
    expect(await requestPasswordReset(t.db, { email: OWNER, now: minutes(10) })).toBeNull();
    expect(await requestPasswordReset(t.db, { email: OWNER, now: minutes(61) })).not.toBeNull();
  });

  it("a link stops working when the account is deactivated", async () => {
    const issued = await requestPasswordReset(t.db, { email: TECH_COL, now: NOW });
    const { actor } = await signedIn(t.db, OWNER);
    await setPersonActive(t.db, { actor, id: issued!.userId, active: false, now: minutes(1) });
    expect((await describePasswordReset(t.db, { token: issued!.token, now: minutes(2) })).state).not.toBe("valid");
    await expect(
      resetPassword(t.db, { input: { token: issued!.token, password: PASSWORD, confirmPassword: PASSWORD }, now: minutes(2) }),
    ).rejects.toMatchObject({
      code: "conflict",
    });
  });
});
