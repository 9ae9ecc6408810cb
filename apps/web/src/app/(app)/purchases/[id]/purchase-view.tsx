"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { subject } from "@casl/ability";
import { formatMass } from "@coldtrail/core";
import type { PurchaseDetail } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { LoadError } from "@/components/detail";
import { useAbility } from "@/components/providers";
import { SavedNotice } from "../../jobs/_components/form-bits";
import { AmendPanel, AmendmentHistory, VoidPanel, VoidedBanner } from "../../jobs/_components/record-history";

const FIELD_WORDS: Record<string, string> = {
  purchased_on: "Date bought",
  supplier_name: "Supplier",
  mass_g: "Quantity",
  container_count: "Containers",
  invoice_reference: "Invoice reference",
};

export function PurchaseView({ id, saved }: { id: string; saved: boolean }) {
  const ability = useAbility();
  const q = useQuery({
    queryKey: ["purchase", id],
    queryFn: () => fetchJson<PurchaseDetail>(`/api/purchases/${encodeURIComponent(id)}`),
    retry: false,
  });
  if (q.isLoading) return <p className="text-ink-600">Loading the purchase…</p>;
  if (q.isError || !q.data) {
    return <LoadError error={q.error} noun="purchase" />;
  }
  const p = q.data;
  const where = subject("Purchase", { organisationId: p.organisationId, branchId: p.branchId });
  const invalidate = [["purchase", id], ["purchases"]];
  return (
    <article className="mx-auto max-w-2xl space-y-4">
      <Link href="/purchases" className="text-sm text-fjord-700 underline">
        ← All purchases
      </Link>
      {saved && <SavedNotice>Purchase saved.</SavedNotice>}
      <header>
        <p className="text-sm font-medium uppercase tracking-wide text-ink-600">
          Purchase #{p.id} · {p.branchName}
        </p>
        <h1 className="text-2xl font-semibold text-ink-950">
          {formatMass(p.massG, p.branchMassUnit)} {p.refrigerant} from {p.supplierName}
        </h1>
      </header>
      <VoidedBanner at={p.voidedAt} reason={p.voidReason} />
      <dl className="divide-y divide-ink-100 rounded-lg border border-ink-200 bg-white px-4">
        {[
          ["Date bought", p.purchasedOn],
          ["Refrigerant", p.refrigerant],
          ["Quantity", formatMass(p.massG, p.branchMassUnit)],
          ["Containers", p.containerCount ?? "—"],
          ["Invoice", p.invoiceReference ?? "—"],
          [
            "Recorded",
            `${new Date(p.createdAt).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" })} by ${p.createdByName}`,
          ],
        ].map(([label, value]) => (
          <div key={String(label)} className="grid gap-x-3 gap-y-0.5 py-2 sm:grid-cols-[11rem_1fr]">
            <dt className="text-sm font-medium text-ink-600">{label}</dt>
            <dd className="tabular text-ink-950">{value}</dd>
          </div>
        ))}
      </dl>
      {!p.voidedAt && (
        <div className="flex flex-wrap items-start gap-3">
          {ability.can("update", where) && (
            <AmendPanel
              url={`/api/purchases/${p.id}`}
              invalidate={invalidate}
              title="Correct this purchase"
              fields={[
                { name: "purchasedOn", label: "Date bought", type: "date", value: p.purchasedOn },
                { name: "supplierName", label: "Supplier", type: "text", value: p.supplierName },
                {
                  name: "amount",
                  label: "Quantity",
                  type: "mass",
                  value: p.massG,
                  unitField: "unit",
                  massUnit: p.branchMassUnit,
                  entered: p.enteredAmount,
                },
                { name: "containerCount", label: "Containers", type: "number", value: p.containerCount },
                { name: "invoiceReference", label: "Invoice reference", type: "text", value: p.invoiceReference },
              ]}
            />
          )}
          {ability.can("void", where) && <VoidPanel url={`/api/purchases/${p.id}/void`} invalidate={invalidate} what="purchase" />}
        </div>
      )}
      <AmendmentHistory amendments={p.amendments} fieldWords={FIELD_WORDS} massUnit={p.branchMassUnit} />
    </article>
  );
}
