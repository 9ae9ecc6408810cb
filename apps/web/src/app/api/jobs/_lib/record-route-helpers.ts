import "server-only";
import type { NextRequest } from "next/server";
import { z } from "zod";
import { DomainError } from "@coldtrail/db";
import { checkUpload, putFile, UploadRejected } from "@/lib/server/storage";

/** Helpers shared by the routes of jobs, disposals, shipments and purchases. */

const idParam = z.coerce.number().int().positive();

/** A record id from the path; anything else is simply not found. */
export function recordId(raw: string | undefined, notFound: string): number {
  const parsed = idParam.safeParse(raw);
  if (!parsed.success) throw new DomainError("not_found", notFound);
  return parsed.data;
}

export interface MultipartBody {
  fields: Record<string, string>;
  file: { bytes: Uint8Array } | null;
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
    else if (key === fileField && value.size > 0) file = { bytes: new Uint8Array(await value.arrayBuffer()) };
  }
  return { fields, file };
}

/**
 * Checks an uploaded signed document by its bytes (images and PDF only, size limit) and stores it
 * under a key we make; the client's file name is never used. Refusals name the `document` field.
 */
export async function storeSignedDocument(bytes: Uint8Array, organisationId: number): Promise<{ key: string; mime: string }> {
  try {
    const type = await checkUpload(bytes);
    const key = await putFile({ prefix: `disposal-statements/org-${organisationId}`, bytes, mime: type.mime, ext: type.ext });
    return { key, mime: type.mime };
  } catch (err) {
    if (err instanceof UploadRejected) throw new DomainError("invalid", err.message, "document");
    throw err;
  }
}

/** `"true"` / `"false"` from a form field, for zod schemas that expect booleans. */
export function formBoolean(value: string | undefined): boolean | null | undefined {
  if (value === undefined || value === "") return undefined;
  return value === "true" || value === "on" ? true : value === "false" ? false : null;
}
