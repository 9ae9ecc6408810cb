import "server-only";
import type { NextRequest } from "next/server";
import { DomainError } from "@coldtrail/db";
import { putFile } from "@/lib/server/storage";
import { checkUploadPart, refuseUpload } from "@/lib/server/uploads";

/** Helpers shared by the routes of jobs, disposals, shipments and purchases. */

export { recordId } from "@/lib/api/params";

export interface MultipartBody {
  fields: Record<string, string>;
  file: FormDataEntryValue | null;
}

/** Reads a multipart form: its text fields and at most one file (under `fileField`). */
export async function readMultipart(req: NextRequest, fileField = "document"): Promise<MultipartBody> {
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new DomainError("invalid", "The request must be a form with fields (and optionally a file)");
  }
  const fields: Record<string, string> = {};
  let file: MultipartBody["file"] = null;
  for (const [key, value] of form.entries()) {
    if (typeof value === "string") fields[key] = value;
    else if (key === fileField && value.size > 0) file = value;
  }
  return { fields, file };
}

/**
 * Checks an uploaded signed document through the upload module (type by bytes, size, pixels, decodable,
 * name) and stores it under a key we make. Refusals name the `document` field.
 */
export async function storeSignedDocument(part: FormDataEntryValue, organisationId: number): Promise<{ key: string; mime: string }> {
  const checked = await checkUploadPart(part, { field: "document", required: true, missing: "Choose the signed document to upload" });
  if (!checked.file) refuseUpload(checked.issues);
  const { bytes, mime, ext } = checked.file;
  const key = await putFile({ prefix: `disposal-statements/org-${organisationId}`, bytes, mime, ext });
  return { key, mime };
}

/** `"true"` / `"false"` from a form field, for zod schemas that expect booleans. */
export function formBoolean(value: string | undefined): boolean | null | undefined {
  if (value === undefined || value === "") return undefined;
  return value === "true" || value === "on" ? true : value === "false" ? false : null;
}
