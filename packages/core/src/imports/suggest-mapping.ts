import { IMPORT_FIELDS, type ImportKind } from "./import-fields";

/** Field key → index of the spreadsheet column it is read from (null = not in the file). */
export type ImportMapping = Record<string, number | null>;

/** A heading compared without case, spaces, punctuation or a trailing "(unit)" note. */
export function normaliseHeading(heading: string): string {
  return heading
    .toLowerCase()
    .replace(/\((?:lb|lbs|kg|g|oz|optional|required)\)/g, "")
    .replace(/\*/g, "")
    .replace(/[^a-z0-9]+/g, "");
}

/**
 * Suggests which column each field comes from, by the column headings: an exact match of the
 * field's label first, then its other names. A column is used once; the first field to claim it
 * (in the order the fields are listed) keeps it.
 */
export function suggestImportMapping(kind: ImportKind, headings: readonly string[]): ImportMapping {
  const fields = IMPORT_FIELDS[kind];
  const normalised = headings.map(normaliseHeading);
  const taken = new Set<number>();
  const mapping: ImportMapping = {};
  for (const field of fields) mapping[field.key] = null;

  const claim = (fieldKey: string, names: string[]) => {
    if (mapping[fieldKey] !== null) return;
    for (const name of names) {
      const n = normaliseHeading(name);
      const index = normalised.findIndex((h, i) => h !== "" && h === n && !taken.has(i));
      if (index >= 0) {
        mapping[fieldKey] = index;
        taken.add(index);
        return;
      }
    }
  };
  // Labels (the template's headings) win over aliases, so a template round-trips exactly.
  for (const field of fields) claim(field.key, [field.label, field.key]);
  for (const field of fields) claim(field.key, [...field.aliases]);
  return mapping;
}

/** Problems with a mapping the person chose: unknown fields, columns out of range, a column used twice, required fields left out. */
export function checkImportMapping(
  kind: ImportKind,
  mapping: ImportMapping,
  columnCount: number,
): Array<{ field: string; message: string }> {
  const fields = IMPORT_FIELDS[kind];
  const known = new Set(fields.map((x) => x.key));
  const problems: Array<{ field: string; message: string }> = [];
  const used = new Map<number, string>();
  for (const [key, column] of Object.entries(mapping)) {
    if (!known.has(key)) {
      problems.push({ field: key, message: `“${key}” is not a field of this import` });
      continue;
    }
    if (column === null) continue;
    if (!Number.isInteger(column) || column < 0 || column >= columnCount) {
      problems.push({ field: key, message: "That column is not in the file" });
      continue;
    }
    const other = used.get(column);
    if (other) {
      const label = fields.find((x) => x.key === other)?.label ?? other;
      problems.push({ field: key, message: `That column is already used for “${label}”` });
    } else used.set(column, key);
  }
  for (const field of fields) {
    if (field.required && (mapping[field.key] === null || mapping[field.key] === undefined)) {
      problems.push({ field: field.key, message: `Choose the column that holds “${field.label}” (required)` });
    }
  }
  return problems;
}
