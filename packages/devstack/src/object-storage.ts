import { mkdirSync } from "node:fs";
import S3rver from "s3rver";

const PHOTO_BUCKET = "grainyard-photos";

/** Browsers upload photos straight to storage with presigned URLs, so the bucket allows our origin. */
function corsFor(origins: string[]): string {
  const rules = origins
    .map(
      (origin) =>
        `<CORSRule><AllowedOrigin>${origin}</AllowedOrigin><AllowedMethod>GET</AllowedMethod><AllowedMethod>PUT</AllowedMethod><AllowedMethod>HEAD</AllowedMethod><AllowedHeader>*</AllowedHeader><ExposeHeader>ETag</ExposeHeader><MaxAgeSeconds>3000</MaxAgeSeconds></CORSRule>`,
    )
    .join("");
  return `<CORSConfiguration>${rules}</CORSConfiguration>`;
}

export interface RunningObjectStorage {
  endpoint: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  region: string;
  stop(): Promise<void>;
}

/** The S3 fake (s3rver) on 127.0.0.1 with the photo bucket; objects live under `dir`. */
export async function startObjectStorage(options: { dir: string; port: number; allowedOrigins: string[] }): Promise<RunningObjectStorage> {
  mkdirSync(options.dir, { recursive: true });
  const server = new S3rver({
    address: "127.0.0.1",
    port: options.port,
    silent: true,
    directory: options.dir,
    vhostBuckets: false,
    configureBuckets: [{ name: PHOTO_BUCKET, configs: [corsFor(options.allowedOrigins)] }],
  });
  await server.run();
  return {
    endpoint: `http://127.0.0.1:${options.port}`,
    bucket: PHOTO_BUCKET,
    accessKeyId: "S3RVER",
    secretAccessKey: "S3RVER",
    region: "us-east-1",
    stop: () => server.close(),
  };
}
