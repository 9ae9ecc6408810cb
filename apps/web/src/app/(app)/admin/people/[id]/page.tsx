import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "../../_components/no-access";
import { PersonDetail } from "./person-detail";

export const metadata: Metadata = { title: "Person" };

export default async function PersonPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ mail?: string }>;
}) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { ability, actor } = signedIn;
  if (!ability.can("read", "User")) return <NoAccess what="the list of people" />;
  const { id } = await params;
  const { mail } = await searchParams;
  return (
    <div className="space-y-4">
      <Link href="/admin/people" className="text-sm text-fjord-700 underline">
        ← People
      </Link>
      <PersonDetail
        id={id}
        selfId={actor.userId}
        mailFailed={mail === "failed"}
        can={{
          editAccess: ability.can("update", "Membership"),
          activate: ability.can("update", "User"),
          invite: ability.can("invite", "User"),
          readCertifications: ability.can("read", "Certification"),
          readJobs: ability.can("read", "Job"),
          readHistory: ability.can("read", "Activity"),
          readGrants: ability.can("read", "InspectorGrant"),
        }}
      />
    </div>
  );
}
