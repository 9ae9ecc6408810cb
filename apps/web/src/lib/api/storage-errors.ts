/**
 * True when object storage could not be reached or failed on its side: an error of the S3 SDK (it
 * carries `$metadata`) with no HTTP status (connection refused, timed out) or a 5xx one. A 4xx answer
 * (no such key, access denied) is not "unavailable".
 */
export function isStorageUnavailable(err: unknown): boolean {
  if (!err || typeof err !== "object" || !("$metadata" in err)) return false;
  const status = (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
  return status === undefined || status >= 500;
}
