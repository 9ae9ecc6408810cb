import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { AuditsList } from "@/components/findings/audits-list";

export const metadata: Metadata = { title: "Audits" };

export default async function AuditsPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "Audit")) redirect("/");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Audits</h1>
          <p className="text-sm text-ink-600">
            Each audit checks the records of the branches it covers against the rules; its findings stay the same findings from one run to
            the next.
          </p>
        </div>
        {signedIn.ability.can("run", "Audit") && (
          <Link href="/audits/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            New audit
          </Link>
        )}
      </div>
      <AuditsList />
    </div>
  );
}
