"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { subject } from "@casl/ability";
import { formatMass } from "@coldtrail/core";
import type { ShipmentDetail } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { LoadError } from "@/components/detail";
import { useAbility } from "@/components/providers";
import { SavedNotice } from "../../jobs/_components/form-bits";
import { AmendPanel, AmendmentHistory, VoidPanel, VoidedBanner } from "../../jobs/_components/record-history";

const FIELD_WORDS: Record<string, string> = {
  shipped_on: "Date shipped",
  reclaimer_name: "Reclaimer",
  reclaimer_address: "Reclaimer's address",
  reference: "Reference",
  notes: "Notes",
};

export function ShipmentView({ id, saved }: { id: string; saved: boolean }) {
  const ability = useAbility();
  const q = useQuery({
    queryKey: ["shipment", id],
    queryFn: () => fetchJson<ShipmentDetail>(`/api/shipments/${encodeURIComponent(id)}`),
    retry: false,
  });
  if (q.isLoading) return <p className="text-ink-600">Loading the shipment…</p>;
  if (q.isError || !q.data) {
    return <LoadError error={q.error} noun="shipment" />;
  }
  const s = q.data;
  const where = subject("ReclaimShipment", { organisationId: s.organisationId, branchId: s.branchId });
  const totals = new Map<string, number>();
  for (const l of s.lines) totals.set(l.refrigerant, (totals.get(l.refrigerant) ?? 0) + l.massG);
  const invalidate = [["shipment", id], ["shipments"], ["lookup-cylinders"]];
  return (
    <article className="mx-auto max-w-2xl space-y-4">
      <Link href="/shipments" className="text-sm text-fjord-700 underline">
        ← All shipments
      </Link>
      {saved && <SavedNotice>Shipment saved; the cylinders are empty on record.</SavedNotice>}
      <header>
        <p className="text-sm font-medium uppercase tracking-wide text-ink-600">
          Reclaim shipment #{s.id} · {s.branchName}
        </p>
        <h1 className="text-2xl font-semibold text-ink-950">
          {s.lines.length} cylinder{s.lines.length === 1 ? "" : "s"} to {s.reclaimerName} on {s.shippedOn}
        </h1>
      </header>
      <VoidedBanner at={s.voidedAt} reason={s.voidReason} />
      <section aria-labelledby="lines-h" className="rounded-lg border border-ink-200 bg-white p-4">
        <h2 id="lines-h" className="text-lg font-semibold text-ink-950">
          What was shipped
        </h2>
        <table className="mt-2 min-w-full text-sm" data-testid="shipment-lines">
          <thead className="text-left text-xs uppercase tracking-wide text-ink-600">
            <tr>
              <th scope="col" className="py-1 pr-3">
                Cylinder
              </th>
              <th scope="col" className="py-1 pr-3">
                Refrigerant
              </th>
              <th scope="col" className="py-1">
                Quantity
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {s.lines.map((l) => (
              <tr key={l.id}>
                <td className="py-1 pr-3">{l.cylinderSerial ?? "—"}</td>
                <td className="py-1 pr-3">{l.refrigerant}</td>
                <td className="py-1 tabular">{formatMass(l.massG, s.branchMassUnit)}</td>
              </tr>
            ))}
          </tbody>
          <tfoot className="border-t-2 border-ink-200 font-semibold">
            {[...totals.entries()].map(([r, g]) => (
              <tr key={r}>
                <td className="py-1 pr-3">Total</td>
                <td className="py-1 pr-3">{r}</td>
                <td className="py-1 tabular">{formatMass(g, s.branchMassUnit)}</td>
              </tr>
            ))}
          </tfoot>
        </table>
      </section>
      <dl className="divide-y divide-ink-100 rounded-lg border border-ink-200 bg-white px-4">
        {[
          ["Reclaimer", s.reclaimerName],
          ["Address", s.reclaimerAddress ?? "—"],
          ["Reference", s.reference ?? "—"],
          ["Notes", s.notes ?? "—"],
          [
            "Recorded",
            `${new Date(s.createdAt).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" })} by ${s.createdByName}`,
          ],
        ].map(([label, value]) => (
          <div key={label} className="grid gap-x-3 gap-y-0.5 py-2 sm:grid-cols-[11rem_1fr]">
            <dt className="text-sm font-medium text-ink-600">{label}</dt>
            <dd className="text-ink-950">{value}</dd>
          </div>
        ))}
      </dl>
      {!s.voidedAt && (
        <div className="flex flex-wrap items-start gap-3">
          {ability.can("update", where) && (
            <AmendPanel
              url={`/api/shipments/${s.id}`}
              invalidate={invalidate}
              title="Correct this shipment"
              fields={[
                { name: "shippedOn", label: "Date shipped", type: "date", value: s.shippedOn },
                { name: "reclaimerName", label: "Reclaimer", type: "text", value: s.reclaimerName },
                { name: "reclaimerAddress", label: "Reclaimer's address", type: "textarea", value: s.reclaimerAddress },
                { name: "reference", label: "Reference", type: "text", value: s.reference },
                { name: "notes", label: "Notes", type: "textarea", value: s.notes },
              ]}
            />
          )}
          {ability.can("void", where) && <VoidPanel url={`/api/shipments/${s.id}/void`} invalidate={invalidate} what="shipment" />}
        </div>
      )}
      <AmendmentHistory amendments={s.amendments} fieldWords={FIELD_WORDS} massUnit={s.branchMassUnit} />
    </article>
  );
}
