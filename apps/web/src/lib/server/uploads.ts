import "server-only";
import { z } from "zod";
import { fileTypeFromBuffer } from "file-type";
import { imageSize } from "image-size";
import { fileNameText, isPathLikeFileName } from "@coldtrail/core";
import { MAX_FILE_BYTES } from "../api/body";

/**
 * The one way a file gets into Coldtrail (certification cards, finding evidence, equipment evidence,
 * signed disposal statements, spreadsheet imports). Every upload passes the same checks, in order:
 * 1. a file was sent, and it is not empty;
 * 2. its name is not path-like and has no control characters (CR/LF included); the name shown is our
 *    own clean version, and storage keys never use it;
 * 3. its size is within the limit (the request body itself was already cut off at the route's limit
 *    while it streamed in, so a larger file was never held whole);
 * 4. its type is read from its bytes, never from the name or the declared type;
 * 5. an image's width and height are read from its header and refused above MAX_IMAGE_PIXELS before
 *    any decoding, so a small file that would expand to gigabytes is never decoded;
 * 6. it opens: images are decoded (with the decoder's own resolution and memory limits), a PDF must
 *    have its header and end-of-file marker, a WebP its full RIFF length.
 */

export const MAX_UPLOAD_BYTES = MAX_FILE_BYTES;
/** 50 megapixels: above the largest phone-camera photos (48 MP), far below a decompression bomb. */
export const MAX_IMAGE_PIXELS = 50_000_000;
export const IMAGE_AND_PDF_TYPES = ["image/jpeg", "image/png", "image/webp", "image/heic", "application/pdf"] as const;
/** Formats the image library decodes; WebP and HEIC are checked by their headers only. */
const DECODABLE = new Set(["image/jpeg", "image/png"]);

export class UploadRejected extends Error {}

export interface CheckedFile {
  bytes: Uint8Array;
  mime: string;
  ext: string;
  /** A clean name to show people (never used as a storage key). */
  displayName: string;
  width?: number;
  height?: number;
}

/** Says what the bytes are, or refuses them (UploadRejected). */
export type Identify = (
  name: string,
  bytes: Uint8Array,
) => Promise<{ mime: string; ext: string; bytes?: Uint8Array; width?: number; height?: number }>;

export type UploadIssue = { code: "custom"; path: string[]; message: string };

/** A name to show: no folders, no control or odd characters, at most 80 characters, our extension. */
export function cleanFileName(clientName: string, ext: string, fallback = "file"): string {
  const base = clientName.split(/[\\/]/).pop() ?? "";
  const stem = base
    .replace(/\.[^.]*$/, "")
    .replace(/[^A-Za-z0-9 ._-]+/g, " ")
    .replace(/\.{2,}/g, ".")
    .replace(/\s+/g, " ")
    .trim()
    .slice(0, 80);
  return `${stem || fallback}.${ext}`;
}

/** Photos (JPEG, PNG, WebP, HEIC) and PDF documents, checked by their bytes, pixels and decodability. */
export const identifyImageOrPdf: Identify = async (_name, bytes) => {
  const type = await fileTypeFromBuffer(bytes);
  if (!type || !(IMAGE_AND_PDF_TYPES as readonly string[]).includes(type.mime)) {
    throw new UploadRejected("Only photos (JPEG, PNG, WebP, HEIC) and PDF documents can be uploaded");
  }
  if (type.mime === "application/pdf") {
    checkPdf(bytes);
    return { mime: type.mime, ext: type.ext };
  }
  const { width, height } = imageDimensions(bytes);
  if (type.mime === "image/webp") checkRiffLength(bytes);
  if (DECODABLE.has(type.mime)) await decodeImage(bytes, type.mime);
  return { mime: type.mime, ext: type.ext, width, height };
};

/** Width and height from the image's header; refused above the pixel limit before anything is decoded. */
export function imageDimensions(bytes: Uint8Array): { width: number; height: number } {
  let size: { width?: number; height?: number };
  try {
    size = imageSize(bytes);
  } catch {
    throw new UploadRejected("The photo could not be opened; it may be damaged. Take it again");
  }
  const { width, height } = size;
  if (!width || !height) throw new UploadRejected("The photo could not be opened; it may be damaged. Take it again");
  if (width * height > MAX_IMAGE_PIXELS) {
    throw new UploadRejected(
      `The photo is ${width} × ${height} pixels; the limit is ${MAX_IMAGE_PIXELS / 1_000_000} megapixels. Take or export a smaller one`,
    );
  }
  return { width, height };
}

