/**
 * Photo bytes in S3 (s3rver locally, any S3-compatible store in production). The caller passes
 * the client made by `integrations/storage.ts` (path-style addressing, checksums only when
 * required) and the bucket.
 *
 * Layout of the bucket:
 *   originals/<listingId>/<photoId>              the upload at full size, upright, without EXIF/GPS/XMP/IPTC — private, never served
 *   display/<listingId>/<photoId>/<size>.webp    the served sizes, metadata removed
 */
import { DeleteObjectsCommand, GetObjectCommand, PutObjectCommand, type S3Client } from "@aws-sdk/client-s3";
import { AppError } from "../errors.ts";
import type { DisplaySizeName } from "./photo-processing.ts";

/**
 * The photo store did not answer or refused the request; the caller may try again later. The
 * answer says only that; the key, the action and the store's or driver's words go to the log.
 */
export class StorageUnavailable extends AppError {
  constructor(internal: string, options?: { cause?: unknown }) {
    super("storage_unavailable", "Photo storage is not answering just now. Please try again in a moment.");
    this.internal = internal;
    if (options?.cause !== undefined) this.cause = options.cause;
  }
}

/** Ids become key segments: refuse anything that could step into another folder. */
function keySegment(value: string, label: string): string {
  if (!/^[A-Za-z0-9_-]{1,64}$/.test(value))
    throw new TypeError(`${label} must be letters, digits, "-" or "_" (got ${JSON.stringify(value)}).`);
  return value;
}

export function originalKey(listingId: string, photoId: string): string {
  return `originals/${keySegment(listingId, "listingId")}/${keySegment(photoId, "photoId")}`;
}

/** Log photos live under their own prefix: `logs/<logId>/<photoId>/original` and `logs/<logId>/<photoId>/<size>.webp`. */
export function logPhotoKey(logId: string, photoId: string, size: DisplaySizeName | "original"): string {
  if (size !== "small" && size !== "medium" && size !== "large" && size !== "original")
    throw new TypeError(`unknown log photo size ${JSON.stringify(size)}`);
  return `logs/${keySegment(logId, "logId")}/${keySegment(photoId, "photoId")}/${size === "original" ? "original" : `${size}.webp`}`;
}

export function displayKey(listingId: string, photoId: string, size: DisplaySizeName): string {
  if (size !== "small" && size !== "medium" && size !== "large") throw new TypeError(`unknown display size ${JSON.stringify(size)}`);
  return `display/${keySegment(listingId, "listingId")}/${keySegment(photoId, "photoId")}/${size}.webp`;
}

export interface PutObjectOptions {
  /**
   * A private object (an original) is marked `Cache-Control: private, no-store`; a public one (a
   * display size, which never changes under its key) may be cached for a year. Access itself is
   * decided by the bucket policy and by which keys the API serves, not by per-object ACLs: many
   * S3 stores refuse ACLs today ("bucket owner enforced").
   */
  private: boolean;
}

const REQUEST_TIMEOUT_MS = 30_000;

function describeCause(error: unknown): string {
  if (error && typeof error === "object") {
    const { name, code, message, $metadata } = error as {
      name?: string;
      code?: string;
      message?: string;
      $metadata?: { httpStatusCode?: number };
    };
    const status = $metadata?.httpStatusCode ? ` (HTTP ${$metadata.httpStatusCode})` : "";
    const text = [code ?? name, message].filter((part) => part && part !== "Error" && part !== "UnknownError").join(": ");
    if (text || status) return `${text || "error"}${status}`;
  }
  return String(error);
}

function unavailable(action: string, error: unknown): StorageUnavailable {
  return new StorageUnavailable(`could not ${action} (${describeCause(error)})`, { cause: error });
}

/** Stores `bytes` under `key`. Originals must be private. */
export async function putObject(
  client: S3Client,
  bucket: string,
  key: string,
  bytes: Buffer,
  contentType: string,
  options: PutObjectOptions,
): Promise<void> {
  if (key.startsWith("originals/") && !options.private) throw new TypeError(`originals are never public: ${key}`);
  try {
    await client.send(
      new PutObjectCommand({
        Bucket: bucket,
        Key: key,
        Body: bytes,
        // Known length: the SDK sends the buffer in one request, no streaming chunked upload.
        ContentLength: bytes.length,
        ContentType: contentType,
        CacheControl: options.private ? "private, no-store" : "public, max-age=31536000, immutable",
        Metadata: { visibility: options.private ? "private" : "public" },
      }),
      { abortSignal: AbortSignal.timeout(REQUEST_TIMEOUT_MS) },
    );
  } catch (error) {
    throw unavailable(`store ${key}`, error);
  }
}

/** The bytes stored under `key`, or null when there is no such object. */
export async function getObjectBytes(client: S3Client, bucket: string, key: string): Promise<Buffer | null> {
  try {
    const response = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }), {
      abortSignal: AbortSignal.timeout(REQUEST_TIMEOUT_MS),
    });
    if (!response.Body) return Buffer.alloc(0);
    return Buffer.from(await response.Body.transformToByteArray());
  } catch (error) {
    const { name, $metadata } = error as { name?: string; $metadata?: { httpStatusCode?: number } };
    if (name === "NoSuchKey" || name === "NotFound" || $metadata?.httpStatusCode === 404) return null;
    throw unavailable(`read ${key}`, error);
  }
}

/** S3 deletes at most 1,000 keys a request. */
const DELETE_BATCH = 1000;

/** Deletes the objects; keys that do not exist count as deleted (S3's own rule). */
export async function deleteObjects(client: S3Client, bucket: string, keys: string[]): Promise<void> {
  for (let start = 0; start < keys.length; start += DELETE_BATCH) {
    const batch = keys.slice(start, start + DELETE_BATCH);
    let failed: string[];
    try {
      const response = await client.send(
        new DeleteObjectsCommand({ Bucket: bucket, Delete: { Objects: batch.map((Key) => ({ Key })), Quiet: true } }),
        { abortSignal: AbortSignal.timeout(REQUEST_TIMEOUT_MS) },
      );
      failed = (response.Errors ?? []).map((entry) => `${entry.Key}: ${entry.Code ?? "error"}`);
    } catch (error) {
      throw unavailable(`delete ${batch.length} photo object(s)`, error);
    }
    // DeleteObjects answers 200 even when single keys fail; those failures are listed in Errors.
    if (failed.length) throw new StorageUnavailable(`could not delete ${failed.join(", ")}`);
  }
}
