"use client";

import type { UseFormRegisterReturn } from "react-hook-form";

/**
 * Shown when the server refuses to put a cylinder above its safe fill without a confirmation: its
 * message, a brief caution, and the box to tick. Ticking it records the fill as it happened; the
 * audit still raises the overfilled cylinder.
 */
export function OverFillConfirm({
  id,
  message,
  registration,
  checked,
  onChange,
}: {
  id: string;
  message: string;
  registration?: UseFormRegisterReturn;
  checked?: boolean;
  onChange?: (checked: boolean) => void;
}) {
  return (
    <div role="alert" className="space-y-3 rounded-lg border-2 border-sev-major bg-amber-50 px-4 py-3" aria-labelledby={`${id}-msg`}>
      <p id={`${id}-msg`} className="font-medium text-ink-950">
        <span aria-hidden="true">⚠ </span>
        {message}
      </p>
      <p className="text-sm text-ink-700">
        Do not move or heat an overfilled cylinder; transfer the excess with recovery equipment. Local codes and licensed practice take
        precedence.
      </p>
      <label htmlFor={id} className="flex min-h-12 cursor-pointer items-start gap-3">
        <input
          id={id}
          type="checkbox"
          className="mt-1 size-5 shrink-0 accent-fjord-600"
          aria-describedby={`${id}-msg`}
          {...(registration ?? { checked: checked ?? false, onChange: (e) => onChange?.(e.target.checked) })}
        />
        <span className="font-semibold">I confirm the cylinder now holds more than its safe fill; save this record as it happened</span>
      </label>
    </div>
  );
}
