/** Whether a record has every field its rule asks for, in words and an icon (not colour alone). */
export function CompletenessLine({
  complete,
  missing,
  completeText,
  testId,
}: {
  complete: boolean;
  missing: readonly string[];
  completeText: string;
  testId?: string;
}) {
  return (
    <p
      className={`flex items-start gap-2 rounded-md border px-3 py-2 ${complete ? "border-ok/40 bg-green-50 text-ok" : "border-sev-major/50 bg-orange-50 text-sev-major"}`}
      data-testid={testId}
    >
      <span aria-hidden="true">{complete ? "✓" : "⚠"}</span>
      {complete ? completeText : `Missing: ${missing.join(", ")}.`}
    </p>
  );
}
