import "server-only";
import { randomUUID } from "node:crypto";
import { GetObjectCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { fileTypeFromBuffer } from "file-type";
import { env } from "../env";

/**
 * Object storage through the S3 SDK. In development and tests the endpoint is the local S3 fake
 * (s3rver) that the project's scripts start; in production any S3-compatible service.
 */
const globalForS3 = globalThis as unknown as { coldtrailS3?: S3Client };

export function s3(): S3Client {
  globalForS3.coldtrailS3 ??= new S3Client({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY },
    // s3rver stores streamed uploads with chunk framing unless checksums are only sent when required.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  return globalForS3.coldtrailS3;
}

/** What uploads of cards and evidence may be: checked by the bytes, never by the name or header. */
export const IMAGE_AND_PDF_TYPES = ["image/jpeg", "image/png", "image/webp", "image/heic", "application/pdf"] as const;
export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;

export class UploadRejected extends Error {
  constructor(message: string) {
    super(message);
  }
}

/** Sniffs the real type of an upload and refuses anything but the allowed types or an oversized file. */
export async function checkUpload(
  bytes: Uint8Array,
  allowed: readonly string[] = IMAGE_AND_PDF_TYPES,
): Promise<{ mime: string; ext: string }> {
  if (bytes.byteLength === 0) throw new UploadRejected("The file is empty");
  if (bytes.byteLength > MAX_UPLOAD_BYTES) throw new UploadRejected(`The file is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB`);
  const type = await fileTypeFromBuffer(bytes);
  if (!type || !allowed.includes(type.mime)) {
    throw new UploadRejected("Only photos (JPEG, PNG, WebP, HEIC) and PDF documents can be uploaded");
  }
  return { mime: type.mime, ext: type.ext };
}

/** Stores bytes under a key we make (never the client's file name) and returns the key. */
export async function putFile(opts: { prefix: string; bytes: Uint8Array; mime: string; ext: string }): Promise<string> {
  const key = `${opts.prefix.replace(/[^a-z0-9/_-]/gi, "")}/${randomUUID()}.${opts.ext}`;
  await s3().send(new PutObjectCommand({ Bucket: env.S3_BUCKET, Key: key, Body: opts.bytes, ContentType: opts.mime }));
  return key;
}

export async function getFile(key: string): Promise<{ bytes: Uint8Array; mime: string }> {
  const res = await s3().send(new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
  const bytes = await res.Body!.transformToByteArray();
  return { bytes, mime: res.ContentType ?? "application/octet-stream" };
}
