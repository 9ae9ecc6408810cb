import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { subject } from "@casl/ability";
import { currentActor } from "@/lib/auth/current-actor";
import { CardUploadForm } from "./card-upload-form";

export const metadata: Metadata = { title: "Add a certification card" };

export default async function NewCardPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { actor, ability } = signedIn;
  if (ability.cannot("create", subject("Certification", { organisationId: actor.organisationId, userId: actor.userId })))
    redirect("/certifications");
  return (
    <div className="mx-auto max-w-xl">
      <Link href="/certifications" className="text-sm text-fjord-700 underline">
        ← Certification cards
      </Link>
      <h1 className="mt-2 text-2xl font-semibold text-ink-950">Add a certification card</h1>
      <p className="mb-5 text-ink-600">
        A clear photo of your Section 608 card, with what it says. The compliance officer checks it before it counts.
      </p>
      <CardUploadForm />
    </div>
  );
}
