import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { subject } from "@casl/ability";
import { currentActor } from "@/lib/auth/current-actor";
import { CardsTable } from "./_components/cards-table";
import { MyCards } from "./_components/my-cards";

export const metadata: Metadata = { title: "Certification cards" };

export default async function CertificationsPage({ searchParams }: { searchParams: Promise<{ uploaded?: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { actor, ability } = signedIn;
  const own = { organisationId: actor.organisationId, userId: actor.userId };
  const uploads = ability.can("create", subject("Certification", own));
  const verifies = ability.can("verify", "Certification");
  const readsOthers =
    ability.can("read", "Certification") &&
    (verifies || ability.rulesFor("read", "Certification").some((r) => !r.conditions || !("userId" in r.conditions)));
  if (!uploads && !ability.can("read", "Certification")) redirect("/");
  const { uploaded } = await searchParams;

  return (
    <div className="space-y-8">
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Certification cards</h1>
        <p className="text-sm text-ink-600">
          Section 608 technician certifications. Only cards the compliance officer has verified count when the rules check who may work on
          an appliance.
        </p>
      </div>

      {uploaded && (
        <p role="status" className="flex items-center gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-ok">
          <span aria-hidden="true">✓</span> Card uploaded. It is awaiting verification by the compliance officer.
        </p>
      )}

      {uploads && (
        <section aria-labelledby="mine-h" className="max-w-xl space-y-3">
          <div className="flex flex-wrap items-center justify-between gap-3">
            <h2 id="mine-h" className="text-lg font-semibold text-ink-950">
              Your cards
            </h2>
            <Link
              href="/certifications/new"
              className="flex min-h-12 items-center rounded-lg bg-fjord-600 px-5 py-3 font-semibold text-white hover:bg-fjord-700"
            >
              Add a card
            </Link>
          </div>
          <MyCards />
        </section>
      )}

      {readsOthers && (
        <section aria-labelledby="queue-h" className="space-y-3">
          <h2 id="queue-h" className="text-lg font-semibold text-ink-950">
            {verifies ? "Verification queue" : "Cards of your branches' technicians"}
          </h2>
          {verifies && (
            <p className="text-sm text-ink-600">
              Open a card to see it large, then verify it or say why it is not accepted. The technician is told by e-mail and in the app.
            </p>
          )}
          <CardsTable queue={verifies} caption={verifies ? "Certification cards to verify" : "Certification cards"} />
        </section>
      )}
    </div>
  );
}
