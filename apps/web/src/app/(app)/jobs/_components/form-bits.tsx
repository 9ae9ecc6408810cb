"use client";

import type { ReactNode } from "react";
import type { DraftWarning, Severity } from "@coldtrail/core";

/** Field styles of the phone-first record forms: big targets, one column. */
export const inputClass =
  "mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-3 text-lg text-ink-950 shadow-sm aria-[invalid=true]:border-sev-critical";
export const selectClass = "rounded-lg border border-ink-300 bg-white px-3 text-lg";
export const labelClass = "block text-base font-semibold text-ink-900";
export const hintClass = "mt-1 text-sm text-ink-600";
export const choiceClass =
  "flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50";
export const primaryButton = "w-full rounded-lg bg-fjord-600 px-4 py-4 text-lg font-semibold text-white hover:bg-fjord-700 disabled:opacity-60";
export const secondaryButton = "rounded-md border border-ink-300 bg-white px-4 py-2 text-base font-medium text-ink-800 hover:border-fjord-600";

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
    <p id={id} role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 px-4 py-3 font-medium text-sev-critical">
      <span aria-hidden="true">⚠ </span>
      {message}
    </p>
  );
}

export function SavedNotice({ children }: { children: ReactNode }) {
  return (
    <p role="status" className="flex items-center gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">
      <span aria-hidden="true">✓</span> {children}
    </p>
  );
}

const SEVERITY: Record<Severity, { word: string; icon: string; tone: string }> = {
  critical: { word: "Critical", icon: "✕", tone: "border-sev-critical/50 bg-red-50 text-sev-critical" },
  major: { word: "Major", icon: "⚠", tone: "border-sev-major/50 bg-orange-50 text-sev-major" },
  minor: { word: "Minor", icon: "ⓘ", tone: "border-sev-minor/50 bg-amber-50 text-sev-minor" },
};

/** A future finding, in words and an icon (never colour alone). */
export function DraftWarningLine({ warning, compact = false }: { warning: DraftWarning; compact?: boolean }) {
  const s = SEVERITY[warning.severity];
  if (compact) {
    return (
      <p className={`mt-1 flex items-start gap-1.5 rounded-md border px-2 py-1 text-sm font-medium ${s.tone}`} data-testid="field-warning">
        <span aria-hidden="true">{s.icon}</span>
        <span>{warning.message}</span>
      </p>
    );
  }
  return (
    <li className={`rounded-lg border px-3 py-2 ${s.tone}`} data-testid="draft-warning" data-rule={warning.ruleId}>
      <p className="flex items-start gap-2 font-semibold">
        <span aria-hidden="true">{s.icon}</span>
        <span>
          {s.word}: {warning.title}
        </span>
      </p>
      <p className="mt-0.5 text-ink-900">{warning.message}</p>
      <p className="mt-0.5 text-xs text-ink-600">
        Would be raised as {warning.ruleId} · {warning.citation}
      </p>
    </li>
  );
}

/** Two big buttons for a yes/no question. */
export function YesNo({
  name,
  value,
  onChange,
  yes = "Yes",
  no = "No",
}: {
  name: string;
  value: boolean | null | undefined;
  onChange: (v: boolean) => void;
  yes?: string;
  no?: string;
}) {
  return (
    <div className="mt-2 flex gap-2">
      {[
        { v: true, label: yes },
        { v: false, label: no },
      ].map((o) => (
        <label key={String(o.v)} className={`${choiceClass} flex-1`}>
          <input type="radio" name={name} checked={value === o.v} onChange={() => onChange(o.v)} className="size-5 shrink-0 accent-fjord-600" />
          {o.label}
        </label>
      ))}
    </div>
  );
}

/** Today's calendar date in a time zone (the branch's), not the server's. */
export function todayIn(timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date());
}
