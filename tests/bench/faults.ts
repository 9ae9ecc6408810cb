/**
 * Fault bench (`pnpm bench faults.ts`, or `pnpm bench:faults`): writers under SIGKILL.
 *
 * 1. FAULT_SERVERS writer processes (faults/writer.ts) share one SQLite file; FAULT_CLIENTS clients
 *    each create jobs one after another with an Idempotency-Key, retrying the same key on another
 *    process when theirs dies or answers with an error. Every FAULT_KILL_EVERY_MS one process is
 *    killed with SIGKILL and restarted, FAULT_KILLS times. Then the database is checked:
 *    acknowledged (a client got the answer), found (the job of an acknowledged key is there), lost
 *    (acknowledged but missing), duplicated (more than one job for one key), half-written (a job
 *    without its refrigerant movement or key), and how long a restarted process took to serve again.
 * 2. A runner process (faults/runner.ts) is killed in the middle of a background task; a second
 *    runner takes the task over when the lease expires. Printed: the time from the kill to the
 *    takeover and to the task being done.
 * Prints figures; asserts nothing about time.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import readline from "node:readline";
import { createDb, enqueueTask } from "../../packages/db/src/index";
import { smallFixture } from "../db/fixture";

const SERVERS = Number(process.env.FAULT_SERVERS ?? 4);
const CLIENTS = Number(process.env.FAULT_CLIENTS ?? 200);
const KILLS = Number(process.env.FAULT_KILLS ?? 5);
const KILL_EVERY_MS = Number(process.env.FAULT_KILL_EVERY_MS ?? 1500);
const root = path.join(import.meta.dirname, "..", "..");
/** `node --import tsx <script>`: the script runs in the spawned process itself, so SIGKILL really kills it (the tsx CLI would leave its child running). */
const node = (script: string) => ["--import", "tsx", path.join(import.meta.dirname, "faults", script)];

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "coldtrail-faults-"));
const file = path.join(dir, "faults.sqlite");

interface Server {
  slot: number;
  proc: ChildProcess;
  ready: boolean;
  waiting: Map<string, (reply: { id?: number; error?: string; replayed?: boolean } | null) => void>;
  startedAt: number;
  readyAt: number | null;
  firstAnswerAt: number | null;
  restarted: boolean;
}

const servers: Server[] = [];
/** Per restarted process: [start-up until it listens, then until its first commit] in ms. */
const resumeMs: Array<[number, number]> = [];
let fixture: Record<string, number>;

