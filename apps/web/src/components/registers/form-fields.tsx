"use client";

import type { UseFormRegisterReturn } from "react-hook-form";
import {
  AmountField as SharedAmountField,
  SelectField as SharedSelectField,
  TextField as SharedTextField,
  type AmountInputProps,
  type FieldProps,
  type SelectFieldProps,
  type TextFieldProps,
} from "@/components/form";

export { Field, FieldError, FormAlert, describedBy, fieldAria } from "@/components/form";

export const inputClass =
  "mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-2.5 text-base text-ink-950 shadow-sm aria-[invalid=true]:border-2 aria-[invalid=true]:border-sev-critical";
export const selectClass = "mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-2.5 text-base text-ink-950";
/** The unit beside an amount (`AmountInput`). */
export const unitSelectClass = "w-24 rounded-lg border border-ink-300 bg-white px-2 text-base";
export const labelClass = "block text-sm font-semibold text-ink-900";
export const buttonPrimary =
  "inline-flex min-h-11 items-center justify-center rounded-lg bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700 disabled:opacity-60";
export const buttonSecondary =
  "inline-flex min-h-11 items-center justify-center rounded-lg border border-ink-300 bg-white px-4 py-2.5 font-medium text-ink-800 hover:border-fjord-600";

/** A labelled input or textarea of the register forms, with its hint and error. */
export function TextField(props: Omit<TextFieldProps, "inputClassName"> & { inputClassName?: string }) {
  return <SharedTextField inputClassName={inputClass} {...props} />;
}

/** A labelled amount and unit of the register forms (a mass unless `options` says otherwise). */
export function AmountField(
  props: Omit<FieldProps, "children"> &
    Omit<AmountInputProps, "id" | "hint" | "error" | "inputClassName" | "unitClassName"> & {
      inputClassName?: string;
      unitClassName?: string;
    },
) {
  return <SharedAmountField inputClassName={inputClass} unitClassName={unitSelectClass} {...props} />;
}

/** Save and Cancel kept in view at the bottom of a long register form. */
export function StickyFormActions({ pending, label, onCancel }: { pending: boolean; label: string; onCancel: () => void }) {
  return (
    <div className="sticky bottom-0 -mx-4 flex gap-2 border-t border-ink-200 bg-white/95 px-4 py-3 backdrop-blur">
      <button type="submit" disabled={pending} className={`${buttonPrimary} flex-1`}>
        {pending ? "Saving…" : label}
      </button>
      <button type="button" onClick={onCancel} className={buttonSecondary}>
        Cancel
      </button>
    </div>
  );
}

/** A labelled select of the register forms, with its hint and error. */
export function SelectField(props: Omit<SelectFieldProps, "selectClassName"> & { selectClassName?: string }) {
  return <SharedSelectField selectClassName={selectClass} {...props} />;
}

/** The branch a new record belongs to: a choice when the person may write in several, otherwise fixed. */
export function BranchField({
  id,
  branches,
  registration,
  error,
}: {
  id: string;
  branches: readonly { id: number; name: string }[];
  registration: UseFormRegisterReturn;
  error?: string;
}) {
  if (branches.length === 1) return <input type="hidden" {...registration} />;
  if (branches.length === 0) return null;
  return (
    <SelectField
      id={id}
      label="Branch"
      error={error}
      registration={registration}
      options={branches.map((b) => ({ value: b.id, label: b.name }))}
    />
  );
}