/** Decodes a JPEG or PNG with the decoder's limits (after the header check above); a broken image is refused. */
export async function decodeImage(bytes: Uint8Array, mime: string) {
  const { Jimp } = await import("jimp");
  if (mime === "image/jpeg") {
    // A JPEG cut short still decodes partly; its end-of-image marker must be there.
    if (!hasJpegEnd(bytes)) throw new UploadRejected("The photo is incomplete (the file was cut short); take it again");
  }
  try {
    return mime === "image/jpeg"
      ? await Jimp.read(Buffer.from(bytes), { "image/jpeg": { maxResolutionInMP: MAX_IMAGE_PIXELS / 1_000_000, maxMemoryUsageInMB: 512 } })
      : await Jimp.read(Buffer.from(bytes));
  } catch {
    throw new UploadRejected("The photo could not be opened; it may be damaged. Take it again");
  }
}

function hasJpegEnd(bytes: Uint8Array): boolean {
  // Cameras may append data after the end marker; look for it in the last 64 KB.
  for (let i = bytes.byteLength - 2; i >= Math.max(0, bytes.byteLength - 65536); i--) {
    if (bytes[i] === 0xff && bytes[i + 1] === 0xd9) return true;
  }
  return false;
}

function checkPdf(bytes: Uint8Array): void {
  const tail = new TextDecoder("latin1").decode(bytes.subarray(Math.max(0, bytes.byteLength - 2048)));
  if (!tail.includes("%%EOF")) throw new UploadRejected("The PDF is incomplete (the file was cut short); save or scan it again");
}

function checkRiffLength(bytes: Uint8Array): void {
  const declared = bytes.byteLength >= 8 ? new DataView(bytes.buffer, bytes.byteOffset, 8).getUint32(4, true) + 8 : Infinity;
  if (bytes.byteLength < declared) throw new UploadRejected("The photo is incomplete (the file was cut short); take it again");
}

/**
 * Checks one part of a multipart form. Returns the problems under `field` instead of throwing, so they
 * join the other fields' errors (a 400 naming each field, nothing stored).
 */
export async function checkUploadPart(
  part: FormDataEntryValue | null,
  opts: { field: string; required?: boolean; maxBytes?: number; identify?: Identify; missing?: string; fallbackName?: string },
): Promise<{ file?: CheckedFile; issues: UploadIssue[] }> {
  const refuse = (message: string) => ({ issues: [{ code: "custom" as const, path: [opts.field], message }] });
  const maxBytes = opts.maxBytes ?? MAX_UPLOAD_BYTES;
  if (part === null || part === "") return opts.required ? refuse(opts.missing ?? "Choose a photo or a PDF") : { issues: [] };
  if (!(part instanceof Blob)) return refuse(opts.missing ?? "Choose a photo or a PDF");
  const name = part instanceof File ? part.name : "";
  if (part.size === 0) return refuse("The file is empty");
  if (name && isPathLikeFileName(name))
    return refuse(
      "That file name is not accepted (it looks like a folder path or holds control characters); rename the file and try again",
    );
  if (name) {
    const named = fileNameText.safeParse(name);
    if (!named.success) return refuse(`That file name is not accepted: ${named.error.issues[0]?.message ?? "rename the file"}`);
  }
  if (part.size > maxBytes) return refuse(`The file is larger than ${Math.round(maxBytes / 1024 / 1024)} MB; choose a smaller one`);
  const bytes = new Uint8Array(await part.arrayBuffer());
  try {
    const type = await (opts.identify ?? identifyImageOrPdf)(name, bytes);
    return {
      file: {
        bytes: type.bytes ?? bytes,
        mime: type.mime,
        ext: type.ext,
        displayName: cleanFileName(name, type.ext, opts.fallbackName),
        ...(type.width && { width: type.width, height: type.height }),
      },
      issues: [],
    };
  } catch (err) {
    if (err instanceof UploadRejected) return refuse(err.message);
    throw err;
  }
}

/** Reads the multipart form of a request (its body already capped by the route), or refuses naming `field`. */
export async function readUploadForm(req: Request, field: string): Promise<FormData> {
  try {
    return await req.formData();
  } catch {
    refuseUpload([{ code: "custom", path: [field], message: "Send the form as a file upload (multipart)" }]);
  }
}

/** Throws the collected problems as field errors (400), nothing written. */
export function refuseUpload(issues: UploadIssue[]): never {
  throw new z.ZodError(issues);
}
