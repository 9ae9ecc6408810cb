import Link from "next/link";
import { RULE_PACK_COVERAGE, RULE_PACK_DESCRIPTIONS, RULE_PACK_LABELS, packsForPlace, placeWords, type RulePack } from "@coldtrail/core";
import type { BranchSummary } from "@coldtrail/db";

/**
 * Which branches each rule pack covers. Packs follow where a branch is (its country and region), so
 * this is read from the branches, not chosen here; a branch's place is changed on its own page.
 */
export function PackCoverage({ branches, canEditBranches }: { branches: BranchSummary[]; canEditBranches: boolean }) {
  const packsOf = new Map(branches.map((b) => [b.id, packsForPlace({ country: b.country, region: b.region })]));
  const uncovered = branches.filter((b) => (packsOf.get(b.id) ?? []).length === 0);
  const link = (b: BranchSummary) =>
    canEditBranches ? (
      <Link href={`/admin/branches/${b.id}`} className="text-fjord-700 underline-offset-2 hover:underline">
        {b.name}
      </Link>
    ) : (
      b.name
    );
  return (
    <section aria-labelledby="pack-coverage-h" className="space-y-3 rounded-lg border border-ink-200 bg-white p-5">
      <div>
        <h2 id="pack-coverage-h" className="text-lg font-semibold text-ink-950">
          Rules the audits apply, by place
        </h2>
        <p className="text-sm text-ink-600">
          Each branch is audited against the rules of the place it is in, from the country and region on the branch&apos;s page. A branch
          never gets findings from rules that do not apply where it is.
        </p>
      </div>
      <ul className="space-y-3">
        {(Object.keys(RULE_PACK_COVERAGE) as RulePack[]).map((pack) => {
          const covered = branches.filter((b) => packsOf.get(b.id)?.includes(pack));
          return (
            <li key={pack} className="rounded-md border border-ink-200 p-3" data-testid={`pack-coverage-${pack}`}>
              <p className="font-medium text-ink-950">{RULE_PACK_LABELS[pack]}</p>
              <p className="text-sm text-ink-600">{RULE_PACK_DESCRIPTIONS[pack]}</p>
              <p className="mt-1 text-sm text-ink-600">Applies to {RULE_PACK_COVERAGE[pack].where}.</p>
              <p className="mt-2 text-sm">
                <span className="font-medium text-ink-800">
                  Covers {covered.length} {covered.length === 1 ? "branch" : "branches"}
                  {covered.length ? ": " : "."}
                </span>
                {covered.map((b, i) => (
                  <span key={b.id}>
                    {i > 0 && ", "}
                    {link(b)} <span className="text-ink-500">({placeWords({ country: b.country, region: b.region })})</span>
                  </span>
                ))}
              </p>
            </li>
          );
        })}
      </ul>
      {uncovered.length > 0 && (
        <p role="note" className="text-sm text-ink-700">
          <span aria-hidden="true">⚠ </span>
          No rule pack covers {uncovered.map((b) => b.name).join(", ")}: audits find nothing there until a pack for its place exists.
        </p>
      )}
    </section>
  );
}
