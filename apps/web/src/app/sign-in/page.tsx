import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { safeNextPath } from "@coldtrail/core";
import { currentActor } from "@/lib/auth/current-actor";
import { env } from "@/lib/env";
import { Logo } from "@/components/logo";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  if (await currentActor()) redirect("/");
  const { next } = await searchParams;
  return (
    <main className="grid min-h-dvh lg:grid-cols-[1fr_1.1fr]">
      <section className="flex flex-col justify-between bg-ink-900 px-8 py-10 text-ink-100 lg:px-14">
        <Logo tone="light" />
        <div className="my-12 max-w-md">
          <h1 className="text-3xl font-semibold tracking-tight text-white">
            Every recovery, every cylinder, every branch — on the record.
          </h1>
          <p className="mt-4 text-ink-300">
            Log the work where it happens. Coldtrail checks it against the refrigerant rules and shows each branch what is missing before an
            inspector asks.
          </p>
        </div>
        <p className="text-sm text-ink-400">Records and checks only: local codes and licensed practice take precedence.</p>
      </section>
      <section className="flex items-center justify-center px-6 py-12">
        <div className="w-full max-w-sm">
          <h2 className="text-2xl font-semibold text-ink-950">Sign in</h2>
          <p className="mt-1 text-sm text-ink-600">Use the email address your company registered for you.</p>
          <SignInForm next={safeNextPath(next, env.NEXTAUTH_URL)} />
          <p className="mt-4 text-sm">
            <Link href="/password/forgot" className="font-medium text-fjord-700 underline">
              Forgot your password?
            </Link>
          </p>
        </div>
      </section>
    </main>
  );
}
