import { NextResponse } from "next/server";
import { DomainError, attachEquipmentEvidence, getEquipmentEvidenceKey } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { MAX_UPLOAD_BYTES, UploadRejected, checkUpload, getFile, putFile } from "@/lib/server/storage";
import { authorizeRegisterRecord } from "../../../appliances/_shared/register-access";

type Params = { id: string };

const EXTENSIONS: Record<string, string> = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "image/heic": "heic",
  "application/pdf": "pdf",
};

/** The certification evidence of a unit (label photo or certificate), for those who may read the unit. */
export const GET = route<undefined, undefined, Params>({ can: ["read", "RecoveryEquipment"] }, async ({ actor, ability, db, params }) => {
  const ref = await authorizeRegisterRecord({ actor, ability, db }, "equipment", params.id, "read");
  const key = await getEquipmentEvidenceKey(db, { organisationId: ref.organisationId, id: ref.id });
  if (!key) throw new DomainError("not_found", "No evidence has been uploaded for this unit");
  let file: { bytes: Uint8Array; mime: string };
  try {
    file = await getFile(key);
  } catch (err) {
    const status = (err as { $metadata?: { httpStatusCode?: number }; name?: string })?.$metadata?.httpStatusCode;
    if (status === 404 || (err as { name?: string })?.name === "NoSuchKey") {
      throw new DomainError("not_found", "The evidence file is not in storage; upload it again");
    }
    throw err;
  }
  const mime = EXTENSIONS[file.mime] ? file.mime : "application/octet-stream";
  return new Response(Buffer.from(file.bytes), {
    headers: {
      "content-type": mime,
      "content-length": String(file.bytes.byteLength),
      // Our own file name: the uploader's name is never kept or echoed.
      "content-disposition": `inline; filename="equipment-${ref.id}-evidence.${EXTENSIONS[mime] ?? "bin"}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});

/**
 * Uploads the evidence of a unit's certification: a photo of its label or the certificate as PDF.
 * The type is checked by the file's bytes and its size limited; the client's file name is ignored.
 */
export const POST = route<undefined, undefined, Params>(
  { idempotent: true, can: ["update", "RecoveryEquipment"] },
  async ({ req, actor, ability, db, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "equipment", params.id, "update");
    const declared = Number(req.headers.get("content-length") ?? "0");
    if (declared > MAX_UPLOAD_BYTES + 64 * 1024)
      throw new DomainError("invalid", `The file is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB`, "file");
    let form: FormData;
    try {
      form = await req.formData();
    } catch {
      throw new DomainError("invalid", "Send the file as a form upload", "file");
    }
    const file = form.get("file");
    if (!(file instanceof Blob)) throw new DomainError("invalid", "Choose a photo or PDF to upload", "file");
    if (file.size > MAX_UPLOAD_BYTES)
      throw new DomainError("invalid", `The file is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB`, "file");
    const bytes = new Uint8Array(await file.arrayBuffer());
    let type: { mime: string; ext: string };
    try {
      type = await checkUpload(bytes);
    } catch (err) {
      if (err instanceof UploadRejected) throw new DomainError("invalid", err.message, "file");
      throw err;
    }
    const key = await putFile({ prefix: `equipment/${ref.organisationId}/${ref.id}`, bytes, mime: type.mime, ext: type.ext });
    await attachEquipmentEvidence(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id: ref.id,
      fileKey: key,
      mime: type.mime,
      bytes: bytes.byteLength,
    });
    return NextResponse.json({ ok: true, mime: type.mime }, { status: 201 });
  },
);
