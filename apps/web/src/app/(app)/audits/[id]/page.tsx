import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { AuditDetail } from "@/components/findings/audit-view";

export const metadata: Metadata = { title: "Audit" };

export default async function AuditPage({ params }: { params: Promise<{ id: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { ability } = signedIn;
  if (ability.cannot("read", "Audit")) redirect("/");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  return (
    <AuditDetail
      id={id}
      canRun={ability.can("run", "Audit")}
      canExport={ability.can("export", "Audit")}
      canAssign={ability.can("assign", "Finding")}
      today={new Date().toISOString().slice(0, 10)}
    />
  );
}
