import { z } from "zod";
import { IMPORT_KINDS } from "../imports/import-fields";

/**
 * Inputs of spreadsheet imports: the upload (multipart: the file plus these fields), the column
 * mapping, the lists. Shared by the API routes and the pages.
 */

/**
 * An import's life: the file is read and waits for its column mapping (`mapping`), every row is
 * checked in the background (`checking`) and the preview waits for a go (`checked`), the valid rows
 * are written in one transaction (`importing`) → `imported`; or it `failed` (nothing written), or
 * the person `cancelled` it.
 */
export const IMPORT_STATES = ["mapping", "checking", "checked", "importing", "imported", "failed", "cancelled"] as const;
export type ImportState = (typeof IMPORT_STATES)[number];

export const IMPORT_STATE_LABELS: Record<ImportState, string> = {
  mapping: "Choose the columns",
  checking: "Checking the rows",
  checked: "Ready to import",
  importing: "Importing",
  imported: "Imported",
  failed: "Failed — nothing imported",
  cancelled: "Cancelled — nothing imported",
};

const blankToUndefined = (v: unknown) => (v === "" || v === null || (typeof v === "string" && v.trim() === "") ? undefined : v);

/** The fields sent with the file (POST /api/imports, multipart; the file is the `file` part). */
export const importUploadInput = z.object({
  kind: z.enum(IMPORT_KINDS, { error: "Choose what the file holds: appliances, cylinders or past jobs" }),
  branchId: z.preprocess(
    blankToUndefined,
    z.coerce.number({ error: "Choose the branch to import into" }).int().positive("Choose the branch to import into"),
  ),
});
export type ImportUploadInput = z.output<typeof importUploadInput>;

/** PUT /api/imports/:id/mapping: field key → column index (null = not in the file). Starts the check. */
export const importMappingInput = z.object({
  mapping: z.record(z.string().max(40), z.number().int().min(0).max(999).nullable()),
});
export type ImportMappingInput = z.output<typeof importMappingInput>;

export const importListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
});
export type ImportListQuery = z.output<typeof importListQuery>;

/** GET /api/imports/:id/issues: the row problems, a page at a time. */
export const importIssuesQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type ImportIssuesQuery = z.output<typeof importIssuesQuery>;

export const importTemplateQuery = z.object({
  kind: z.enum(IMPORT_KINDS, { error: "Choose appliances, cylinders or jobs" }),
});
