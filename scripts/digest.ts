/**
 * `pnpm digest`: sends today's digest e-mail — each person's findings that are overdue or due within
 * 7 days — for every organisation, once a day per person (a second run the same day sends nothing
 * new). The running server sends it by itself each morning (apps/web/src/instrumentation.ts); this
 * script is for cron or a manual send. It reads the same settings as the app: COLDTRAIL_DB, SMTP_HOST,
 * SMTP_PORT, MAIL_FROM and NEXTAUTH_URL (defaults: the local database and the local SMTP fake).
 */
// The app's mail and settings modules are marked `import "server-only"`; the package.json script runs
// this file with NODE_OPTIONS=--conditions=react-server so that marker resolves to its empty module
// (a command-line script is a server too). They are imported dynamically, as ES modules, for that.

async function main(): Promise<void> {
  const { closeDb, getDb } = await import("../packages/db/src/index");
  const { sendDailyDigests } = await import("../apps/web/src/lib/server/finding-mail");
  const started = performance.now();
  try {
    const { sent, people } = await sendDailyDigests(getDb());
    console.log(
      `Digest: ${sent} e-mail(s) sent to ${people} person(s) with findings due within 7 days or overdue (${((performance.now() - started) / 1000).toFixed(1)} s)`,
    );
  } finally {
    await closeDb();
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
