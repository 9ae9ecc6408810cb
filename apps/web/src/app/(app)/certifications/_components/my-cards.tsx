"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { CERTIFICATION_TYPE_LABELS } from "@coldtrail/core";
import { fetchJson } from "@/lib/client/fetch-json";
import { CardState } from "./card-state";
import { CardThumb } from "./card-image";
import type { CardPage } from "./card-types";

/** The signed-in person's own cards, newest first, as large touch targets. */
export function MyCards() {
  const cards = useQuery({
    queryKey: ["certifications", "mine"],
    queryFn: () => fetchJson<CardPage>("/api/certifications?mine=1&sort=uploadedAt&dir=desc&pageSize=50"),
  });
  if (cards.isLoading) return <p className="text-ink-600">Loading your cards…</p>;
  if (cards.isError)
    return (
      <p role="alert" className="text-sev-critical">
        ⚠ Your cards could not be loaded: {cards.error.message}
      </p>
    );
  const rows = cards.data?.rows ?? [];
  if (rows.length === 0) {
    return (
      <p className="rounded-lg border border-dashed border-ink-300 bg-white p-4 text-ink-700">
        You have no certification card on file yet. Add a photo of your card so your work counts.
      </p>
    );
  }
  return (
    <ul className="space-y-3" aria-label="Your certification cards">
      {rows.map((c) => (
        <li key={c.id}>
          <Link
            href={`/certifications/${c.id}`}
            className="flex min-h-20 gap-3 rounded-lg border border-ink-200 bg-white p-3 hover:border-fjord-600"
            data-testid="my-card"
          >
            <CardThumb id={c.id} mime={c.cardMime} hasThumbnail={c.hasThumbnail} label={`Your card ${c.certificateNumber}`} />
            <span className="min-w-0 flex-1">
              <span className="block font-semibold text-ink-950">{c.types.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" + ")}</span>
              <span className="block truncate text-sm text-ink-600">
                {c.certifyingOrganisation} · no. {c.certificateNumber}
              </span>
              <span className="mt-1 block">
                <CardState state={c.state} />
              </span>
              {c.state === "rejected" && c.rejectionReason && (
                <span className="mt-1 block text-sm text-sev-critical">Reason: {c.rejectionReason}</span>
              )}
            </span>
          </Link>
        </li>
      ))}
    </ul>
  );
}
