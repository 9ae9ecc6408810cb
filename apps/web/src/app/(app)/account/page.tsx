import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { ROLE_LABELS, rolesOf } from "@coldtrail/core";
import { countOpenSessions, getSessionIdleSettings } from "@coldtrail/db";
import { idleMinutesFor } from "@coldtrail/core";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { ChangePasswordForm, SignOutEverywhere } from "./account-forms";

export const metadata: Metadata = { title: "Your account" };

/** The signed-in person's own account: who they are, their password, and their sessions. */
export default async function AccountPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { actor } = signedIn;
  const roles = rolesOf(actor);
  const [open, idle] = await Promise.all([countOpenSessions(db(), actor.userId), getSessionIdleSettings(db(), actor.organisationId)]);
  return (
    <div className="max-w-2xl space-y-8">
      <header>
        <h1 className="text-2xl font-semibold text-ink-950">Your account</h1>
        <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-ink-600">Name</dt>
          <dd className="text-ink-950">{actor.name}</dd>
          <dt className="text-ink-600">E-mail</dt>
          <dd className="break-all text-ink-950" data-testid="account-email">
            {actor.email}
          </dd>
          <dt className="text-ink-600">Roles</dt>
          <dd className="text-ink-950">{roles.map((r) => ROLE_LABELS[r]).join(", ")}</dd>
        </dl>
      </header>

      <section aria-labelledby="password-heading" className="rounded-lg border border-ink-200 bg-white p-5">
        <h2 id="password-heading" className="text-lg font-semibold text-ink-950">
          Change your password
        </h2>
        <p className="mt-1 text-sm text-ink-600">Changing it signs you out everywhere; this page signs you in again with the new one.</p>
        <div className="mt-4">
          <ChangePasswordForm />
        </div>
      </section>

      <section aria-labelledby="sessions-heading" className="rounded-lg border border-ink-200 bg-white p-5">
        <h2 id="sessions-heading" className="text-lg font-semibold text-ink-950">
          Where you are signed in
        </h2>
        <p className="mt-1 text-sm text-ink-700" data-testid="open-sessions">
          {open === 1 ? "1 open session (this one)." : `${open} open sessions, this one included.`} A session ends when you sign out, after{" "}
          {idleMinutesFor(roles, idle)} minutes without use, or 12 hours after signing in.
        </p>
        <p className="mt-1 text-sm text-ink-600">
          Lost a phone or signed in on a shared computer? Sign out everywhere: every session ends at once, this one too.
        </p>
        <div className="mt-4">
          <SignOutEverywhere />
        </div>
      </section>
    </div>
  );
}
