import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import sharp from "sharp";
import { createPhotoStorage } from "../integrations/storage.ts";
import { cleanOriginal, getObjectBytes, putObject } from "../photos/index.ts";
import { runCli } from "./run-cli.ts";

// `pnpm --filter @grainyard/api clean:originals`: once, for photos stored before originals were cleaned
// on upload. Every stored original (listing and log photos) is rewritten upright, without EXIF, GPS,
// XMP or IPTC, its colour profile kept. Safe to run again: an original already clean is left as it is.
await runCli("clean-originals", async (_dataSource, config) => {
  const storage = createPhotoStorage(config.storage);
  let cleaned = 0;
  try {
    let token: string | undefined;
    do {
      const page = await storage.client.send(new ListObjectsV2Command({ Bucket: storage.bucket, ContinuationToken: token }));
      for (const { Key: key } of page.Contents ?? []) {
        if (!key || !(key.startsWith("originals/") || (key.startsWith("logs/") && key.endsWith("/original")))) continue;
        const bytes = await getObjectBytes(storage.client, storage.bucket, key);
        if (!bytes) continue;
        // Already clean (stored since originals are cleaned on upload, or by an earlier run): leave it, no second re-encode.
        const { exif, xmp, iptc, orientation } = await sharp(bytes).metadata();
        if (!exif && !xmp && !iptc && !orientation) continue;
        const clean = await cleanOriginal(bytes);
        await putObject(storage.client, storage.bucket, key, clean.bytes, clean.contentType, { private: true });
        cleaned += 1;
      }
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);
  } finally {
    storage.close();
  }
  console.log(`clean-originals: rewrote ${cleaned} stored originals without their metadata`);
});
