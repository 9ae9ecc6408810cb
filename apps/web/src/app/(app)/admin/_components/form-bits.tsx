"use client";

import { ApiError } from "@/lib/client/fetch-json";
import { PageControls, showingText } from "@/components/data-table";
import { FormAlert as SharedFormAlert, Notice as SharedNotice } from "@/components/form";

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

export { FieldError } from "@/components/form";

export function FormAlert({ id, message }: { id?: string; message: string | null }) {
  return <SharedFormAlert id={id} message={message} variant="inline" />;
}

export function Notice({ message }: { message: string | null }) {
  if (!message) return null;
  return <SharedNotice>{message}</SharedNotice>;
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

/** The status line and previous/next under a short list paged by the caller. */
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
  return (
    <PageControls
      status={showingText(page, pageSize, total, noun)}
      page={page}
      pageCount={pages}
      mode="pages-when-needed"
      onPrevious={() => onPage(page - 1)}
      onNext={() => onPage(page + 1)}
      canPrevious={page > 1}
      canNext={page < pages}
    />
  );
}
