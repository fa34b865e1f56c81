import { HeadBucketCommand, S3Client } from "@aws-sdk/client-s3";
import type { AppConfig } from "../config.ts";

export interface PhotoStorage {
  client: S3Client;
  bucket: string;
  /** True when the photo bucket answers (used by /api/health). */
  isUp(): Promise<boolean>;
  close(): void;
}

/** Photo storage through the S3 API (s3rver locally, any S3-compatible store in production). */
export function createPhotoStorage(config: AppConfig["storage"]): PhotoStorage {
  const client = new S3Client({
    endpoint: config.endpoint,
    region: config.region,
    forcePathStyle: config.forcePathStyle,
    credentials: config.accessKeyId ? { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey } : undefined,
    // Without these the SDK adds checksums the S3 fake does not understand, and streamed bodies are stored corrupted.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
    maxAttempts: 1,
  });
  return {
    client,
    bucket: config.bucket,
    async isUp() {
      try {
        await client.send(new HeadBucketCommand({ Bucket: config.bucket }), { abortSignal: AbortSignal.timeout(3_000) });
        return true;
      } catch {
        return false;
      }
    },
    close: () => client.destroy(),
  };
}
