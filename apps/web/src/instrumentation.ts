/**
 * Runs once when the server starts (Next.js instrumentation): resumes audits a restart interrupted,
 * keeps the audit runner's watchdog going, and starts the daily digest of findings due soon.
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
  const { startAuditRunner } = await import("./lib/server/audit-runner");
  const { startDigestScheduler } = await import("./lib/server/digest-scheduler");
  startAuditRunner();
  startDigestScheduler();
}
