import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { AdminTabs } from "./_components/admin-tabs";
import { adminTabs } from "./_components/tabs-for";

export default async function AdminLayout({ children }: { children: React.ReactNode }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const tabs = adminTabs(signedIn.ability);
  return (
    <div className="space-y-5">
      {tabs.length > 1 && <AdminTabs tabs={tabs} />}
      {children}
    </div>
  );
}
