/**
 * The process's background runner, as far as queuing code needs it: `kickTaskRunner()` after queuing
 * a task makes the runner look now instead of at its next poll (about a second). Kept apart from
 * ./task-runner.ts so task handlers can import it without an import cycle.
 */
const globalForKick = globalThis as unknown as { __coldtrailKick?: () => void };

export function setTaskKick(kick: () => void): void {
  globalForKick.__coldtrailKick = kick;
}

export function kickTaskRunner(): void {
  globalForKick.__coldtrailKick?.();
}
