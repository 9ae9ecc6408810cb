import "server-only";
import { z } from "zod";
import { isPathLikeFileName } from "@coldtrail/core";
import type { EvidenceFile } from "@coldtrail/db";
import { MAX_UPLOAD_BYTES, UploadRejected, checkUpload, putFile } from "@/lib/server/storage";

/**
 * Evidence files, with the same storage and checks as certification cards: the real type is read from
 * the bytes (photos and PDF only), a size limit, a file name that looks like a path is refused, and the
 * object is stored under a key we make. The name shown is our own clean version of the file's name.
 */

type Issue = { code: "custom"; path: string[]; message: string };

export interface CheckedEvidence {
  bytes: Uint8Array;
  mime: string;
  ext: string;
  displayName: string;
}

function displayName(clientName: string, ext: string): string {
  const stem = clientName
    .replace(/\.[^.]*$/, "")
    .replace(/[^A-Za-z0-9 ._-]+/g, " ")
    .replace(/\s+/g, " ")
    .trim()
    .slice(0, 80);
  return `${stem || "evidence"}.${ext}`;
}

/** Checks an optional file part; returns the problems under `field` instead of throwing. */
export async function checkEvidenceFile(
  part: FormDataEntryValue | null,
  field = "file",
): Promise<{ file?: CheckedEvidence; issues: Issue[] }> {
  const refuse = (message: string) => ({ issues: [{ code: "custom" as const, path: [field], message }] });
  if (part === null || part === "") return { issues: [] };
  if (!(part instanceof File)) return refuse("Choose a photo or a PDF");
  if (part.size === 0) return refuse("The file is empty");
  if (isPathLikeFileName(part.name))
    return refuse("That file name is not accepted (it looks like a folder path); rename the file and try again");
  if (part.size > MAX_UPLOAD_BYTES)
    return refuse(`The file is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB; choose a smaller photo or scan`);
  const bytes = new Uint8Array(await part.arrayBuffer());
  try {
    const type = await checkUpload(bytes);
    return { file: { bytes, mime: type.mime, ext: type.ext, displayName: displayName(part.name, type.ext) }, issues: [] };
  } catch (err) {
    if (err instanceof UploadRejected) return refuse(err.message);
    throw err;
  }
}

export async function storeEvidence(
  file: CheckedEvidence,
  owner: { organisationId: number; findingId: number },
  note?: string | null,
): Promise<EvidenceFile> {
  const fileKey = await putFile({
    prefix: `findings/${owner.organisationId}/${owner.findingId}`,
    bytes: file.bytes,
    mime: file.mime,
    ext: file.ext,
  });
  return { fileKey, fileName: file.displayName, mime: file.mime, sizeBytes: file.bytes.byteLength, note: note ?? null };
}

/** Throws the collected problems as field errors (400), nothing written. */
export function refuseWith(issues: Issue[]): never {
  throw new z.ZodError(issues);
}

/** Reads a multipart form, or refuses with a message naming the field. */
export async function readForm(req: Request, field: string): Promise<FormData> {
  try {
    return await req.formData();
  } catch {
    refuseWith([{ code: "custom", path: [field], message: "Send the form as a file upload (multipart)" }]);
  }
}
