import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { ImportUploadForm } from "./import-upload-form";

export const metadata: Metadata = { title: "Start an import" };

export default async function NewImportPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("create", "Import")) redirect("/imports");
  return (
    <div className="mx-auto max-w-2xl">
      <Link href="/imports" className="text-sm text-fjord-700 underline">
        ← Spreadsheet import
      </Link>
      <h1 className="mt-2 text-2xl font-semibold text-ink-950">Start an import</h1>
      <p className="mb-5 text-ink-600">
        Choose what the file holds and the branch it belongs to. Nothing is imported until you have seen the check.
      </p>
      <ImportUploadForm />
    </div>
  );
}
