import "server-only";
import { randomUUID } from "node:crypto";
import { GetObjectCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { env } from "../env";
import { DomainError } from "@coldtrail/db";
import { RequestRefused } from "../api/errors";

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

/** Storage could not be reached or refused to keep the file: the request stops before any record is written. */
export function storageUnavailable(): RequestRefused {
  return new RequestRefused(503, "unavailable", "file storage is unavailable, nothing was saved");
}

/** A stored file that is not there: 404, with the status S3 gives it so callers can tell. */
export function fileMissing(): DomainError {
  return Object.assign(new DomainError("not_found", "The file is not in storage"), {
    name: "NoSuchKey",
    $metadata: { httpStatusCode: 404 },
  });
}

function isMissing(err: unknown): boolean {
  const e = err as { $metadata?: { httpStatusCode?: number }; name?: string } | null;
  return e?.name === "NoSuchKey" || e?.$metadata?.httpStatusCode === 404;
}

/**
 * Stores bytes under a key we make (never the client's file name) and returns the key. Callers store
 * the file before writing its record, so when storage is down (503) nothing is saved.
 */
export async function putFile(opts: { prefix: string; bytes: Uint8Array; mime: string; ext: string }): Promise<string> {
  const key = `${opts.prefix.replace(/[^a-z0-9/_-]/gi, "")}/${randomUUID()}.${opts.ext.replace(/[^a-z0-9]/gi, "")}`;
  try {
    await s3().send(new PutObjectCommand({ Bucket: env.S3_BUCKET, Key: key, Body: opts.bytes, ContentType: opts.mime }));
  } catch (err) {
    console.error("file storage:", err);
    throw storageUnavailable();
  }
  return key;
}

/**
 * Reads a stored file. A missing object is "not found" (404, still recognisable by its 404 status for
 * callers with their own words); storage that cannot be reached is 503.
 */
export async function getFile(key: string): Promise<{ bytes: Uint8Array; mime: string }> {
  try {
    const res = await s3().send(new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
    const bytes = await res.Body!.transformToByteArray();
    return { bytes, mime: res.ContentType ?? "application/octet-stream" };
  } catch (err) {
    if (isMissing(err)) throw fileMissing();
    console.error("file storage:", err);
    throw new RequestRefused(503, "unavailable", "file storage is unavailable; try again in a few minutes");
  }
}
