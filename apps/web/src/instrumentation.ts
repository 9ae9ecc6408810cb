/**
 * Runs once when the server starts (Next.js instrumentation): resumes audits a restart interrupted,
 * keeps the audit runner's watchdog going, and starts the daily digest of findings due soon.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { startAuditRunner } = await import("./lib/server/audit-runner");
  const { startDigestScheduler } = await import("./lib/server/digest-scheduler");
  startAuditRunner();
  startDigestScheduler();
}
