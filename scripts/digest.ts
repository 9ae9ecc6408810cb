/**
 * `pnpm digest`: sends today's digest e-mail — each person's findings that are overdue or due within
 * 7 days — for every organisation, once a day per person (a second run the same day sends nothing
 * new). The running server queues it by itself each morning (its background runner); this script is
 * for cron or a manual send: it queues the digests in the mail outbox and delivers the outbox's mail
 * before it exits (mail that SMTP refuses stays queued for the server's runner to retry). It reads the same settings as the app: COLDTRAIL_DB, SMTP_HOST,
 * SMTP_PORT, MAIL_FROM and NEXTAUTH_URL (defaults: the local database and the local SMTP fake).
 */
// The app's mail and settings modules are marked `import "server-only"`; the package.json script runs
// this file with NODE_OPTIONS=--conditions=react-server so that marker resolves to its empty module
// (a command-line script is a server too). They are imported dynamically, as ES modules, for that.

async function main(): Promise<void> {
  const { closeDb, getDb, TaskRunner } = await import("../packages/db/src/index");
  const { sendDailyDigests } = await import("../apps/web/src/lib/server/finding-mail");
  const { mailTask } = await import("../apps/web/src/lib/server/mail");
  const started = performance.now();
  try {
    const { sent, people } = await sendDailyDigests(getDb());
    const delivered = await new TaskRunner(getDb(), { handlers: { mail: mailTask }, owner: "pnpm-digest" }).drain({ kinds: ["mail"] });
    console.log(
      `Digest: ${sent} e-mail(s) queued for ${people} person(s) with findings due within 7 days or overdue; ${delivered} outbox mail(s) handled (${((performance.now() - started) / 1000).toFixed(1)} s)`,
    );
  } finally {
    await closeDb();
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
