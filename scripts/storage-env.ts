/** File storage settings for the command-line scripts, with the same names and defaults as the app (apps/web/src/lib/env.ts). */
export function storageFromEnv() {
  const e = process.env;
  return {
    bucket: e.S3_BUCKET ?? "coldtrail-files",
    s3: {
      endpoint: e.S3_ENDPOINT ?? "http://127.0.0.1:4569",
      region: e.S3_REGION ?? "us-east-1",
      credentials: { accessKeyId: e.S3_ACCESS_KEY_ID ?? "S3RVER", secretAccessKey: e.S3_SECRET_ACCESS_KEY ?? "S3RVER" },
    },
  };
}
