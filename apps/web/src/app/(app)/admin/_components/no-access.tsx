import Link from "next/link";

/** Shown instead of a page the signed-in person may not use (the API refuses it as well). */
export function NoAccess({ what }: { what: string }) {
  return (
    <div role="alert" className="mx-auto max-w-xl rounded-lg border border-ink-200 bg-white p-6">
      <p className="flex items-center gap-2 text-lg font-semibold text-ink-950">
        <span aria-hidden="true">⊘</span> Not available to you
      </p>
      <p className="mt-2 text-ink-700">Your role does not include {what}. If you think it should, ask your organisation&apos;s owner.</p>
      <Link href="/" className="mt-4 inline-block font-medium text-fjord-700 underline">
        Back to the overview
      </Link>
    </div>
  );
}
