import Link from "next/link";
import { redirect } from "next/navigation";
import { ROLE_LABELS, rolesOf } from "@coldtrail/core";
import { currentActor } from "@/lib/auth/current-actor";
import { Logo } from "@/components/logo";
import { AppNav, type NavItem } from "@/components/app-nav";
import { Providers } from "@/components/providers";
import { SignOutButton } from "@/components/sign-out-button";

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { actor, ability } = signedIn;

  // Navigation by role: only what this person can use.
  const nav: NavItem[] = [{ href: "/", label: "Overview" }];
  if (ability.can("read", "Job")) nav.push({ href: "/jobs", label: "Jobs" });
  if (ability.can("create", "Job")) nav.push({ href: "/jobs/new", label: "Log a job" });

  const roles = rolesOf(actor).map((r) => ROLE_LABELS[r]).join(", ");

  return (
    <Providers rules={ability.rules}>
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2">
        Skip to content
      </a>
      <header className="bg-ink-900 text-white">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
          <Link href="/" className="shrink-0" aria-label="Coldtrail overview">
            <Logo tone="light" />
          </Link>
          <div className="order-3 w-full sm:order-none sm:w-auto sm:flex-1">
            <AppNav items={nav} />
          </div>
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="hidden text-right leading-tight md:block">
              <span className="block font-medium" data-testid="signed-in-name">{actor.name}</span>
              <span className="block text-xs text-ink-300">{roles}</span>
            </span>
            <SignOutButton />
          </div>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-7xl px-4 py-6">
        {children}
      </main>
    </Providers>
  );
}
