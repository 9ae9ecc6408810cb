import { IMPORT_KIND_LABELS, IMPORT_KINDS } from "@coldtrail/core";

/** Download links for the template of each record kind. */
export function TemplateLinks() {
  return (
    <ul className="flex flex-wrap gap-2" aria-label="Templates">
      {IMPORT_KINDS.map((k) => (
        <li key={k}>
          <a
            href={`/api/imports/template?kind=${k}`}
            download
            className="inline-flex min-h-11 items-center gap-2 rounded-md border border-ink-300 bg-white px-3 py-2 text-sm font-medium text-ink-900 hover:border-fjord-600"
          >
            <span aria-hidden="true">⤓</span> Template: {IMPORT_KIND_LABELS[k].toLowerCase()} (.xlsx)
          </a>
        </li>
      ))}
    </ul>
  );
}
