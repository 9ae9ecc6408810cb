"use client";

import type { InputHTMLAttributes, ReactNode } from "react";
import type { UseFormRegisterReturn } from "react-hook-form";

/** Label, hint and error classes shared by the app's forms (a form family may pass its own). */
export const fieldLabelClass = "block text-sm font-semibold text-ink-900";
export const fieldHintClass = "mt-1 text-sm text-ink-600";

/** `aria-describedby` for an input with the hint and error that `Field` renders (`<id>-hint`, `<id>-error`). */
export function describedBy(id: string, opts: { hint?: boolean; error?: string }): string | undefined {
  const ids = [opts.hint ? `${id}-hint` : null, opts.error ? `${id}-error` : null].filter(Boolean);
  return ids.length ? ids.join(" ") : undefined;
}

/** `aria-invalid` and `aria-describedby` of an input, so a screen reader hears its hint and error. */
export function fieldAria(id: string, opts: { hint?: boolean; error?: string }) {
  return { "aria-invalid": opts.error ? true : undefined, "aria-describedby": describedBy(id, opts) } as const;
}

/** The ⚠ line under a field; its id is what the input's `aria-describedby` points at. */
export function FieldError({ id, message }: { id?: string; message?: string | null }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1 flex items-start gap-1.5 text-sm font-medium text-sev-critical">
      <span aria-hidden="true">⚠</span>
      <span>{message}</span>
    </p>
  );
}

export interface FieldProps {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  /** Put the hint between the label and the input (default: under the input). */
  hintFirst?: boolean;
  error?: string;
  optional?: boolean;
  children: ReactNode;
  className?: string;
  labelClassName?: string;
  hintClassName?: string;
}

/** A labelled field with its hint and error, wired for screen readers (see `fieldAria` for the input). */
export function Field({
  id,
  label,
  hint,
  hintFirst = false,
  error,
  optional,
  children,
  className,
  labelClassName = fieldLabelClass,
  hintClassName = fieldHintClass,
}: FieldProps) {
  const hintLine = hint ? (
    <p id={`${id}-hint`} className={hintClassName}>
      {hint}
    </p>
  ) : null;
  return (
    <div className={className}>
      <label htmlFor={id} className={labelClassName}>
        {label}
        {optional && <span className="font-normal text-ink-600"> (optional)</span>}
      </label>
      {hintFirst && hintLine}
      {children}
      {!hintFirst && hintLine}
      <FieldError id={`${id}-error`} message={error} />
    </div>
  );
}

type InputAttributes = Pick<
  InputHTMLAttributes<HTMLInputElement>,
  "type" | "inputMode" | "list" | "autoComplete" | "autoCapitalize" | "placeholder" | "readOnly" | "maxLength"
>;

export interface TextFieldProps extends Omit<FieldProps, "children">, InputAttributes {
  /** What `register(name)` returns. */
  registration: UseFormRegisterReturn;
  /** A textarea of this many rows instead of a one-line input. */
  rows?: number;
  inputClassName: string;
  /** Shown after the input (e.g. a datalist). */
  after?: ReactNode;
}

/** `Field` around a registered input or textarea, with `aria-invalid` and `aria-describedby` set. */
export function TextField({
  registration,
  rows,
  inputClassName,
  after,
  type,
  inputMode,
  list,
  autoComplete,
  autoCapitalize,
  placeholder,
  readOnly,
  maxLength,
  ...field
}: TextFieldProps) {
  const aria = fieldAria(field.id, { hint: Boolean(field.hint), error: field.error });
  return (
    <Field {...field}>
      {rows ? (
        <textarea
          id={field.id}
          rows={rows}
          {...registration}
          placeholder={placeholder}
          readOnly={readOnly}
          maxLength={maxLength}
          className={inputClassName}
          {...aria}
        />
      ) : (
        <input
          id={field.id}
          type={type}
          inputMode={inputMode}
          list={list}
          autoComplete={autoComplete}
          autoCapitalize={autoCapitalize}
          placeholder={placeholder}
          readOnly={readOnly}
          maxLength={maxLength}
          {...registration}
          className={inputClassName}
          {...aria}
        />
      )}
      {after}
    </Field>
  );
}

export interface SelectFieldProps extends Omit<FieldProps, "children"> {
  /** What `register(name)` returns. */
  registration: UseFormRegisterReturn;
  options: readonly { value: string | number; label: ReactNode }[];
  /** A first option with the value "" (e.g. "Choose…"). */
  placeholder?: string;
  selectClassName: string;
}

/** `Field` around a registered select, with `aria-invalid` and `aria-describedby` set. */
export function SelectField({ registration, options, placeholder, selectClassName, ...field }: SelectFieldProps) {
  return (
    <Field {...field}>
      <select
        id={field.id}
        {...registration}
        className={selectClassName}
        {...fieldAria(field.id, { hint: Boolean(field.hint), error: field.error })}
      >
        {placeholder !== undefined && <option value="">{placeholder}</option>}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </Field>
  );
}
