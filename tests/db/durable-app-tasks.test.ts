import net from "node:net";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { SMTPServer } from "smtp-server";
import {
  claimAudit,
  claimNextTask,
  createAudit,
  createDb,
  getAuditRun,
  listUndeliveredMail,
  queueMail,
  runAuditBranches,
  TaskRunner,
  type Knex,
  type TaskHandler,
} from "@coldtrail/db";
import { createSeededTestDb, createTestDb, type TestDb } from "@coldtrail/db/testing";
import { routeHarness } from "./route-harness";

/**
 * The app's background tasks on the runner: an audit whose server died mid-run is resumed by another
 * runner once the lease expires and ends with the same findings as an uninterrupted run; mail queued
 * while SMTP is down is delivered once it is back (an in-process SMTP fake); the daily digest goes
 * out once per person and day with two runners on two connections.
 */

const PERIOD = { periodFrom: "2024-12-01", periodTo: "2026-12-01" };
const OFFICER = "teodora.vasquez-lind@kestrelmoor.example";

let smtpPort = 0;
let handlers: Record<string, TaskHandler>;
let scheduleDailyDigests: (db: Knex, now?: Date) => Promise<number>;
let queueAudit: (db: Knex, opts: { auditId: number; organisationId: number }) => Promise<void>;
const received: Array<{ to: string; body: string }> = [];
let smtp: SMTPServer | null = null;

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer().listen(0, "127.0.0.1", () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

function startSmtp(): Promise<void> {
  smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onData(stream, session, callback) {
      let body = "";
      stream.on("data", (c: Buffer) => (body += c.toString()));
      stream.on("end", () => {
        for (const r of session.envelope.rcptTo) received.push({ to: r.address, body });
        callback();
      });
    },
  });
  return new Promise((resolve) => smtp!.listen(smtpPort, "127.0.0.1", () => resolve()));
}

