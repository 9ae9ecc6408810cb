"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { useMutation } from "@tanstack/react-query";
import { packsForPlace, type RulePack } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { useIdempotencyKey } from "@/lib/client/idempotency";

const PACKS: { id: RulePack; label: string; hint: string }[] = [
  { id: "us_federal", label: "US federal", hint: "Clean Air Act section 608 (40 CFR 82 Subpart F) and the AIM Act (40 CFR 84)" },
  { id: "eu", label: "EU", hint: "Regulation (EU) 2024/573: leak checks and leak-detection systems" },
];

export function NewAuditForm({
  branches,
  defaultPacks,
  today,
}: {
  branches: { id: number; name: string; country: string; region: string | null }[];
  defaultPacks: RulePack[];
  today: string;
}) {
  const router = useRouter();
  // Choices are enabled once the page is interactive, so a click made before then is never lost.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);
  const threeYearsBack = `${Number(today.slice(0, 4)) - 3}${today.slice(4)}`;
  const [branchIds, setBranchIds] = useState<number[]>(branches.map((b) => b.id));
  const [periodFrom, setFrom] = useState(threeYearsBack);
  const [periodTo, setTo] = useState(today);
  const [packs, setPacks] = useState<RulePack[]>(defaultPacks.length ? defaultPacks : ["us_federal"]);
  const idem = useIdempotencyKey();
  const start = useMutation({
    // The branches sent are the boxes ticked on the screen, read from the form itself.
    mutationFn: (chosen: number[]) =>
      fetchJson<{ id: number }>("/api/audits", {
        method: "POST",
        headers: idem.headers,
        body: JSON.stringify({ branchIds: chosen, periodFrom, periodTo, packs }),
      }),
    onSuccess: ({ id }) => router.push(`/audits/${id}`),
  });
  const fields = start.error instanceof ApiError ? start.error.fieldErrors : {};
  const message = start.error ? (start.error instanceof ApiError ? start.error.message : "The audit could not be started") : null;
  const all = branchIds.length === branches.length;
  const toggle = (id: number) => setBranchIds((ids) => (ids.includes(id) ? ids.filter((x) => x !== id) : [...ids, id]));
  const chosenBranches = branches.filter((b) => branchIds.includes(b.id));
  const coverage = (pack: RulePack) => {
    const covered = chosenBranches.filter((b) => packsForPlace({ country: b.country, region: b.region }).includes(pack));
    if (chosenBranches.length === 0) return "";
    if (covered.length === 0) return "Applies to none of the chosen branches.";
    return `Applies to ${covered.length === chosenBranches.length ? "every chosen branch" : covered.map((b) => b.name).join(", ")}.`;
  };
  const error = (key: string) =>
    fields[key]?.length ? (
      <p id={`${key}-error`} className="mt-1 text-sm text-sev-critical">
        <span aria-hidden="true">⚠ </span>
        {fields[key].join(" ")}
      </p>
    ) : null;

  return (
    <form
      aria-busy={!ready}
      className="max-w-2xl space-y-5 rounded-lg border border-ink-200 bg-white p-5"
      onSubmit={(e) => {
        e.preventDefault();
        const ticked = new FormData(e.currentTarget).getAll("branchId").map(Number);
        setBranchIds(ticked);
        start.mutate(ticked);
      }}
    >
      <fieldset aria-describedby="branchIds-error">
        <legend className="font-semibold text-ink-950">Branches</legend>
        <label className="mt-2 flex items-center gap-2 text-sm font-medium">
          <input
            type="checkbox"
            className="h-4 w-4"
            disabled={!ready}
            checked={all}
            onChange={() => setBranchIds(all ? [] : branches.map((b) => b.id))}
          />
          All branches ({branches.length})
        </label>
        <div className="mt-2 grid gap-2 sm:grid-cols-2">
          {branches.map((b) => (
            <label key={b.id} className="flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                name="branchId"
                value={b.id}
                className="h-4 w-4"
                disabled={!ready}
                checked={branchIds.includes(b.id)}
                onChange={() => toggle(b.id)}
              />
              {b.name}
            </label>
          ))}
        </div>
        <p className="mt-2 text-sm text-ink-700" aria-live="polite" data-testid="audit-scope">
          {branchIds.length === 0
            ? "No branch chosen."
            : all
              ? `Audits all ${branches.length} branches.`
              : `Audits ${branchIds.length} of ${branches.length} branches: ${branches
                  .filter((b) => branchIds.includes(b.id))
                  .map((b) => b.name)
                  .join(", ")}.`}
        </p>
        {error("branchIds")}
      </fieldset>

      <fieldset>
        <legend className="font-semibold text-ink-950">Period</legend>
        <p className="text-sm text-ink-600">
          Dates are inclusive and read in each branch&apos;s time zone. Records are kept for three years, so three years is the default.
        </p>
        <div className="mt-2 grid gap-3 sm:grid-cols-2">
          <label className="text-sm">
            <span className="block font-medium text-ink-700">From</span>
            <input
              type="date"
              value={periodFrom}
              onChange={(e) => setFrom(e.target.value)}
              required
              className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2"
              aria-describedby="periodFrom-error"
            />
            {error("periodFrom")}
          </label>
          <label className="text-sm">
            <span className="block font-medium text-ink-700">To</span>
            <input
              type="date"
              value={periodTo}
              onChange={(e) => setTo(e.target.value)}
              required
              className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2"
              aria-describedby="periodTo-error"
            />
            {error("periodTo")}
          </label>
        </div>
      </fieldset>

      <fieldset aria-describedby="packs-error">
        <legend className="font-semibold text-ink-950">Rule packs</legend>
        <p className="text-sm text-ink-600">Each branch is checked only against the packs that apply where it is.</p>
        <div className="mt-2 space-y-2">
          {PACKS.map((p) => (
            <label key={p.id} className="flex items-start gap-2 text-sm">
              <input
                type="checkbox"
                className="mt-0.5 h-4 w-4"
                checked={packs.includes(p.id)}
                onChange={() => setPacks((xs) => (xs.includes(p.id) ? xs.filter((x) => x !== p.id) : [...xs, p.id]))}
              />
              <span>
                <span className="font-medium">{p.label}</span> <span className="text-ink-600">— {p.hint}</span>
                <span className="block text-ink-600">{coverage(p.id)}</span>
              </span>
            </label>
          ))}
        </div>
        {error("packs")}
      </fieldset>

      {message && !Object.keys(fields).length && (
        <p role="alert" className="text-sm text-sev-critical">
          ⚠ {message}
        </p>
      )}
      <button
        type="submit"
        disabled={start.isPending || !ready || branchIds.length === 0}
        className="rounded-md bg-fjord-600 px-5 py-2.5 font-semibold text-white hover:bg-fjord-700 disabled:opacity-40"
      >
        {start.isPending ? "Starting…" : "Start the audit"}
      </button>
    </form>
  );
}
