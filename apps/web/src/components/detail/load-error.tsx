import Link from "next/link";
import { ApiError } from "@/lib/client/fetch-json";

/**
 * A record page whose record could not be read: "No such cylinder, or it is not one you may see." for a
 * 404 (which is also what another branch's record answers), otherwise "The cylinder could not be loaded.".
 * With `back`, a box with a link back to the list; without, one line.
 */
export function LoadError({ error, noun, back }: { error: unknown; noun: string; back?: { href: string; label: string } }) {
  const notFound = error instanceof ApiError && error.status === 404;
  const text = notFound ? `No such ${noun}, or it is not one you may see.` : `The ${noun} could not be loaded.`;
  if (!back) return <p role="alert">{text}</p>;
  return (
    <div role="alert" className="rounded-lg border border-ink-200 bg-white p-6">
      <p className="font-semibold">{text}</p>
      <Link href={back.href} className="mt-2 inline-block text-fjord-700 underline">
        {back.label}
      </Link>
    </div>
  );
}
