import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { RULE_PACKS } from "@coldtrail/core";
import { listBranches } from "@coldtrail/db";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { NewAuditForm } from "@/components/findings/new-audit-form";

export const metadata: Metadata = { title: "New audit" };

export default async function NewAuditPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("run", "Audit")) redirect("/audits");
  const { actor } = signedIn;
  const branches = await listBranches(db(), { organisationId: actor.organisationId });
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">New audit</h1>
        <p className="text-sm text-ink-600">
          Choose what to check. The audit runs in the background; you can leave the page and come back to it.
        </p>
      </div>
      <NewAuditForm
        branches={branches.map((b) => ({ id: b.id, name: b.name, country: b.country, region: b.region }))}
        defaultPacks={[...RULE_PACKS]}
        today={new Date().toISOString().slice(0, 10)}
      />
    </div>
  );
}
