import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { listBranches } from "@coldtrail/db";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { PackCoverage } from "./pack-coverage";
import { NoAccess } from "../_components/no-access";
import { SettingsForm } from "./settings-form";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { ability, actor } = signedIn;
  if (!ability.can("read", "Settings")) return <NoAccess what="the organisation's settings" />;
  const canEdit = ability.can("update", "Settings");
  const branches = await listBranches(db(), { organisationId: actor.organisationId });
  return (
    <div className="mx-auto max-w-3xl space-y-4">
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Settings</h1>
        <p className="text-sm text-ink-600">
          Which rules the audits apply where, and the choices those rules leave to the company. Each starts at the value shown as the
          default.
          {!canEdit && " Only an owner can change them."}
        </p>
      </div>
      <PackCoverage branches={branches} canEditBranches={ability.can("update", "Branch")} />
      <SettingsForm canEdit={canEdit} />
    </div>
  );
}
