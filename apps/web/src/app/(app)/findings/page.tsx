import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { findingViewQuery, FINDING_STATE_EXPLANATIONS, FINDING_STATE_LABELS, FINDING_STATES } from "@coldtrail/core";
import { currentActor } from "@/lib/auth/current-actor";
import { FindingsTable } from "@/components/findings/findings-table";
import { StateIcon } from "@/components/findings/finding-badges";

export const metadata: Metadata = { title: "Findings" };

export default async function FindingsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { ability } = signedIn;
  if (ability.cannot("read", "Finding")) redirect("/");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const parsed = findingViewQuery.safeParse(raw);
  const initial = parsed.success ? Object.fromEntries(Object.entries(parsed.data).filter(([, v]) => v !== undefined)) : {};
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Findings</h1>
        <p className="text-sm text-ink-600">
          Every gap the rules found in the records you may see. Filter, sort and group them; officers assign them to the branch that fixes
          them.
        </p>
      </div>
      <details className="rounded-lg border border-ink-200 bg-white px-3 py-2 text-sm">
        <summary className="cursor-pointer font-medium text-ink-800">What the statuses mean</summary>
        <ul className="mt-2 space-y-1">
          {FINDING_STATES.map((s) => (
            <li key={s} className="flex items-start gap-2">
              <StateIcon state={s} className="mt-0.5 h-4 w-4 shrink-0 text-ink-700" />
              <span>
                <strong>{FINDING_STATE_LABELS[s]}</strong> — {FINDING_STATE_EXPLANATIONS[s]}
              </span>
            </li>
          ))}
        </ul>
      </details>
      <FindingsTable initial={initial} canAssign={ability.can("assign", "Finding")} syncUrl today={new Date().toISOString().slice(0, 10)} />
    </div>
  );
}
