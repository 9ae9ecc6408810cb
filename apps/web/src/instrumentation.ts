/**
 * Runs once when the server starts (Next.js instrumentation): starts the background runner, which
 * resumes tasks a restart interrupted (once their lease expires, within seconds), runs audits,
 * imports, re-checks and mail, and queues the daily digest of findings due soon.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  try {
    // Refuses development defaults in production (lib/env-check.ts): the server stops here instead.
    await import("./lib/env");
  } catch (err) {
    console.error(err instanceof Error ? err.message : err);
    process.exit(1);
  }
  const { startTaskRunner } = await import("./lib/server/task-runner");
  startTaskRunner();
}
