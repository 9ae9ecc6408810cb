import { randomUUID } from "node:crypto";
import os from "node:os";
import type { Knex } from "knex";
import { claimNextTask, completeTask, failTaskAttempt, renewTaskLease, type BackgroundTask } from "./tasks";

/**
 * The one background runner: works through `background_tasks` (audits, imports, re-checks, the
 * digest, mail). Small on purpose — see DEVELOPERS.md "Background tasks" for why no library.
 *
 * Each lane loops: claim a due task with a lease (tasks.ts), run its kind's handler while renewing the
 * lease every `heartbeatMs`, then mark it done, or record the failure (retry with backoff, or failed
 * for good). A runner that dies leaves its lease to expire; any runner then takes the task over within
 * `leaseMs` + `pollMs`, and the handler resumes from what the task's records say is done. When a lease
 * cannot be renewed (another runner took over), the handler's `signal` is aborted.
 */

export class PermanentTaskError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "PermanentTaskError";
  }
}

export interface TaskContext {
  task: BackgroundTask;
  db: Knex;
  /** Aborted when this runner lost the task (lease taken over) or is stopping. */
  signal: AbortSignal;
}

export interface TaskHandler {
  run: (ctx: TaskContext) => Promise<void>;
  /** Called once when the task fails for good (attempts used up), e.g. to mark its record failed. */
  giveUp?: (ctx: { task: BackgroundTask; db: Knex; reason: string }) => Promise<void>;
  /** Plain words for the reason a failure is shown with (default: the error's message). */
  describeError?: (err: unknown) => string;
}

export interface RunnerOptions {
  handlers: Record<string, TaskHandler>;
  /** Identifies this runner in leases (default: host, pid and a random part). */
  owner?: string;
  leaseMs?: number;
  heartbeatMs?: number;
  pollMs?: number;
  /** Tasks run at the same time by this runner (default 2: a long audit does not hold up mail). */
  lanes?: number;
  /** First retry delay; doubles per attempt (default 5 s). */
  backoffBaseMs?: number;
  /** Called on each tick when idle, e.g. to queue scheduled tasks; errors are logged. */
  onIdle?: (db: Knex) => Promise<void>;
  idleEveryMs?: number;
  log?: (message: string, err?: unknown) => void;
}

export class TaskRunner {
  readonly owner: string;
  private readonly opts: Required<Omit<RunnerOptions, "onIdle" | "owner">> & Pick<RunnerOptions, "onIdle">;
  private stopping = false;
  private lanes: Promise<void>[] = [];
  private wake: (() => void)[] = [];
  private lastIdle = 0;
  private readonly controllers = new Set<AbortController>();

