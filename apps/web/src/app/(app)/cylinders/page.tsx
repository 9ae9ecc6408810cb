import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { CylindersTable } from "./cylinders-table";

export const metadata: Metadata = { title: "Cylinders" };

export default async function CylindersPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "Cylinder")) redirect("/");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Cylinders</h1>
          <p className="text-sm text-ink-600">
            Recovery cylinders: what each holds against its maximum fill, and when it is due for requalification.
          </p>
        </div>
        {signedIn.ability.can("create", "Cylinder") && (
          <Link href="/cylinders/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Add a cylinder
          </Link>
        )}
      </div>
      <CylindersTable />
    </div>
  );
}
