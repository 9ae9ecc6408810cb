"use client";

import { ApiError } from "@/lib/client/fetch-json";

export const inputClass =
  "mt-1 block w-full rounded-md border border-ink-300 bg-white px-3 py-2.5 text-base text-ink-950 shadow-sm aria-[invalid=true]:border-sev-critical disabled:bg-ink-100";
export const labelClass = "block text-sm font-semibold text-ink-900";
export const hintClass = "mt-1 text-sm text-ink-600";
export const primaryButton =
  "inline-flex items-center justify-center rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700 disabled:opacity-60";
export const secondaryButton =
  "inline-flex items-center justify-center rounded-md border border-ink-300 bg-white px-4 py-2.5 font-medium text-ink-800 hover:bg-ink-50 disabled:opacity-60";
export const dangerButton =
  "inline-flex items-center justify-center rounded-md border border-sev-critical/50 bg-white px-4 py-2.5 font-semibold text-sev-critical hover:bg-red-50 disabled:opacity-60";

export function FieldError({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1 flex items-start gap-1.5 text-sm font-medium text-sev-critical">
      <span aria-hidden="true">⚠</span>
      <span>{message}</span>
    </p>
  );
}

export function FormAlert({ id, message }: { id?: string; message: string | null }) {
  if (!message) return null;
  return (
    <p id={id} role="alert" className="flex items-start gap-2 rounded-md border border-sev-critical/50 bg-red-50 px-3 py-2 text-sm font-medium text-sev-critical">
      <span aria-hidden="true">⚠</span>
      <span>{message}</span>
    </p>
  );
}

export function Notice({ message }: { message: string | null }) {
  if (!message) return null;
  return (
    <p role="status" className="flex items-start gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">
      <span aria-hidden="true">✓</span>
      <span>{message}</span>
    </p>
  );
}

/** The message to show for a failed request; the caller puts field errors beside their inputs. */
export function errorMessage(err: unknown, fallback: string): string {
  if (err instanceof ApiError) return err.message;
  return fallback;
}

/** Readable local date-time of an ISO instant. */
export function when(iso: string | null | undefined): string {
  if (!iso) return "—";
  return new Date(iso).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" });
}

export function Pager({
  page,
  pageSize,
  total,
  noun,
  onPage,
}: {
  page: number;
  pageSize: number;
  total: number;
  noun: string;
  onPage: (page: number) => void;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  return (
    <div className="flex flex-wrap items-center justify-between gap-3 text-sm">
      <p aria-live="polite" className="tabular text-ink-600">
        Showing {first}–{last} of {total.toLocaleString("en-US")} {noun}
      </p>
      {pages > 1 && (
        <div className="flex items-center gap-2">
          <button type="button" onClick={() => onPage(page - 1)} disabled={page <= 1} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40">
            Previous
          </button>
          <span className="tabular text-ink-700">
            Page {page} of {pages}
          </span>
          <button type="button" onClick={() => onPage(page + 1)} disabled={page >= pages} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40">
            Next
          </button>
        </div>
      )}
    </div>
  );
}
