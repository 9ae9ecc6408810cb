import Link from "next/link";
import { Logo } from "@/components/logo";

/** The frame of the pages reached from an e-mail link, before the person can sign in. */
export function PublicShell({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <main className="min-h-dvh bg-ink-50">
      <header className="bg-ink-900 px-6 py-4">
        <Link href="/sign-in" aria-label="Coldtrail sign-in">
          <Logo tone="light" />
        </Link>
      </header>
      <div className="mx-auto max-w-md px-6 py-10">
        <h1 className="text-2xl font-semibold text-ink-950">{title}</h1>
        <div className="mt-4 space-y-4">{children}</div>
      </div>
    </main>
  );
}

/** Why a link cannot be used, with where to go next. */
export function LinkRefused({ message, next }: { message: string; next: { href: string; label: string }[] }) {
  return (
    <div role="alert" className="space-y-4 rounded-lg border border-sev-critical/40 bg-white p-5">
      <p className="flex items-start gap-2 font-medium text-sev-critical">
        <span aria-hidden="true">⚠</span>
        <span data-testid="link-refused">{message}</span>
      </p>
      <div className="flex flex-wrap gap-3">
        {next.map((n) => (
          <Link key={n.href} href={n.href} className="font-medium text-fjord-700 underline">
            {n.label}
          </Link>
        ))}
      </div>
    </div>
  );
}
