import type { ReactNode } from "react";

const LAYOUTS = {
  /** Label and value side by side at every width (register and card pages). */
  side: "grid grid-cols-[9.5rem_1fr] gap-3 py-2",
  /** Label above the value on phones, beside it from 640 px (record pages). */
  stacked: "grid gap-x-3 gap-y-0.5 py-2 sm:grid-cols-[12rem_1fr]",
} as const;

/** One label and value of a record's `<dl>`. */
export function DetailRow({ label, children, layout = "side" }: { label: string; children: ReactNode; layout?: keyof typeof LAYOUTS }) {
  return (
    <div className={LAYOUTS[layout]}>
      <dt className="text-sm font-medium text-ink-600">{label}</dt>
      <dd className="min-w-0 break-words text-ink-950">{children}</dd>
    </div>
  );
}
