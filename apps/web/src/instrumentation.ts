/**
 * Runs once when the server starts (Next.js instrumentation): starts the background runner, which
 * resumes tasks a restart interrupted (once their lease expires, within seconds), runs audits,
 * imports, re-checks and mail, and queues the daily digest of findings due soon.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { startTaskRunner } = await import("./lib/server/task-runner");
  startTaskRunner();
}
