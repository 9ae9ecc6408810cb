import "server-only";
import { z } from "zod";
import { isPathLikeFileName } from "@coldtrail/core";
import { MAX_UPLOAD_BYTES, UploadRejected, checkUpload, putFile } from "@/lib/server/storage";

/**
 * The card file of an upload: checked by its bytes (photos and PDF only, size limit), a thumbnail
 * made for photos, both stored under keys we make. The client's file name is never used as a key;
 * one that looks like a path is refused outright.
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

type Issue = { code: "custom"; path: string[]; message: string; input?: unknown };

/** Checks the `card` part of a form. Returns the problems (field `card`) instead of throwing, so they join the field errors. */
export async function checkCardFile(part: FormDataEntryValue | null): Promise<{ card?: CheckedCard; issues: Issue[] }> {
  const refuse = (message: string) => ({ issues: [{ code: "custom" as const, path: ["card"], message }] });
  if (!(part instanceof File)) return refuse("Take a photo of the card or choose a photo or PDF of it");
  if (part.size === 0) return refuse("The file is empty");
  if (isPathLikeFileName(part.name))
    return refuse("That file name is not accepted (it looks like a folder path); rename the file and try again");
  if (part.size > MAX_UPLOAD_BYTES)
    return refuse(`The file is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB; take a smaller photo or scan`);
  const bytes = new Uint8Array(await part.arrayBuffer());
  let type: { mime: string; ext: string };
  try {
    type = await checkUpload(bytes);
  } catch (err) {
    if (err instanceof UploadRejected) return refuse(err.message);
    throw err;
  }
  let thumbnail: Uint8Array | null = null;
  if (THUMBNAIL_SOURCES.has(type.mime)) {
    try {
      thumbnail = await makeThumbnail(bytes);
    } catch {
      return refuse("The photo could not be opened; it may be damaged. Take it again");
    }
  }
  return { card: { bytes, mime: type.mime, ext: type.ext, thumbnail }, issues: [] };
}

async function makeThumbnail(bytes: Uint8Array): Promise<Uint8Array> {
  const { Jimp } = await import("jimp");
  const image = await Jimp.read(Buffer.from(bytes));
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
  throw new z.ZodError(issues);
}
