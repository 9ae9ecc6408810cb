import { NextResponse } from "next/server";
import { DomainError, attachEquipmentEvidence, getEquipmentEvidenceKey } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { UPLOAD_BODY_LIMIT } from "@/lib/api/body";
import { idParams } from "@/lib/api/params";
import { getFile, putFile } from "@/lib/server/storage";
import { checkUploadPart, readUploadForm, refuseUpload } from "@/lib/server/uploads";
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
 * Uploads the evidence of a unit's certification: a photo of its label or the certificate as PDF,
 * through the one upload module (type by bytes, size, pixels, decodable, name).
 */
export const POST = route(
  { can: ["update", "RecoveryEquipment"], params: idParams("id"), accepts: "multipart", maxBody: UPLOAD_BODY_LIMIT },
  async ({ req, actor, ability, db, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "equipment", String(params.id), "update");
    const form = await readUploadForm(req, "file");
    const checked = await checkUploadPart(form.get("file"), { field: "file", required: true, fallbackName: "evidence" });
    if (!checked.file) refuseUpload(checked.issues);
    const { bytes, mime, ext } = checked.file;
    const key = await putFile({ prefix: `equipment/${ref.organisationId}/${ref.id}`, bytes, mime, ext });
    await attachEquipmentEvidence(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id: ref.id,
      fileKey: key,
      mime,
      bytes: bytes.byteLength,
    });
    return NextResponse.json({ ok: true, mime }, { status: 201 });
  },
);
