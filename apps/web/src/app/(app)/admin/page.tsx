import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "./_components/no-access";
import { adminTabs } from "./_components/tabs-for";

export default async function AdminIndex() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const first = adminTabs(signedIn.ability)[0];
  if (!first) return <NoAccess what="running the organisation" />;
  redirect(first.href);
}
