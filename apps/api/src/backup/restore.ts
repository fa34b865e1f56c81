import { DeleteObjectCommand, HeadBucketCommand, PutObjectCommand } from "@aws-sdk/client-s3";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { AppConfig } from "../config.ts";
import type { PhotoStorage } from "../integrations/storage.ts";
import { listKeys, type Progress } from "./backup.ts";
import { DATABASE_FILE, OBJECTS_DIR, sha256Bytes, verifyBackup, type BackupManifest } from "./backup-folder.ts";
import { loadDatabase } from "./mariadb-client.ts";

/**
 * Brings the database and the photo bucket back to the backup in `folder`. Every checksum is
 * verified before anything is touched (BackupRefused otherwise). Then the database is dropped,
 * recreated and loaded from the dump, and the bucket emptied and filled with every object of the
 * backup, each with its content type, cache header and metadata. Nothing may write to either
 * meanwhile: run it with the API stopped (`npm run restore` starts the local stack's services
 * without the API for it).
 */
export async function restoreBackup(options: {
  database: AppConfig["database"];
  storage: PhotoStorage;
  folder: string;
  progress?: Progress;
}): Promise<{ manifest: BackupManifest; deleted: number; restored: number }> {
  const { database, storage, folder } = options;
  const say = options.progress ?? (() => undefined);
  say(`checking the checksums of ${folder}…`);
  const { manifest, objects } = await verifyBackup(folder);
  say(
    `backup of ${manifest.createdAt}: ${Object.keys(manifest.database.tableRows).length} tables, ${manifest.objects.count} objects; checksums match`,
  );
  // The bucket must answer before the database is dropped: a restore that cannot finish should not start.
  await storage.client.send(new HeadBucketCommand({ Bucket: storage.bucket })).catch((error: unknown) => {
    throw new Error(`the photo bucket ${storage.bucket} does not answer (${(error as Error).name}); nothing was restored.`, {
      cause: error,
    });
  });

  say(`database ${database.database}: dropping, recreating and loading the dump with the mariadb client…`);
  await loadDatabase(database, join(folder, DATABASE_FILE));

  const existing = await listKeys(storage.client, storage.bucket);
  say(`bucket ${storage.bucket}: removing ${existing.length} objects, then putting back ${objects.length}…`);
  for (const key of existing) await storage.client.send(new DeleteObjectCommand({ Bucket: storage.bucket, Key: key }));
  for (const object of objects) {
    const bytes = readFileSync(join(folder, OBJECTS_DIR, object.sha256));
    // Read again since the check: refuse bytes changed in between rather than store them.
    if (sha256Bytes(bytes) !== object.sha256) throw new Error(`${OBJECTS_DIR}/${object.sha256} changed during the restore; run it again.`);
    await storage.client.send(
      new PutObjectCommand({
        Bucket: storage.bucket,
        Key: object.key,
        Body: bytes,
        ContentLength: bytes.length,
        ContentType: object.contentType,
        CacheControl: object.cacheControl ?? undefined,
        Metadata: object.metadata,
      }),
    );
  }
  return { manifest, deleted: existing.length, restored: objects.length };
}
