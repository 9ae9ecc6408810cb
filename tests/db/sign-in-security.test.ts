import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { createRequire } from "node:module";
import {
  DEMO_PASSWORD,
  SIGN_IN_LIMITS,
  changeOwnPassword,
  checkSession,
  countOpenSessions,
  createThrottle,
  endSession,
  findUserForSignIn,
  hashPassword,
  openSession,
  setPersonActive,
  signOutEverywhere,
  verifyPassword,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";
import { OFFICER, OWNER, TECH_COL, count, signedIn, userId } from "./admin-fixture";

const bcrypt = createRequire(new URL("../../packages/db/package.json", import.meta.url))("bcryptjs") as typeof import("bcryptjs");

let t: TestDb;
beforeEach(async () => {
  t = await createSeededTestDb();
});
afterEach(async () => {
  await t.destroy();
});

const NOW = new Date("2026-12-01T09:00:00.000Z");
const minutes = (n: number) => new Date(NOW.getTime() + n * 60_000);

async function sessionFor(email: string, at = NOW) {
  const id = await userId(t.db, email);
  const row = await t.db("users").where({ id }).first("organisation_id");
  return openSession(t.db, { userId: id, organisationId: Number(row.organisation_id), userAgent: "test", now: at });
}

describe("sign-in throttling (counted in the database)", () => {
  it("after 5 failures for one account from one address the next attempt is refused, with the wait in minutes", async () => {
    const throttle = createThrottle(t.db);
    for (let i = 1; i <= 4; i++) {
      expect(await throttle.signInRefusal(TECH_COL, "203.0.113.7")).toBeNull();
      expect(await throttle.signInFailed(TECH_COL, "203.0.113.7")).toBeNull();
    }
    expect(await throttle.signInRefusal(TECH_COL, "203.0.113.7")).toBeNull();
    const fifth = await throttle.signInFailed(TECH_COL, "203.0.113.7");
    expect(fifth?.message).toMatch(/^Try again in (14|15) minutes\.$/);

    const sixth = await throttle.signInRefusal(TECH_COL, "203.0.113.7");
    expect(sixth).not.toBeNull();
    expect(sixth!.retryAfterSeconds).toBeGreaterThan(14 * 60);
    expect(sixth!.retryAfterSeconds).toBeLessThanOrEqual(15 * 60);
    // Same account, e-mail written differently: the same count.
    expect(await throttle.signInRefusal(TECH_COL.toUpperCase(), "203.0.113.7")).not.toBeNull();
  });

  it("the count holds across a restart (a new throttle on the same database) and is stored without addresses", async () => {
    const first = createThrottle(t.db);
    for (let i = 0; i < SIGN_IN_LIMITS.accountAddress.points; i++) await first.signInFailed(TECH_COL, "203.0.113.7");
    const afterRestart = createThrottle(t.db);
    expect(await afterRestart.signInRefusal(TECH_COL, "203.0.113.7")).not.toBeNull();
    const keys = (await t.db("rate_limits").select("key")).map((r) => String(r.key));
    expect(keys.length).toBeGreaterThan(0);
    for (const k of keys) {
      expect(k).not.toContain("203.0.113.7");
      expect(k).not.toContain("kestrelmoor");
    }
  });

  it("failures from one address do not lock the person out at another address, and a success clears them", async () => {
    const throttle = createThrottle(t.db);
    for (let i = 0; i < 5; i++) await throttle.signInFailed(TECH_COL, "203.0.113.7");
    expect(await throttle.signInRefusal(TECH_COL, "198.51.100.20")).toBeNull();
    expect(await throttle.signInRefusal(OFFICER, "203.0.113.7")).toBeNull();

    for (let i = 0; i < 4; i++) await throttle.signInFailed(OWNER, "198.51.100.20");
    await throttle.signInSucceeded(OWNER, "198.51.100.20");
    for (let i = 0; i < 4; i++) await throttle.signInFailed(OWNER, "198.51.100.20");
    expect(await throttle.signInRefusal(OWNER, "198.51.100.20")).toBeNull();
  });

  it("guessing one account from many addresses meets the looser limit per account", async () => {
    const throttle = createThrottle(t.db);
    for (let i = 0; i < SIGN_IN_LIMITS.account.points; i++) await throttle.signInFailed(OFFICER, `192.0.2.${i}`);
    expect(await throttle.signInRefusal(OFFICER, "192.0.2.250")).not.toBeNull();
    expect(await throttle.signInRefusal(OWNER, "192.0.2.250")).toBeNull();
  });

  it("public routes are limited per address and route", async () => {
    const throttle = createThrottle(t.db);
    for (let i = 0; i < 10; i++) expect(await throttle.publicRequest("password-forgot", "203.0.113.9")).toBeNull();
    expect((await throttle.publicRequest("password-forgot", "203.0.113.9"))?.message).toMatch(/^Try again in \d+ minutes?\.$/);
    expect(await throttle.publicRequest("password-forgot", "203.0.113.10")).toBeNull();
    expect(await throttle.publicRequest("password-reset", "203.0.113.9")).toBeNull();
  });
});

describe("server-side sessions", () => {
  it("a session works until it is ended; sign-out ends only that one", async () => {
    const a = await sessionFor(TECH_COL);
    const b = await sessionFor(TECH_COL);
    expect(await checkSession(t.db, { sessionId: a, now: minutes(1) })).toEqual({ ok: true, userId: await userId(t.db, TECH_COL) });
    await endSession(t.db, { sessionId: a });
    expect(await checkSession(t.db, { sessionId: a, now: minutes(2) })).toEqual({ ok: false, reason: "revoked" });
    expect((await checkSession(t.db, { sessionId: b, now: minutes(2) })).ok).toBe(true);
    expect(await checkSession(t.db, { sessionId: "made-up-session-id", now: minutes(2) })).toEqual({ ok: false, reason: "unknown" });
  });

  it("only a hash of the session id is stored", async () => {
    const id = await sessionFor(TECH_COL);
    const rows = await t.db("user_sessions").select("id_hash");
    expect(rows.map((r) => r.id_hash)).not.toContain(id);
  });

  it("an officer's session ends after 30 idle minutes; activity keeps it going", async () => {
    const s = await sessionFor(OFFICER);
    expect((await checkSession(t.db, { sessionId: s, now: minutes(25), activity: true })).ok).toBe(true);
    // 25 + 29 minutes: idle for 29 since the last activity.
    expect((await checkSession(t.db, { sessionId: s, now: minutes(54) })).ok).toBe(true);
    expect(await checkSession(t.db, { sessionId: s, now: minutes(56) })).toEqual({ ok: false, reason: "idle" });
    // Ended for good: activity later does not bring it back.
    expect(await checkSession(t.db, { sessionId: s, now: minutes(57), activity: true })).toEqual({ ok: false, reason: "revoked" });
  });

  it("background checks (no activity) do not keep a session alive", async () => {
    const s = await sessionFor(OWNER);
    for (const m of [10, 20, 29]) expect((await checkSession(t.db, { sessionId: s, now: minutes(m) })).ok).toBe(true);
    expect(await checkSession(t.db, { sessionId: s, now: minutes(31) })).toEqual({ ok: false, reason: "idle" });
  });

  it("the organisation's setting for other roles decides a technician's idle timeout", async () => {
    await t.db("organisations").where({ id: 1 }).update({ session_idle_minutes_others: 120 });
    const tech = await sessionFor(TECH_COL);
    const officer = await sessionFor(OFFICER);
    expect((await checkSession(t.db, { sessionId: tech, now: minutes(90) })).ok).toBe(true);
    expect(await checkSession(t.db, { sessionId: officer, now: minutes(90) })).toEqual({ ok: false, reason: "idle" });
    expect(await checkSession(t.db, { sessionId: tech, now: minutes(121) })).toEqual({ ok: false, reason: "idle" });
  });

  it("sign out everywhere ends every session of the person and no one else's", async () => {
    const mine = [await sessionFor(TECH_COL), await sessionFor(TECH_COL)];
    const other = await sessionFor(OFFICER);
    const techId = await userId(t.db, TECH_COL);
    expect(await signOutEverywhere(t.db, { userId: techId, organisationId: 1 })).toBe(2);
    for (const s of mine) expect((await checkSession(t.db, { sessionId: s, now: minutes(1) })).ok).toBe(false);
    expect((await checkSession(t.db, { sessionId: other, now: minutes(1) })).ok).toBe(true);
    expect(await countOpenSessions(t.db, techId)).toBe(0);
  });

  it("deactivating a person ends their sessions", async () => {
    const s = await sessionFor(TECH_COL);
    const { actor } = await signedIn(t.db, OWNER);
    await setPersonActive(t.db, { actor, id: await userId(t.db, TECH_COL), active: false });
    expect(await checkSession(t.db, { sessionId: s, now: minutes(1) })).toEqual({ ok: false, reason: "revoked" });
  });

  it("changing one's password needs the current one and ends every session", async () => {
    const s = await sessionFor(TECH_COL);
    const techId = await userId(t.db, TECH_COL);
    const input = { currentPassword: "not-my-password", password: "lantern-gasket-orchard", confirmPassword: "lantern-gasket-orchard" };
    await expect(changeOwnPassword(t.db, { userId: techId, input })).rejects.toMatchObject({ field: "currentPassword" });
    expect((await checkSession(t.db, { sessionId: s, now: minutes(1) })).ok).toBe(true);

    const activityBefore = await count(t.db, "activity");
    await changeOwnPassword(t.db, { userId: techId, input: { ...input, currentPassword: DEMO_PASSWORD } });
    expect(await checkSession(t.db, { sessionId: s, now: minutes(1) })).toEqual({ ok: false, reason: "revoked" });
    expect(await count(t.db, "activity")).toBe(activityBefore + 1);
    const user = await findUserForSignIn(t.db, TECH_COL);
    expect(await verifyPassword("lantern-gasket-orchard", user!.passwordHash)).toBe(true);
    expect(await verifyPassword(DEMO_PASSWORD, user!.passwordHash)).toBe(false);
  });
});

describe("password hashing", () => {
  it("long pass phrases count in full, past bcrypt's 72 bytes", async () => {
    const phrase = "the compressor hums beside the walk-in cooler while the gauges settle slowly ";
    expect(Buffer.byteLength(phrase)).toBeGreaterThan(72);
    const hash = await hashPassword(`${phrase}one`);
    expect(await verifyPassword(`${phrase}one`, hash)).toBe(true);
    expect(await verifyPassword(`${phrase}two`, hash)).toBe(false);
    // What plain bcrypt would do: both phrases are the same after 72 bytes.
    const plain = await bcrypt.hash(`${phrase}one`, 4);
    expect(await bcrypt.compare(`${phrase}two`, plain)).toBe(true);
  });

  it("hashes written before pre-hashing (the demo accounts') still verify", async () => {
    const user = await findUserForSignIn(t.db, TECH_COL);
    expect(user!.passwordHash!.startsWith("$2")).toBe(true);
    expect(await verifyPassword(DEMO_PASSWORD, user!.passwordHash)).toBe(true);
  });
});
