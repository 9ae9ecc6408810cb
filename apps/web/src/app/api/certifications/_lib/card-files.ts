import "server-only";
import { putFile } from "@/lib/server/storage";
import { checkUploadPart, decodeImage, refuseUpload, type UploadIssue } from "@/lib/server/uploads";

/**
 * The card file of an upload: checked by the upload module (type by bytes, size, pixels, decodable,
 * name), a thumbnail made for photos, both stored under keys we make.
 */

const THUMBNAIL_BOX = 480;
/** Formats the image library can read; WebP and HEIC photos are kept without a thumbnail. */
const THUMBNAIL_SOURCES = new Set(["image/jpeg", "image/png"]);

export interface CheckedCard {
  bytes: Uint8Array;
  mime: string;
  ext: string;
  thumbnail: Uint8Array | null;
}

type Issue = UploadIssue;

/** Checks the `card` part of a form. Returns the problems (field `card`) instead of throwing, so they join the field errors. */
export async function checkCardFile(part: FormDataEntryValue | null): Promise<{ card?: CheckedCard; issues: Issue[] }> {
  const checked = await checkUploadPart(part, {
    field: "card",
    required: true,
    missing: "Take a photo of the card or choose a photo or PDF of it",
  });
  if (!checked.file) return { issues: checked.issues };
  const { bytes, mime, ext } = checked.file;
  let thumbnail: Uint8Array | null = null;
  if (THUMBNAIL_SOURCES.has(mime)) {
    try {
      thumbnail = await makeThumbnail(bytes, mime);
    } catch {
      return { issues: [{ code: "custom", path: ["card"], message: "The photo could not be opened; it may be damaged. Take it again" }] };
    }
  }
  return { card: { bytes, mime, ext, thumbnail }, issues: [] };
}

async function makeThumbnail(bytes: Uint8Array, mime: string): Promise<Uint8Array> {
  const image = await decodeImage(bytes, mime);
  image.scaleToFit({ w: THUMBNAIL_BOX, h: THUMBNAIL_BOX });
  return new Uint8Array(await image.getBuffer("image/jpeg", { quality: 80 }));
}

/** Stores the card (and its thumbnail) under keys we make; returns the keys. */
export async function storeCard(
  card: CheckedCard,
  owner: { organisationId: number; userId: number },
): Promise<{ fileKey: string; thumbnailKey: string | null }> {
  const prefix = `certifications/${owner.organisationId}/${owner.userId}`;
  const fileKey = await putFile({ prefix, bytes: card.bytes, mime: card.mime, ext: card.ext });
  const thumbnailKey = card.thumbnail
    ? await putFile({ prefix: `${prefix}/thumbnails`, bytes: card.thumbnail, mime: "image/jpeg", ext: "jpg" })
    : null;
  return { fileKey, thumbnailKey };
}

/** Throws the collected problems as field errors (400), nothing written. */
export function refuseWith(issues: Issue[]): never {
  refuseUpload(issues);
}
