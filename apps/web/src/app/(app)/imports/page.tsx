import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { ImportsTable } from "./_components/imports-table";
import { TemplateLinks } from "./_components/template-links";

export const metadata: Metadata = { title: "Spreadsheet import" };

export default async function ImportsPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { ability } = signedIn;
  if (ability.cannot("read", "Import")) redirect("/");
  const canImport = ability.can("create", "Import");
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Spreadsheet import</h1>
          <p className="max-w-2xl text-sm text-ink-600">
            Bring appliances, recovery cylinders or past jobs in from an Excel workbook (.xlsx) or a CSV file. Every row is checked first;
            you see which rows have problems and why, and only the valid rows are imported, all together.
          </p>
        </div>
        {canImport && (
          <Link href="/imports/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Start an import
          </Link>
        )}
      </div>
      {canImport && (
        <section aria-labelledby="templates-h" className="space-y-2">
          <h2 id="templates-h" className="font-semibold text-ink-950">
            Templates
          </h2>
          <TemplateLinks />
        </section>
      )}
      <section aria-labelledby="past-h" className="space-y-2">
        <h2 id="past-h" className="font-semibold text-ink-950">
          Imports
        </h2>
        <ImportsTable />
      </section>
    </div>
  );
}
