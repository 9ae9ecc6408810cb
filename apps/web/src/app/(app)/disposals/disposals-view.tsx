"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { formatMass } from "@coldtrail/core";
import type { DisposalListRow, MonthlyDisposalTotals } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import type { BranchOption } from "@/lib/client/types";
import { useBranchOptions } from "@/lib/client/use-branch-options";
import { RecordFilters, RecordTable, VoidTag, type RecordColumn } from "../jobs/_components/record-table";

const recordColumns: RecordColumn<DisposalListRow>[] = [
  { id: "date", header: "Disposed", sortable: true, cell: (r) => <span className="tabular whitespace-nowrap">{r.date}</span> },
  {
    id: "appliance",
    header: "Appliance",
    sortable: true,
    cell: (r) => (
      <Link href={`/disposals/records/${r.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
        {r.applianceTag}
        <VoidTag at={r.voidedAt} />
        <span className="block text-xs font-normal text-ink-600">{r.applianceDescription}</span>
      </Link>
    ),
  },
  { id: "branch", header: "Branch", sortable: true, cell: (r) => r.branchName },
  { id: "who", header: "Company", cell: (r) => r.who ?? "—" },
  { id: "where", header: "Location", cell: (r) => r.where ?? "—" },
  { id: "refrigerant", header: "Refrigerant", sortable: true, cell: (r) => r.refrigerant ?? "—" },
  {
    id: "amount",
    header: "Recovered",
    sortable: true,
    cell: (r) => (
      <span className="tabular whitespace-nowrap">{r.recoveredG === null ? "—" : formatMass(r.recoveredG, r.branchMassUnit)}</span>
    ),
  },
];

const statementColumns: RecordColumn<DisposalListRow>[] = [
  { id: "date", header: "Recovered on", sortable: true, cell: (r) => <span className="tabular whitespace-nowrap">{r.date}</span> },
  {
    id: "appliance",
    header: "Appliance",
    sortable: true,
    cell: (r) => (
      <Link href={`/disposals/statements/${r.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
        {r.applianceTag}
        <VoidTag at={r.voidedAt} />
        <span className="block text-xs font-normal text-ink-600">{r.applianceDescription}</span>
      </Link>
    ),
  },
  { id: "branch", header: "Branch", sortable: true, cell: (r) => r.branchName },
  { id: "who", header: "Recovered by", cell: (r) => r.who ?? "—" },
  { id: "refrigerant", header: "Refrigerant", sortable: true, cell: (r) => r.refrigerant ?? "—" },
  {
    id: "document",
    header: "Signed document",
    cell: (r) =>
      r.hasDocument ? (
        <span className="text-ok">
          <span aria-hidden="true">✓ </span>On file
        </span>
      ) : (
        <span className="text-ink-600">
          <span aria-hidden="true">— </span>Form only
        </span>
      ),
  },
];

export function DisposalsView({ initialTab }: { initialTab: "record" | "statement" }) {
  const [tab, setTab] = useState<"record" | "statement">(initialTab);
  const [filters, setFilters] = useState<Record<string, string>>({});
  const branches = useBranchOptions();
  const params = useMemo(() => ({ ...filters, type: tab }), [filters, tab]);
  const branchRows = branches.data?.rows ?? [];

  return (
    <div className="space-y-4">
      <div role="tablist" aria-label="Kind of disposal proof" className="flex gap-2">
        {(
          [
            ["record", "Disposal records"],
            ["statement", "Signed statements"],
          ] as const
        ).map(([value, label]) => (
          <button
            key={value}
            type="button"
            role="tab"
            aria-selected={tab === value}
            onClick={() => setTab(value)}
            className={`rounded-md px-4 py-2 font-medium ${tab === value ? "bg-ink-800 text-white underline decoration-fjord-500 decoration-2 underline-offset-8" : "border border-ink-300 bg-white text-ink-800"}`}
          >
            {label}
          </button>
        ))}
      </div>
      <RecordFilters
        branches={branchRows}
        value={filters}
        onChange={setFilters}
        searchLabel="Search appliance"
        searchPlaceholder="Tag or description"
      />
      <div role="tabpanel">
        <RecordTable<DisposalListRow>
          key={tab}
          queryKey="disposals"
          path="/api/disposals"
          params={params}
          columns={tab === "record" ? recordColumns : statementColumns}
          noun={tab === "record" ? "disposal records" : "signed statements"}
          testId="disposal-row"
        />
      </div>
      {branchRows.length > 0 && <MonthlyTotals branches={branchRows} />}
    </div>
  );
}

/** 82.155(c)(2)–(3): monthly quantities recovered from disposed 5–50 lb appliances, and the transfers for reclaim. */
function MonthlyTotals({ branches }: { branches: BranchOption[] }) {
  const [branchId, setBranchId] = useState(String(branches[0]!.id));
  const [year, setYear] = useState(String(new Date().getFullYear()));
  const totals = useQuery({
    queryKey: ["disposal-monthly", branchId, year],
    queryFn: () => fetchJson<MonthlyDisposalTotals>(`/api/disposals/monthly?branchId=${branchId}&year=${year}`),
  });
  const t = totals.data;
  return (
    <section aria-labelledby="monthly-h" className="space-y-3 rounded-lg border border-ink-200 bg-white p-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="monthly-h" className="text-lg font-semibold text-ink-950">
            Monthly quantities
          </h2>
          <p className="text-sm text-ink-600">
            Refrigerant recovered from disposed appliances of more than 5 and less than 50 lb, by month and type, and what went for
            reclamation.
          </p>
        </div>
        <div className="flex gap-2">
          {branches.length > 1 && (
            <label className="text-sm">
              <span className="block font-medium text-ink-700">Branch</span>
              <select
                value={branchId}
                onChange={(e) => setBranchId(e.target.value)}
                className="mt-1 rounded-md border border-ink-300 bg-white px-2 py-2"
              >
                {branches.map((b) => (
                  <option key={b.id} value={b.id}>
                    {b.name}
                  </option>
                ))}
              </select>
            </label>
          )}
          <label className="text-sm">
            <span className="block font-medium text-ink-700">Year</span>
            <input
              type="number"
              inputMode="numeric"
              value={year}
              onChange={(e) => setYear(e.target.value)}
              className="mt-1 w-24 rounded-md border border-ink-300 px-2 py-2 tabular"
            />
          </label>
        </div>
      </div>
      {totals.isError && <p className="text-sm text-sev-critical">⚠ The totals could not be loaded.</p>}
      {t && (
        <div className="grid gap-4 lg:grid-cols-2">
          <table className="min-w-full text-sm" data-testid="monthly-recovered">
            <caption className="text-left font-semibold text-ink-800">Recovered from disposed appliances</caption>
            <thead className="text-left text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th scope="col" className="py-1 pr-3">
                  Month
                </th>
                <th scope="col" className="py-1 pr-3">
                  Refrigerant
                </th>
                <th scope="col" className="py-1 pr-3">
                  Appliances
                </th>
                <th scope="col" className="py-1">
                  Quantity
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {t.recovered.length === 0 && (
                <tr>
                  <td colSpan={4} className="py-2 text-ink-600">
                    Nothing recovered from disposals in {t.year}.
                  </td>
                </tr>
              )}
              {t.recovered.map((r) => (
                <tr key={`${r.month}-${r.refrigerant}`}>
                  <td className="py-1 pr-3 tabular">{r.month}</td>
                  <td className="py-1 pr-3">{r.refrigerant}</td>
                  <td className="py-1 pr-3 tabular">{r.appliances}</td>
                  <td className="py-1 tabular">{formatMass(r.recoveredG, t.massUnit)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <table className="min-w-full text-sm" data-testid="monthly-transfers">
            <caption className="text-left font-semibold text-ink-800">Transferred for reclamation</caption>
            <thead className="text-left text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th scope="col" className="py-1 pr-3">
                  Date
                </th>
                <th scope="col" className="py-1 pr-3">
                  Refrigerant
                </th>
                <th scope="col" className="py-1 pr-3">
                  To
                </th>
                <th scope="col" className="py-1">
                  Quantity
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {t.transfers.length === 0 && (
                <tr>
                  <td colSpan={4} className="py-2 text-ink-600">
                    No shipments for reclaim in {t.year}.
                  </td>
                </tr>
              )}
              {t.transfers.map((r) => (
                <tr key={`${r.shipmentId}-${r.refrigerant}`}>
                  <td className="py-1 pr-3 tabular">
                    <Link href={`/shipments/${r.shipmentId}`} className="text-fjord-700 underline">
                      {r.shippedOn}
                    </Link>
                  </td>
                  <td className="py-1 pr-3">{r.refrigerant}</td>
                  <td className="py-1 pr-3">{r.reclaimer}</td>
                  <td className="py-1 tabular">{formatMass(r.shippedG, t.massUnit)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