async function eventually(step: () => Promise<boolean>, tries = 400): Promise<void> {
  for (let i = 0; i < tries; i += 1) {
    if (await step()) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error("did not happen");
}

beforeAll(async () => {
  smtpPort = await freePort();
  process.env.SMTP_HOST = "127.0.0.1";
  process.env.SMTP_PORT = String(smtpPort);
  routeHarness(
    () => {
      throw new Error("the process-wide handle is not used here");
    },
    (web) => {
      vi.doMock("@/lib/env", () => import(web("lib/env.ts")));
      vi.doMock("@/lib/server/storage", () => import(web("lib/server/storage.ts")));
    },
  );
  const web = (p: string) => new URL(`../../apps/web/src/${p}`, import.meta.url).pathname;
  const runnerModule = await import(web("lib/server/task-runner.ts"));
  handlers = runnerModule.TASK_HANDLERS;
  ({ scheduleDailyDigests } = await import(web("lib/server/finding-mail.ts")));
  ({ queueAudit } = await import(web("lib/server/audit-runner.ts")));
});

afterAll(async () => {
  await new Promise<void>((resolve) => (smtp ? smtp.close(() => resolve()) : resolve()));
});

const snapshot = async (db: Knex) =>
  (
    await db("findings").orderBy(["rule_id", "identity_key"]).select("rule_id", "identity_key", "state", "severity", "due_on", "branch_id")
  ).map((r) => ({ ...r, branch_id: Number(r.branch_id) }));

describe("background tasks of the app", () => {
  it("an audit interrupted mid-run is resumed by another runner and finds the same as an uninterrupted one", async () => {
    const [interrupted, baseline] = [await createSeededTestDb(), await createSeededTestDb()];
    try {
      const start = async (db: Knex) => {
        const officer = await db("users").where({ email: OFFICER }).first("id", "organisation_id");
        const actor = { userId: Number(officer.id), organisationId: Number(officer.organisation_id) };
        const branchIds = (await db("branches").where({ organisation_id: actor.organisationId }).orderBy("id").select("id")).map((b) =>
          Number(b.id),
        );
        const id = await db.transaction(async (trx) => {
          const auditId = await createAudit(trx, { actor, input: { branchIds, ...PERIOD, packs: ["us_federal"] } });
          await queueAudit(trx, { auditId, organisationId: actor.organisationId });
          return auditId;
        });
        return { id, branchIds };
      };

      const base = await start(baseline.db);
      await new TaskRunner(baseline.db, { handlers, owner: "baseline" }).drain({ kinds: ["audit"] });
      expect((await getAuditRun(baseline.db, { organisationId: 1, id: base.id }))?.state).toBe("done");

      const run = await start(interrupted.db);
      expect(run.branchIds.length).toBeGreaterThan(1);
      // A server claims the task and the audit, checks one branch and is killed (no heartbeat, no completion).
      expect(await claimNextTask(interrupted.db, { owner: "killed-server", leaseMs: 500, kinds: ["audit"] })).toBeDefined();
      expect(await claimAudit(interrupted.db, { id: run.id })).toBe(true);
      await expect(
        runAuditBranches(interrupted.db, {
          id: run.id,
          pause: async () => {
            throw new Error("kill -9");
          },
        }),
      ).rejects.toThrow("kill -9");
      const halfway = await getAuditRun(interrupted.db, { organisationId: 1, id: run.id });
      expect(halfway).toMatchObject({ state: "running", branchesDone: [run.branchIds[0]] });

      const other = new TaskRunner(interrupted.db, { handlers, owner: "second-instance" });
      await eventually(() => other.runOne(["audit"]));
      const resumed = await getAuditRun(interrupted.db, { organisationId: 1, id: run.id });
      expect(resumed?.state).toBe("done");
      expect([...resumed!.branchesDone].sort()).toEqual([...run.branchIds].sort());
      expect(await snapshot(interrupted.db)).toEqual(await snapshot(baseline.db));
      const baseRun = await getAuditRun(baseline.db, { organisationId: 1, id: base.id });
      expect(resumed!.summary!.totals).toEqual(baseRun!.summary!.totals);
    } finally {
      await interrupted.destroy();
      await baseline.destroy();
    }
  });

  it("mail queued while SMTP is down is delivered once it is back, and the owner sees why it waited", async () => {
    const t: TestDb = await createTestDb();
    try {
      const [org] = await t.db("organisations").insert({ name: "Outbox Cooling", created_at: "2026-12-01T00:00:00.000Z" }).returning("id");
      const organisationId = Number(typeof org === "object" ? org.id : org);
      await queueMail(t.db, {
        organisationId,
        to: "kit.marsh@outbox.example",
        subject: "Finding assigned to you",
        text: "Hello",
        html: "<p>Hello</p>",
      });
      const runner = new TaskRunner(t.db, { handlers, owner: "r", backoffBaseMs: 20, log: () => undefined });
      // SMTP is down: the attempt fails, the mail waits with the reason.
      expect(await runner.runOne(["mail"])).toBe(true);
      const waiting = await listUndeliveredMail(t.db, { organisationId });
      expect(waiting).toHaveLength(1);
      expect(waiting[0]).toMatchObject({ state: "queued", attempts: 1 });
      expect(waiting[0]!.lastError).toMatch(/ECONNREFUSED|connect/i);
      expect(received).toHaveLength(0);

      await startSmtp();
      await eventually(async () => {
        await runner.runOne(["mail"]);
        return received.length > 0;
      });
      expect(received.map((m) => m.to)).toEqual(["kit.marsh@outbox.example"]);
      expect(await listUndeliveredMail(t.db, { organisationId })).toEqual([]);
      expect(await runner.drain({ kinds: ["mail"] })).toBe(0);
      expect(received).toHaveLength(1);
    } finally {
      await t.destroy();
    }
  });

  it("the daily digest goes out once per person and day with two instances", async () => {
    if (!smtp) await startSmtp();
    received.length = 0;
    const t = await createSeededTestDb();
    const second = createDb(t.file);
    try {
      // Findings to be reminded of: an audit of the first organisation.
      const officer = await t.db("users").where({ email: OFFICER }).first("id", "organisation_id");
      const branchIds = (await t.db("branches").where({ organisation_id: officer.organisation_id }).select("id")).map((b) => Number(b.id));
      const auditId = await createAudit(t.db, {
        actor: { userId: Number(officer.id), organisationId: Number(officer.organisation_id) },
        input: { branchIds, ...PERIOD, packs: ["us_federal"] },
      });
      await queueAudit(t.db, { auditId, organisationId: Number(officer.organisation_id) });
      await new TaskRunner(t.db, { handlers, owner: "auditor" }).drain({ kinds: ["audit"] });
      const morning = new Date(`${new Date().toISOString().slice(0, 10)}T08:00:00.000Z`);
      const queued = await Promise.all([
        scheduleDailyDigests(t.db, morning),
        scheduleDailyDigests(second, morning),
        scheduleDailyDigests(t.db, morning),
      ]);
      const orgs = Number((await t.db("organisations").count({ n: "*" }).first())!.n);
      expect(queued.reduce((a, b) => a + b, 0)).toBe(orgs);
      const a = new TaskRunner(t.db, { handlers, owner: "instance-a" });
      const b = new TaskRunner(second, { handlers, owner: "instance-b" });
      await Promise.all([a.drain(), b.drain()]);
      await Promise.all([a.drain(), b.drain()]);
      const digests = await t.db("notifications").where({ kind: "finding_digest" }).select("user_id");
      expect(digests.length).toBeGreaterThan(0);
      expect(new Set(digests.map((d) => d.user_id)).size).toBe(digests.length);
      expect(received).toHaveLength(digests.length);
      expect(new Set(received.map((m) => m.to)).size).toBe(received.length);
      // The next check the same day queues nothing more.
      expect(await scheduleDailyDigests(second, new Date(morning.getTime() + 3_600_000))).toBe(0);
    } finally {
      await second.destroy();
      await t.destroy();
    }
  });
});
