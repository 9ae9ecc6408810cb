"use client";

import type { ReactNode } from "react";

/**
 * The ⚠ message at the top of a form that could not be saved (role="alert"). `panel` is the large
 * one of the record and register forms, `inline` the smaller one of the administration pages.
 */
export function FormAlert({ id, message, variant = "panel" }: { id?: string; message: string | null; variant?: "panel" | "inline" }) {
  if (!message) return null;
  if (variant === "inline") {
    return (
      <p
        id={id}
        role="alert"
        className="flex items-start gap-2 rounded-md border border-sev-critical/50 bg-red-50 px-3 py-2 text-sm font-medium text-sev-critical"
      >
        <span aria-hidden="true">⚠</span>
        <span>{message}</span>
      </p>
    );
  }
  return (
    <p id={id} role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 px-4 py-3 font-medium text-sev-critical">
      <span aria-hidden="true">⚠ </span>
      {message}
    </p>
  );
}

/** The ✓ line after something was saved (role="status"). */
export function Notice({ children }: { children: ReactNode }) {
  return (
    <p role="status" className="flex items-start gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">
      <span aria-hidden="true">✓</span>
      <span>{children}</span>
    </p>
  );
}