function startServer(slot: number, restarted: boolean): Server {
  const proc = spawn(process.execPath, node("writer.ts"), {
    cwd: root,
    env: { ...process.env, FAULT_DB: file, FAULT_FIXTURE: JSON.stringify(fixture) },
    stdio: ["pipe", "pipe", "inherit"],
  });
  const s: Server = { slot, proc, ready: false, waiting: new Map(), startedAt: Date.now(), readyAt: null, firstAnswerAt: null, restarted };
  readline.createInterface({ input: proc.stdout }).on("line", (line) => {
    if (line === "ready") {
      s.ready = true;
      s.readyAt = Date.now();
      return;
    }
    const reply = JSON.parse(line) as { key: string; id?: number; error?: string; replayed?: boolean };
    if (s.firstAnswerAt === null && !reply.error) {
      s.firstAnswerAt = Date.now();
      if (s.restarted) resumeMs.push([s.readyAt! - s.startedAt, s.firstAnswerAt - s.readyAt!]);
    }
    s.waiting.get(reply.key)?.(reply);
    s.waiting.delete(reply.key);
  });
  proc.on("exit", () => {
    s.ready = false;
    for (const resolve of s.waiting.values()) resolve(null);
    s.waiting.clear();
  });
  proc.stdin.on("error", () => undefined);
  servers[slot] = s;
  return s;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

const acknowledged = new Map<string, number>();
let requests = 0;
let retries = 0;
let errors = 0;
let stopping = false;

async function send(key: string): Promise<{ id?: number; error?: string } | null> {
  let live = servers.filter((s) => s.ready);
  while (live.length === 0) {
    await sleep(100);
    live = servers.filter((s) => s.ready);
  }
  const s = live[Math.floor(Math.random() * live.length)]!;
  return new Promise((resolve) => {
    s.waiting.set(key, resolve);
    s.proc.stdin!.write(`${JSON.stringify({ key })}\n`);
  });
}

async function client(): Promise<void> {
  while (!stopping) {
    const key = randomUUID();
    requests += 1;
    for (let attempt = 0; ; attempt += 1) {
      if (attempt > 0) retries += 1;
      const reply = await send(key);
      if (reply && reply.id !== undefined) {
        acknowledged.set(key, reply.id);
        break;
      }
      if (reply?.error) errors += 1;
      await sleep(50 + Math.random() * 100);
    }
  }
}

async function writersUnderKills(): Promise<void> {
  const setup = createDb(file);
  await setup.migrate.latest();
  const f = await smallFixture(setup);
  fixture = {
    org: f.org,
    tech: f.tech,
    north: f.north,
    appliance: f.northAppliance,
    cylinder: f.northCylinder,
    equipment: f.northEquipment,
  };
  const contentsBefore = Number((await setup("cylinders").where({ id: f.northCylinder }).first("contents_g")).contents_g);
  await setup.destroy();

  for (let i = 0; i < SERVERS; i += 1) startServer(i, false);
  while (servers.some((s) => !s.ready)) await sleep(50);
  const started = Date.now();
  const clients = Array.from({ length: CLIENTS }, () => client());
  for (let k = 0; k < KILLS; k += 1) {
    await sleep(KILL_EVERY_MS);
    const victim = servers[Math.floor(Math.random() * servers.length)]!;
    victim.proc.kill("SIGKILL");
    startServer(victim.slot, true);
  }
  // Let every restarted process serve again before the clients stop (its time to resume is measured).
  for (let waited = 0; waited < 30_000 && servers.some((s) => s.restarted && s.firstAnswerAt === null); waited += 100) await sleep(100);
  await sleep(KILL_EVERY_MS);
  stopping = true;
  await Promise.all(clients);
  const seconds = (Date.now() - started) / 1000;
  for (const s of servers) s.proc.kill("SIGTERM");

  const db = createDb(file);
  const jobs = await db("jobs").where("notes", "like", "fault bench %").select("id", "notes");
  const byKey = new Map<string, number[]>();
  for (const j of jobs) {
    const key = String(j.notes).slice("fault bench ".length);
    byKey.set(key, [...(byKey.get(key) ?? []), Number(j.id)]);
  }
  let found = 0;
  let lost = 0;
  for (const [key, id] of acknowledged) {
    if (byKey.get(key)?.includes(id)) found += 1;
    else lost += 1;
  }
  const duplicated = [...byKey.values()].filter((ids) => ids.length > 1).length;
  const keys = Number((await db("idempotency_keys").count({ n: "*" }).first())!.n);
  const withoutMovement = Number(
    (await db("jobs as j")
      .where("j.notes", "like", "fault bench %")
      .whereNotExists(db("refrigerant_movements as m").whereRaw("m.job_id = j.id").select(db.raw("1")))
      .count({ n: "*" })
      .first())!.n,
  );
  const contentsAfter = Number((await db("cylinders").where({ id: fixture.cylinder }).first("contents_g")).contents_g);
  await db.destroy();

  console.log(`Writers: ${SERVERS} processes, ${CLIENTS} concurrent clients, ${KILLS} × kill -9 + restart, ${seconds.toFixed(1)} s`);
  console.log(`  requests ${requests}, retried attempts ${retries}, error answers ${errors}`);
  console.log(`  acknowledged ${acknowledged.size} · found ${found} · lost ${lost} · duplicated ${duplicated}`);
  console.log(`  jobs written ${jobs.length}, idempotency keys ${keys}, jobs without their movement ${withoutMovement}`);
  console.log(
    `  cylinder gained ${contentsAfter - contentsBefore} g for ${jobs.length} jobs of 5 g (${(contentsAfter - contentsBefore) / 5} jobs' worth)`,
  );
  if (resumeMs.length)
    console.log(
      `  restarted processes: ${resumeMs.map(([up, first]) => `up after ${(up / 1000).toFixed(1)} s + first commit ${(first / 1000).toFixed(2)} s later`).join("; ")}`,
    );
}

async function runnerTakeover(): Promise<void> {
  const db = createDb(file);
  const id = (await enqueueTask(db, { kind: "slow" }))!;
  const spawnRunner = () =>
    spawn(process.execPath, node("runner.ts"), {
      cwd: root,
      env: { ...process.env, FAULT_DB: file, FAULT_TASK_MS: "3000" },
      stdio: ["ignore", "pipe", "inherit"],
    });
  const first = spawnRunner();
  await new Promise<void>((resolve) =>
    readline.createInterface({ input: first.stdout }).on("line", (l) => {
      if (process.env.FAULT_DEBUG) console.log(`[first runner] ${new Date().toISOString()} ${l}`);
      if (l.startsWith(`started ${id}`)) resolve();
    }),
  );
  first.kill("SIGKILL");
  const killedAt = Date.now();
  const second = spawnRunner();
  const times = await new Promise<{ started: number; done: number }>((resolve) => {
    let started = 0;
    readline.createInterface({ input: second.stdout }).on("line", (l) => {
      if (l.startsWith(`started ${id}`)) started = Date.now();
      if (l === `done ${id}`) resolve({ started, done: Date.now() });
    });
  });
  let row = await db("background_tasks").where({ id }).first("state", "attempts");
  for (let i = 0; i < 50 && row.state !== "done"; i += 1) {
    await sleep(100);
    row = await db("background_tasks").where({ id }).first("state", "attempts");
  }
  second.kill("SIGTERM");
  await db.destroy();
  console.log(`Background task: runner killed mid-task (lease 10 s, heartbeat 3 s, poll 1 s)`);
  console.log(
    `  taken over by another runner ${((times.started - killedAt) / 1000).toFixed(1)} s after the kill; done after ${((times.done - killedAt) / 1000).toFixed(1)} s; state ${row.state}, attempts ${row.attempts}`,
  );
}

async function main(): Promise<void> {
  try {
    await writersUnderKills();
    await runnerTakeover();
  } finally {
    for (const s of servers) s.proc.kill("SIGKILL");
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exitCode = 1;
});
