import { NextResponse } from "next/server";
import { importListQuery, importUploadInput, suggestImportMapping } from "@coldtrail/core";
import { DomainError, createImport, listImports, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { putFile } from "@/lib/server/storage";
import { assertMayImport } from "./_lib/import-access";
import { SpreadsheetRejected, identifySpreadsheet, readHeadings } from "./_lib/read-spreadsheet";

/** Imports the signed-in person may see (their branches'), newest first. */
export const GET = route({ can: ["read", "Import"], query: importListQuery }, async ({ ability, db, query }) => {
  return listImports(db, { scope: scopeByAbility(ability, "read", "Import", "imports"), query });
});

/** A display name with nothing path-like in it (never used as a storage key). */
function displayName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  // eslint-disable-next-line no-control-regex -- strips control characters from the file name
  const clean = base.replace(/[\u0000-\u001f\u007f]/g, "").trim();
  return (clean || "spreadsheet").slice(0, 200);
}

/**
 * Upload a spreadsheet (multipart: `file`, `kind`, `branchId`). The file must be what its name says
 * (XLSX by its zip signature, CSV as text) and readable: its headings and first rows are read now,
 * and a broken file is refused before anything is stored. Returns the import, waiting for its mapping.
 */
export const POST = route({ can: ["create", "Import"] }, async ({ req, actor, ability, db }) => {
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new DomainError("invalid", "Send the spreadsheet as a file upload", "file");
  }
  const fields = importUploadInput.parse({ kind: form.get("kind") ?? undefined, branchId: form.get("branchId") ?? undefined });
  assertMayImport(ability, actor, fields.kind, fields.branchId);

  const part = form.get("file");
  if (!(part instanceof File) || part.size === 0) throw new DomainError("invalid", "Choose the spreadsheet to import", "file");
  let format: "xlsx" | "csv";
  let bytes: Uint8Array;
  let read: Awaited<ReturnType<typeof readHeadings>>;
  try {
    ({ format, bytes } = await identifySpreadsheet(part.name, new Uint8Array(await part.arrayBuffer())));
    read = await readHeadings(format, bytes);
  } catch (err) {
    if (err instanceof SpreadsheetRejected) throw new DomainError("invalid", err.message, "file");
    throw err;
  }
  const key = await putFile({
    prefix: `imports/${actor.organisationId}`,
    bytes,
    mime: format === "xlsx" ? "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" : "text/csv",
    ext: format,
  });
  const id = await createImport(db, {
    actor: { userId: actor.userId, organisationId: actor.organisationId },
    branchId: fields.branchId,
    kind: fields.kind,
    file: { key, format, label: displayName(part.name), size: bytes.byteLength },
    headings: read.headings,
    sample: read.sample,
    mapping: suggestImportMapping(fields.kind, read.headings),
  });
  return NextResponse.json({ id }, { status: 201 });
});
