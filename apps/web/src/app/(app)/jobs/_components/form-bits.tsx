"use client";

import type { ReactNode } from "react";
import type { DraftWarning, Severity } from "@coldtrail/core";
import {
  AmountField as SharedAmountField,
  Field as SharedField,
  Notice,
  RadioCards,
  TextField as SharedTextField,
  radioCardClass,
  type AmountInputProps,
  type FieldProps,
  type TextFieldProps,
} from "@/components/form";

export { FieldError, FormAlert } from "@/components/form";

/** Field styles of the phone-first record forms: big targets, one column. */
export const inputClass =
  "mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-3 text-lg text-ink-950 shadow-sm aria-[invalid=true]:border-sev-critical";
export const selectClass = "rounded-lg border border-ink-300 bg-white px-3 text-lg";
export const labelClass = "block text-base font-semibold text-ink-900";
export const hintClass = "mt-1 text-sm text-ink-600";
export const choiceClass = radioCardClass.large;
/** The unit beside an amount (`AmountInput`). */
export const unitSelectClass = "w-28 rounded-lg border border-ink-300 bg-white px-3 text-lg";
export const primaryButton =
  "w-full rounded-lg bg-fjord-600 px-4 py-4 text-lg font-semibold text-white hover:bg-fjord-700 disabled:opacity-60";
export const secondaryButton =
  "rounded-md border border-ink-300 bg-white px-4 py-2 text-base font-medium text-ink-800 hover:border-fjord-600";

export function SavedNotice({ children }: { children: ReactNode }) {
  return <Notice>{children}</Notice>;
}

/** A labelled field of the record forms (larger label), with its hint and error. */
export function Field(props: FieldProps) {
  return <SharedField labelClassName={labelClass} {...props} />;
}

/** A labelled input or textarea of the record forms, with its hint and error. */
export function TextField(props: Omit<TextFieldProps, "inputClassName"> & { inputClassName?: string }) {
  return <SharedTextField labelClassName={labelClass} inputClassName={inputClass} {...props} />;
}

/** A labelled amount and unit of the record forms (a mass unless `options` says otherwise). */
export function AmountField(
  props: Omit<FieldProps, "children"> &
    Omit<AmountInputProps, "id" | "hint" | "error" | "inputClassName" | "unitClassName"> & {
      inputClassName?: string;
      unitClassName?: string;
    },
) {
  return <SharedAmountField labelClassName={labelClass} inputClassName={inputClass} unitClassName={unitSelectClass} {...props} />;
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
    <RadioCards
      name={name}
      value={value}
      onChange={onChange}
      options={[
        { value: true, label: yes },
        { value: false, label: no },
      ]}
      className="mt-2 flex gap-2"
      cardClassName="flex-1"
    />
  );
}

export { todayIn } from "@/lib/client/form-values";
