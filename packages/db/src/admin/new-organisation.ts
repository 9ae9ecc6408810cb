/**
 * Starts a new company: `pnpm exec tsx packages/db/src/admin/new-organisation.ts "Company name" "Owner Name" owner@company.example [app URL]`.
 * Prints the owner's single-use link to set a password; everything else is done in the browser.
 */
import { closeDb, createDb, databaseFile } from "../connection";
import { createOrganisationWithOwner } from "./organisations";

async function main(): Promise<void> {
  const [name, ownerName, ownerEmail, base = process.env.NEXTAUTH_URL ?? "http://127.0.0.1:3000"] = process.argv.slice(2);
  if (!name || !ownerName || !ownerEmail) {
    console.error('Usage: tsx packages/db/src/admin/new-organisation.ts "Company name" "Owner Name" owner@company.example [app URL]');
    process.exitCode = 2;
    return;
  }
  const db = createDb(databaseFile());
  try {
    await db.migrate.latest();
    const created = await createOrganisationWithOwner(db, { name, ownerName, ownerEmail });
    console.log(`Organisation ${created.organisationId} opened. The owner sets a password here (valid until ${created.expiresAt}):`);
    console.log(new URL(`/invitation/${created.token}`, base).toString());
  } finally {
    await db.destroy();
    await closeDb();
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
