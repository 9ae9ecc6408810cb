"use client";

import type { ReactNode } from "react";
import type { UseFormRegisterReturn } from "react-hook-form";
import { MASS_INPUT_UNITS } from "@coldtrail/core";
import { Field, fieldAria, type FieldProps } from "./field";

const MASS_UNIT_OPTIONS = MASS_INPUT_UNITS.map((u) => ({ value: u, label: u }));

export interface AmountInputProps {
  id: string;
  unitId?: string;
  unitLabel: ReactNode;
  /** What `register()` returns for the amount and for the unit. */
  amount: UseFormRegisterReturn;
  unit: UseFormRegisterReturn;
  options?: readonly { value: string; label: ReactNode }[];
  /** The field has a hint (`<id>-hint`) the input is described by. */
  hint?: boolean;
  error?: string;
  inputClassName: string;
  unitClassName: string;
  tabular?: boolean;
}

/**
 * An amount and its unit side by side (a mass by default): the number input carries the field's id,
 * the unit select has its own label for screen readers ("Unit of the full charge").
 */
export function AmountInput({
  id,
  unitId = `${id}-unit`,
  unitLabel,
  amount,
  unit,
  options = MASS_UNIT_OPTIONS,
  hint = false,
  error,
  inputClassName,
  unitClassName,
  tabular = true,
}: AmountInputProps) {
  return (
    <div className="mt-1 flex gap-2">
      <input
        id={id}
        type="text"
        inputMode="decimal"
        autoComplete="off"
        {...amount}
        className={`${inputClassName} mt-0 flex-1 ${tabular ? "tabular" : ""}`}
        {...fieldAria(id, { hint, error })}
      />
      <label htmlFor={unitId} className="sr-only">
        {unitLabel}
      </label>
      <select id={unitId} {...unit} className={unitClassName}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

/** `Field` around an `AmountInput`: the label, the amount and its unit, the hint and the error. */
export function AmountField({
  unitId,
  unitLabel,
  amount,
  unit,
  options,
  inputClassName,
  unitClassName,
  tabular,
  ...field
}: Omit<FieldProps, "children"> & Omit<AmountInputProps, "id" | "hint" | "error">) {
  return (
    <Field {...field}>
      <AmountInput
        id={field.id}
        unitId={unitId}
        unitLabel={unitLabel}
        amount={amount}
        unit={unit}
        options={options}
        hint={Boolean(field.hint)}
        error={field.error}
        inputClassName={inputClassName}
        unitClassName={unitClassName}
        tabular={tabular}
      />
    </Field>
  );
}
