import "server-only";
import type { EvidenceFile } from "@coldtrail/db";
import { putFile } from "@/lib/server/storage";
import { checkUploadPart, readUploadForm, refuseUpload, type CheckedFile, type UploadIssue } from "@/lib/server/uploads";

/**
 * Evidence files of findings, through the one upload module (type by bytes, size, pixels, decodable,
 * name sanitised); stored under a key we make. The name shown is the module's clean version.
 */

export type CheckedEvidence = CheckedFile;

/** Checks an optional file part; returns the problems under `field` instead of throwing. */
export async function checkEvidenceFile(
  part: FormDataEntryValue | null,
  field = "file",
): Promise<{ file?: CheckedEvidence; issues: UploadIssue[] }> {
  return checkUploadPart(part, { field, fallbackName: "evidence" });
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
export function refuseWith(issues: UploadIssue[]): never {
  refuseUpload(issues);
}

/** Reads a multipart form, or refuses with a message naming the field. */
export function readForm(req: Request, field: string): Promise<FormData> {
  return readUploadForm(req, field);
}
