"use client";

import type { ReactNode } from "react";

export const inputClass =
  "mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-2.5 text-base text-ink-950 shadow-sm aria-[invalid=true]:border-2 aria-[invalid=true]:border-sev-critical";
export const selectClass = "mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-2.5 text-base text-ink-950";
export const labelClass = "block text-sm font-semibold text-ink-900";
export const buttonPrimary =
  "inline-flex min-h-11 items-center justify-center rounded-lg bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700 disabled:opacity-60";
export const buttonSecondary =
  "inline-flex min-h-11 items-center justify-center rounded-lg border border-ink-300 bg-white px-4 py-2.5 font-medium text-ink-800 hover:border-fjord-600";

export function FieldError({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1 flex items-start gap-1.5 text-sm font-medium text-sev-critical">
      <span aria-hidden="true">⚠</span>
      <span>{message}</span>
    </p>
  );
}

/** A labelled field with its hint and error, wired for screen readers (`describedBy` on the input). */
export function Field({
  id,
  label,
  hint,
  error,
  optional,
  children,
  className,
}: {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  optional?: boolean;
  children: ReactNode;
  className?: string;
}) {
  return (
    <div className={className}>
      <label htmlFor={id} className={labelClass}>
        {label}
        {optional && <span className="font-normal text-ink-600"> (optional)</span>}
      </label>
      {children}
      {hint && (
        <p id={`${id}-hint`} className="mt-1 text-sm text-ink-600">
          {hint}
        </p>
      )}
      <FieldError id={`${id}-error`} message={error} />
    </div>
  );
}

/** `aria-describedby` for an input rendered inside `Field`. */
export function describedBy(id: string, opts: { hint?: boolean; error?: string }): string | undefined {
  const ids = [opts.hint ? `${id}-hint` : null, opts.error ? `${id}-error` : null].filter(Boolean);
  return ids.length ? ids.join(" ") : undefined;
}

export function FormAlert({ message }: { message: string | null }) {
  if (!message) return null;
  return (
    <p role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 px-4 py-3 font-medium text-sev-critical">
      <span aria-hidden="true">⚠ </span>
      {message}
    </p>
  );
}