  constructor(
    private readonly db: Knex,
    options: RunnerOptions,
  ) {
    this.owner = options.owner ?? `${os.hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
    this.opts = {
      handlers: options.handlers,
      leaseMs: options.leaseMs ?? 10_000,
      heartbeatMs: options.heartbeatMs ?? 3_000,
      pollMs: options.pollMs ?? 1_000,
      lanes: options.lanes ?? 2,
      backoffBaseMs: options.backoffBaseMs ?? 5_000,
      onIdle: options.onIdle,
      idleEveryMs: options.idleEveryMs ?? 30_000,
      log: options.log ?? ((m, e) => (e ? console.error(`[tasks] ${m}`, e) : console.log(`[tasks] ${m}`))),
    };
  }

  get running(): boolean {
    return this.lanes.length > 0 && !this.stopping;
  }

  start(): this {
    if (this.lanes.length) return this;
    this.stopping = false;
    for (let i = 0; i < this.opts.lanes; i += 1) this.lanes.push(this.lane(i));
    return this;
  }

  /** Looks for work now instead of at the next poll (call after queuing a task). */
  kick(): void {
    for (const w of this.wake.splice(0)) w();
  }

  /** Stops claiming; running handlers are aborted and their tasks left to lease expiry (resumed by any runner). */
  async stop(): Promise<void> {
    this.stopping = true;
    for (const c of this.controllers) c.abort();
    this.kick();
    await Promise.all(this.lanes);
    this.lanes = [];
  }

  /** Runs due tasks until none is left (scripts and tests); returns how many ran. */
  async drain(opts: { kinds?: string[]; max?: number } = {}): Promise<number> {
    let n = 0;
    while (n < (opts.max ?? Infinity)) {
      const ran = await this.runOne(opts.kinds);
      if (!ran) break;
      n += 1;
    }
    return n;
  }

  private sleep(ms: number): Promise<void> {
    return new Promise((resolve) => {
      const timer = setTimeout(done, ms);
      timer.unref?.();
      this.wake.push(done);
      function done() {
        clearTimeout(timer);
        resolve();
      }
    });
  }

  private async lane(index: number): Promise<void> {
    while (!this.stopping) {
      let ran = false;
      try {
        if (index === 0 && this.opts.onIdle && Date.now() - this.lastIdle >= this.opts.idleEveryMs) {
          this.lastIdle = Date.now();
          await this.opts.onIdle(this.db).catch((err: unknown) => this.opts.log("scheduled work failed", err));
        }
        ran = await this.runOne();
      } catch (err) {
        this.opts.log("could not claim work", err);
      }
      if (!ran && !this.stopping) await this.sleep(this.opts.pollMs);
    }
  }

  /** Claims and runs one task; false when none was due. */
  async runOne(kinds?: string[]): Promise<boolean> {
    const known = Object.keys(this.opts.handlers);
    const task = await claimNextTask(this.db, {
      owner: this.owner,
      leaseMs: this.opts.leaseMs,
      kinds: kinds ? kinds.filter((k) => known.includes(k)) : known,
    });
    if (!task) return false;
    const handler = this.opts.handlers[task.kind]!;
    const controller = new AbortController();
    this.controllers.add(controller);
    const beat = setInterval(() => {
      renewTaskLease(this.db, { id: task.id, owner: this.owner, leaseMs: this.opts.leaseMs })
        .then((mine) => {
          if (!mine) controller.abort();
        })
        .catch((err: unknown) => this.opts.log(`heartbeat of task #${task.id} failed`, err));
    }, this.opts.heartbeatMs);
    beat.unref?.();
    try {
      if (task.attempts > task.maxAttempts) {
        // Claimed again after its runner stopped too often (an expired lease counts as an attempt).
        const reason = `Interrupted ${task.attempts - 1} times (the server stopped while it ran)`;
        await this.giveUp(handler, task, reason);
        return true;
      }
      await handler.run({ task, db: this.db, signal: controller.signal });
      if (!controller.signal.aborted) await completeTask(this.db, { id: task.id, owner: this.owner });
    } catch (err) {
      if (controller.signal.aborted && this.stopping) return true; // left for lease expiry
      const reason = handler.describeError?.(err) ?? (err instanceof Error ? err.message : String(err));
      const outcome = await failTaskAttempt(this.db, {
        id: task.id,
        owner: this.owner,
        error: reason,
        permanent: err instanceof PermanentTaskError,
        backoffBaseMs: this.opts.backoffBaseMs,
      });
      if (outcome === "failed")
        await handler.giveUp?.({ task, db: this.db, reason }).catch((e: unknown) => this.opts.log("giveUp failed", e));
      this.opts.log(`${task.kind} task #${task.id} ${outcome === "retry" ? "will be retried" : outcome}: ${reason}`, err);
    } finally {
      clearInterval(beat);
      this.controllers.delete(controller);
    }
    return true;
  }

  private async giveUp(handler: TaskHandler, task: BackgroundTask, reason: string): Promise<void> {
    const outcome = await failTaskAttempt(this.db, { id: task.id, owner: this.owner, error: reason, permanent: true });
    if (outcome === "failed") await handler.giveUp?.({ task, db: this.db, reason });
  }
}
