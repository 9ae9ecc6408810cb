import { NextResponse } from "next/server";
import { IMPORT_MAX_BYTES, importListQuery, importUploadInput, suggestImportMapping } from "@coldtrail/core";
import { DomainError, createImport, listImports, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { putFile } from "@/lib/server/storage";
import { UploadRejected, checkUploadPart, readUploadForm, refuseUpload } from "@/lib/server/uploads";
import { assertMayImport } from "./_lib/import-access";
import { SpreadsheetRejected, identifySpreadsheet, readHeadings } from "./_lib/read-spreadsheet";

/** Imports the signed-in person may see (their branches'), newest first. */
export const GET = route({ can: ["read", "Import"], query: importListQuery }, async ({ ability, db, query }) => {
  return listImports(db, { scope: scopeByAbility(ability, "read", "Import", "imports"), query });
});

const XLSX_MIME = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

/**
 * Upload a spreadsheet (multipart: `file`, `kind`, `branchId`). The file must be what its name says
 * (XLSX by its zip signature, CSV as text) and readable: its headings and first rows are read now,
 * and a broken file is refused before anything is stored. Returns the import, waiting for its mapping.
 */
export const POST = route(
  { can: ["create", "Import"], accepts: "multipart", maxBody: IMPORT_MAX_BYTES + 256 * 1024 },
  async ({ req, actor, ability, db }) => {
    const form = await readUploadForm(req, "file");
    const fields = importUploadInput.parse({ kind: form.get("kind") ?? undefined, branchId: form.get("branchId") ?? undefined });
    assertMayImport(ability, actor, fields.kind, fields.branchId);

    const checked = await checkUploadPart(form.get("file"), {
      field: "file",
      required: true,
      missing: "Choose the spreadsheet to import",
      maxBytes: IMPORT_MAX_BYTES,
      fallbackName: "spreadsheet",
      identify: async (name, raw) => {
        try {
          const { format, bytes } = await identifySpreadsheet(name, raw);
          return { mime: format === "xlsx" ? XLSX_MIME : "text/csv", ext: format, bytes };
        } catch (err) {
          if (err instanceof SpreadsheetRejected) throw new UploadRejected(err.message);
          throw err;
        }
      },
    });
    if (!checked.file) refuseUpload(checked.issues);
    const { bytes, mime, displayName } = checked.file;
    const format = checked.file.ext as "xlsx" | "csv";
    let read: Awaited<ReturnType<typeof readHeadings>>;
    try {
      read = await readHeadings(format, bytes);
    } catch (err) {
      if (err instanceof SpreadsheetRejected) throw new DomainError("invalid", err.message, "file");
      throw err;
    }
    const key = await putFile({
      prefix: `imports/${actor.organisationId}`,
      bytes,
      mime,
      ext: format,
    });
    const id = await createImport(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      branchId: fields.branchId,
      kind: fields.kind,
      file: { key, format, label: displayName, size: bytes.byteLength },
      headings: read.headings,
      sample: read.sample,
      mapping: suggestImportMapping(fields.kind, read.headings),
    });
    return NextResponse.json({ id }, { status: 201 });
  },
);
