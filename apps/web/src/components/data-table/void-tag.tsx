/** "Void" marker in a list row: a word and an icon. */
export function VoidTag({ at }: { at?: string | null }) {
  if (!at) return null;
  return (
    <span className="ml-1 inline-flex items-center gap-1 rounded border border-ink-400 px-1 text-xs font-semibold uppercase text-ink-700">
      <span aria-hidden="true">⊘</span> Void
    </span>
  );
}
