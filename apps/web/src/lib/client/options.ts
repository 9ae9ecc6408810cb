import type { ReactNode } from "react";

/** Options for a select or radio group from a list of codes and their words. */
export function optionsOf<K extends string>(codes: readonly K[], words: Record<K, ReactNode>): { value: K; label: ReactNode }[] {
  return codes.map((c) => ({ value: c, label: words[c] }));
}
