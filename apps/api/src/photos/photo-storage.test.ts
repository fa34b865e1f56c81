import { randomBytes, randomUUID } from "node:crypto";
import { HeadObjectCommand } from "@aws-sdk/client-s3";
import { afterAll, describe, expect, it } from "vitest";
import { loadConfig } from "../config.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { StorageUnavailable, deleteObjects, displayKey, getObjectBytes, originalKey, putObject } from "./photo-storage.ts";

// Runs against the S3 fake of the local test stack (`npm test`, or `npm run services` and the
// env file it writes). Without it this file fails on purpose instead of skipping quietly.
if (!process.env.S3_ENDPOINT) {
  throw new Error(
    "photo-storage tests need the S3 fake: run `npm test` from the repository root, or `npm run services` and source .data/test/test.env.",
  );
}

const environment = { ...process.env, NODE_ENV: "test" };
// The client exactly as the API makes it (path-style, checksums only when required).
const storage = createPhotoStorage(loadConfig(environment).storage);
const closedPort = createPhotoStorage(loadConfig({ ...environment, S3_ENDPOINT: "http://127.0.0.1:9" }).storage);
afterAll(() => {
  storage.close();
  closedPort.close();
});

describe("keys", () => {
  it("put originals and display sizes in separate trees", () => {
    expect(originalKey("listing-1", "photo-2")).toBe("originals/listing-1/photo-2");
    expect(displayKey("listing-1", "photo-2", "small")).toBe("display/listing-1/photo-2/small.webp");
    expect(displayKey("listing-1", "photo-2", "large")).toBe("display/listing-1/photo-2/large.webp");
  });

  it("refuse ids that could reach another folder", () => {
    expect(() => originalKey("../other", "photo")).toThrow(TypeError);
    expect(() => displayKey("listing", "a/b", "small")).toThrow(TypeError);
    expect(() => displayKey("listing", "photo", "huge" as "small")).toThrow(TypeError);
  });
});

describe("against the S3 fake", () => {
  it("stores, reads back byte for byte, and deletes", async () => {
    const listingId = randomUUID();
    const photoId = randomUUID();
    // Random bytes over 1 MB: any corruption of a streamed or checksummed body shows up here.
    const original = randomBytes(1_300_000);
    const small = randomBytes(9_000);
    const keys = [originalKey(listingId, photoId), displayKey(listingId, photoId, "small")];

    await putObject(storage.client, storage.bucket, keys[0]!, original, "image/jpeg", { private: true });
    await putObject(storage.client, storage.bucket, keys[1]!, small, "image/webp", { private: false });

    expect((await getObjectBytes(storage.client, storage.bucket, keys[0]!))?.equals(original)).toBe(true);
    expect((await getObjectBytes(storage.client, storage.bucket, keys[1]!))?.equals(small)).toBe(true);

    const head = await storage.client.send(new HeadObjectCommand({ Bucket: storage.bucket, Key: keys[1]! }));
    expect(head.ContentType).toBe("image/webp");
    expect(head.CacheControl).toContain("public");
    const privateHead = await storage.client.send(new HeadObjectCommand({ Bucket: storage.bucket, Key: keys[0]! }));
    expect(privateHead.CacheControl).toContain("no-store");

    // A key that was never stored counts as deleted too.
    await deleteObjects(storage.client, storage.bucket, [...keys, displayKey(listingId, photoId, "large")]);
    expect(await getObjectBytes(storage.client, storage.bucket, keys[0]!)).toBeNull();
    expect(await getObjectBytes(storage.client, storage.bucket, keys[1]!)).toBeNull();
  });

  it("answers null for a photo that was never stored", async () => {
    expect(await getObjectBytes(storage.client, storage.bucket, originalKey(randomUUID(), randomUUID()))).toBeNull();
  });

  it("deleting nothing is a no-op", async () => {
    await expect(deleteObjects(closedPort.client, closedPort.bucket, [])).resolves.toBeUndefined();
  });

  it("never stores an original as public", async () => {
    await expect(
      putObject(storage.client, storage.bucket, originalKey("l", "p"), Buffer.from("x"), "image/jpeg", { private: false }),
    ).rejects.toThrow(TypeError);
  });
});

describe("when storage is down", () => {
  it("every call fails with StorageUnavailable: a plain message for the answer, the key and the cause for the log", async () => {
    const key = displayKey("listing", "photo", "small");
    for (const call of [
      () => putObject(closedPort.client, closedPort.bucket, key, Buffer.from("webp"), "image/webp", { private: false }),
      () => getObjectBytes(closedPort.client, closedPort.bucket, key),
      () => deleteObjects(closedPort.client, closedPort.bucket, [key]),
    ]) {
      const error = await call().then(
        () => null,
        (failure: unknown) => failure,
      );
      expect(error).toBeInstanceOf(StorageUnavailable);
      const unavailable = error as StorageUnavailable;
      expect(unavailable.code).toBe("storage_unavailable");
      expect(unavailable.status).toBe(503);
      expect(unavailable.message).toBe("Photo storage is not answering just now. Please try again in a moment.");
      expect(unavailable.internal).toMatch(/^could not (store|read|delete) /);
      expect(unavailable.internal).toContain("ECONNREFUSED");
    }
  });
});
