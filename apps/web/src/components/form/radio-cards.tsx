"use client";

import type { HTMLAttributes, ReactNode } from "react";
import type { UseFormRegisterReturn } from "react-hook-form";

/** A radio button as a card with a visible checked state (border and background, not colour alone). */
export const radioCardClass = {
  /** Phone-first record forms: tall cards, one column. */
  large:
    "flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50",
  /** Register forms: compact cards in a row. */
  medium:
    "flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-ink-200 bg-white px-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50",
} as const;

export interface RadioCardOption<V extends string | number | boolean> {
  value: V;
  label: ReactNode;
}

/**
 * A group of radio cards, either registered with react-hook-form (`registration`) or controlled
 * (`name`, `value`, `onChange`). `className` lays out the group; the caller gives it its legend or label.
 */
export function RadioCards<V extends string | number | boolean>({
  options,
  registration,
  name,
  value,
  onChange,
  size = "large",
  className,
  cardClassName = "",
  groupProps,
}: {
  options: readonly RadioCardOption<V>[];
  registration?: UseFormRegisterReturn;
  name?: string;
  value?: V | null;
  onChange?: (value: V) => void;
  size?: keyof typeof radioCardClass;
  className?: string;
  /** Added to every card (e.g. "flex-1"). */
  cardClassName?: string;
  /** Role, label or description of the group element. */
  groupProps?: HTMLAttributes<HTMLDivElement>;
}) {
  return (
    <div className={className} {...groupProps}>
      {options.map((o) => (
        <label key={String(o.value)} className={`${radioCardClass[size]} ${cardClassName}`}>
          {registration ? (
            <input type="radio" value={String(o.value)} {...registration} className="size-5 shrink-0 accent-fjord-600" />
          ) : (
            <input
              type="radio"
              name={name}
              checked={value === o.value}
              onChange={() => onChange?.(o.value)}
              className="size-5 shrink-0 accent-fjord-600"
            />
          )}
          {o.label}
        </label>
      ))}
    </div>
  );
}
