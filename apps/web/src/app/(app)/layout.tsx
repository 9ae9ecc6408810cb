import Link from "next/link";
import { redirect } from "next/navigation";
import { ROLE_LABELS, rolesOf } from "@coldtrail/core";
import { currentActor } from "@/lib/auth/current-actor";
import { Logo } from "@/components/logo";
import { AppNav, type NavItem } from "@/components/app-nav";
import { Providers } from "@/components/providers";
import { SignOutButton } from "@/components/sign-out-button";
import { NotificationsBell } from "@/components/notifications-bell";

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { actor, ability } = signedIn;

  // Navigation by role: only what this person can use.
  const nav: NavItem[] = [{ href: "/", label: "Overview", group: "Work" }];
  // Audits and findings (audits engineer): runs, the findings workflow and branch dashboards.
  if (ability.can("read", "Audit")) nav.push({ href: "/audits", label: "Audits", group: "Compliance" });
  if (ability.can("read", "Finding")) nav.push({ href: "/findings", label: "Findings", group: "Compliance" });
  if (
    ability.can("read", "Finding") &&
    ability.can("read", "Branch") &&
    !ability.rulesFor("read", "Finding").every((r) => r.conditions && "technicianId" in r.conditions)
  )
    nav.push({ href: "/branches", label: "Branch dashboards", group: "Compliance" });
  if (ability.can("read", "Job")) nav.push({ href: "/jobs", label: "Jobs", group: "Work" });
  if (ability.can("create", "Job")) nav.push({ href: "/jobs/new", label: "Log a job", group: "Work" });
  // Records kept beside jobs (jobs engineer): disposals, reclaim shipments, purchases.
  if (ability.can("read", "Disposal")) nav.push({ href: "/disposals", label: "Disposals", group: "Work" });
  if (ability.can("read", "ReclaimShipment")) nav.push({ href: "/shipments", label: "Shipments", group: "Work" });
  if (ability.can("read", "Purchase")) nav.push({ href: "/purchases", label: "Purchases", group: "Work" });
  // Registers: appliances, cylinders, recovery equipment for whoever may read them.
  if (ability.can("read", "Appliance")) nav.push({ href: "/appliances", label: "Appliances", group: "Registers" });
  if (ability.can("read", "Cylinder")) nav.push({ href: "/cylinders", label: "Cylinders", group: "Registers" });
  if (ability.can("read", "RecoveryEquipment")) nav.push({ href: "/equipment", label: "Equipment", group: "Registers" });
  // Running the organisation: people for whoever may read them; branches, inspector access and settings under the same tab.
  if (ability.can("update", "Branch") || ability.can("read", "Settings") || ability.can("read", "InspectorGrant"))
    nav.push({ href: "/admin", label: "Organisation", group: "Organisation" });
  else if (ability.can("read", "User")) nav.push({ href: "/admin", label: "People", group: "Organisation" });
  // Certification cards and spreadsheet import.
  if (ability.can("read", "Certification") || ability.can("create", "Certification"))
    nav.push({ href: "/certifications", label: "Certifications", group: "Compliance" });
  if (ability.can("create", "Import")) nav.push({ href: "/imports", label: "Import", group: "Organisation" });

  const roles = rolesOf(actor)
    .map((r) => ROLE_LABELS[r])
    .join(", ");

  return (
    <Providers rules={ability.rules}>
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2"
      >
        Skip to content
      </a>
      <header className="sticky top-0 z-30 h-14 bg-ink-900 text-white">
        <div className="flex h-full items-center gap-4 px-4">
          <Link href="/" className="shrink-0" aria-label="Coldtrail overview">
            <Logo tone="light" />
          </Link>
          <div className="ml-auto flex items-center gap-3 text-sm">
            <Link href="/account" className="rounded text-right leading-tight hover:underline" title="Your account: password and sessions">
              <span className="hidden md:block">
                <span className="block font-medium" data-testid="signed-in-name">
                  {actor.name}
                </span>
                <span className="block text-xs text-ink-300">{roles}</span>
              </span>
              <span className="md:hidden">Account</span>
            </Link>
            {ability.can("read", "Branch") && <NotificationsBell />}
            <SignOutButton />
          </div>
        </div>
      </header>
      <div className="lg:flex">
        <AppNav items={nav} />
        <main id="main" className="min-w-0 flex-1 px-4 py-6 lg:px-8">
          <div className="mx-auto max-w-7xl">{children}</div>
        </main>
      </div>
    </Providers>
  );
}
