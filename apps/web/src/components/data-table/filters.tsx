"use client";

import { useCallback, useState, type FormEvent, type ReactNode } from "react";
import { REFRIGERANTS } from "@coldtrail/core";

export { optionsOf } from "@/lib/client/options";

/** One field of the filter bar above a table. */
export const filterInputClass = "mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2";

const stay = (e: FormEvent) => e.preventDefault();

/** The values of a filter bar and a setter for one of them. */
export function useFilters<F extends Record<string, string>>(initial: F) {
  const [filters, setFilters] = useState<F>(initial);
  const set = useCallback((key: keyof F, value: string) => setFilters((f) => ({ ...f, [key]: value })), []);
  return [filters, set] as const;
}

/** The filters above a table: a search landmark laid out as a grid (`className` sets the columns). */
export function FilterBar({ label, className = "", children }: { label?: string; className?: string; children: ReactNode }) {
  return (
    <form
      role="search"
      aria-label={label}
      className={`grid gap-3 rounded-lg border border-ink-200 bg-white p-3 ${className}`}
      onSubmit={stay}
    >
      {children}
    </form>
  );
}

export function FilterField({ label, className = "", children }: { label: string; className?: string; children: ReactNode }) {
  return (
    <label className={`text-sm ${className}`}>
      <span className="block font-medium text-ink-700">{label}</span>
      {children}
    </label>
  );
}

export function SearchFilter({
  label,
  value,
  onChange,
  placeholder,
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  placeholder: string;
}) {
  return (
    <FilterField label={label}>
      <input
        type="search"
        value={value}
        onChange={(e) => onChange(e.target.value)}
        placeholder={placeholder}
        className={filterInputClass}
      />
    </FilterField>
  );
}

export function DateFilter({ label, value, onChange }: { label: string; value: string; onChange: (value: string) => void }) {
  return (
    <FilterField label={label}>
      <input type="date" value={value} onChange={(e) => onChange(e.target.value)} className={filterInputClass} />
    </FilterField>
  );
}

/** A choice among `options`, the first option (value "") meaning "no filter". */
export function SelectFilter({
  label,
  value,
  onChange,
  anyLabel,
  options,
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  /** The words of the "" option, e.g. "All kinds"; left out when every option is listed. */
  anyLabel?: string;
  options: readonly { value: string | number; label: ReactNode }[];
}) {
  return (
    <FilterField label={label}>
      <select value={value} onChange={(e) => onChange(e.target.value)} className={filterInputClass}>
        {anyLabel !== undefined && <option value="">{anyLabel}</option>}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </FilterField>
  );
}

/** The branch filter, shown only to people who see more than one branch. */
export function BranchFilter({
  branches,
  value,
  onChange,
  markArchived = false,
}: {
  branches: readonly { id: number; name: string; archivedAt?: string | null }[];
  value: string;
  onChange: (value: string) => void;
  /** Add "(archived)" to archived branches' names. */
  markArchived?: boolean;
}) {
  if (branches.length <= 1) return null;
  return (
    <SelectFilter
      label="Branch"
      value={value}
      onChange={onChange}
      anyLabel="All branches"
      options={branches.map((b) => ({ value: b.id, label: markArchived && b.archivedAt ? `${b.name} (archived)` : b.name }))}
    />
  );
}

const refrigerantOptions = REFRIGERANTS.map((r) => ({ value: r.designation, label: r.designation }));

/** The catalogued refrigerants. */
export function RefrigerantFilter({ value, onChange, anyLabel }: { value: string; onChange: (value: string) => void; anyLabel: string }) {
  return <SelectFilter label="Refrigerant" value={value} onChange={onChange} anyLabel={anyLabel} options={refrigerantOptions} />;
}

/** Leave out, include or show only voided records. */
export function VoidedFilter({ label, value, onChange }: { label: string; value: string; onChange: (value: string) => void }) {
  return (
    <SelectFilter
      label={label}
      value={value}
      onChange={onChange}
      options={[
        { value: "", label: "Leave out" },
        { value: "include", label: "Show with the others" },
        { value: "only", label: "Show only voided" },
      ]}
    />
  );
}

/** A single "Show …" choice beside a short table (no filter bar). */
export function ShowFilter({
  value,
  onChange,
  options,
}: {
  value: string;
  onChange: (value: string) => void;
  options: readonly { value: string; label: ReactNode }[];
}) {
  return (
    <label className="inline-flex items-center gap-2 text-sm">
      <span className="font-medium text-ink-700">Show</span>
      <select value={value} onChange={(e) => onChange(e.target.value)} className="rounded-md border border-ink-300 bg-white px-2 py-1.5">
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </label>
  );
}
