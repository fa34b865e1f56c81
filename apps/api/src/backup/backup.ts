import { GetObjectCommand, HeadObjectCommand, ListObjectsV2Command, type S3Client } from "@aws-sdk/client-s3";
import { existsSync, mkdirSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import mysql from "mysql2/promise";
import type { AppConfig } from "../config.ts";
import type { PhotoStorage } from "../integrations/storage.ts";
import {
  BACKUP_FORMAT,
  CHECKSUMS_FILE,
  checksumLines,
  DATABASE_FILE,
  MANIFEST_FILE,
  OBJECTS_DIR,
  OBJECTS_FILE,
  sha256Bytes,
  sha256File,
  type BackupManifest,
  type StoredObject,
} from "./backup-folder.ts";
import { dumpDatabase, toolVersion } from "./mariadb-client.ts";

export type Progress = (line: string) => void;

/** 2026-12-03T15-04-05Z: a folder name that sorts by time and is valid everywhere. */
function backupStamp(at: Date): string {
  return at
    .toISOString()
    .replace(/\.\d{3}Z$/, "Z")
    .replace(/:/g, "-");
}

/** Every key in the bucket, page by page. */
export async function listKeys(client: S3Client, bucket: string): Promise<string[]> {
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const page = await client.send(new ListObjectsV2Command({ Bucket: bucket, ContinuationToken: token }));
    for (const { Key } of page.Contents ?? []) if (Key) keys.push(Key);
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return keys.sort();
}

async function readObject(client: S3Client, bucket: string, key: string) {
  const answer = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
  const bytes = Buffer.from(await answer.Body!.transformToByteArray());
  // GetObject's headers carry the content type; HeadObject is asked too for the cache header and metadata
  // in case a store leaves them out of GET answers.
  const head = await client.send(new HeadObjectCommand({ Bucket: bucket, Key: key }));
  return {
    bytes,
    contentType: answer.ContentType ?? head.ContentType ?? "application/octet-stream",
    cacheControl: answer.CacheControl ?? head.CacheControl ?? null,
    metadata: { ...(head.Metadata ?? {}), ...(answer.Metadata ?? {}) },
  };
}

/** Rows per table and the newest applied migration, in one consistent snapshot. */
async function describeDatabase(database: AppConfig["database"]) {
  const connection = await mysql.createConnection({ ...database, dateStrings: true });
  try {
    await connection.query("START TRANSACTION WITH CONSISTENT SNAPSHOT, READ ONLY");
    const [tables] = (await connection.query(
      "SELECT table_name AS name FROM information_schema.tables WHERE table_schema = ? AND table_type = 'BASE TABLE' ORDER BY table_name",
      [database.database],
    )) as unknown as [{ name: string }[]];
    const tableRows: Record<string, number> = {};
    for (const { name } of tables) {
      const [rows] = (await connection.query(`SELECT COUNT(*) AS n FROM \`${name.replace(/`/g, "``")}\``)) as unknown as [{ n: number }[]];
      tableRows[name] = Number(rows[0]!.n);
    }
    let schemaMigration: BackupManifest["schemaMigration"] = null;
    if ("schema_migration" in tableRows) {
      const [rows] = (await connection.query("SELECT name, timestamp FROM schema_migration ORDER BY id DESC LIMIT 1")) as unknown as [
        { name: string; timestamp: string | number }[],
      ];
      if (rows[0]) schemaMigration = { name: rows[0].name, timestamp: Number(rows[0].timestamp) };
    }
    await connection.query("COMMIT");
    return { tableRows, schemaMigration };
  } finally {
    await connection.end();
  }
}

const megabytes = (bytes: number) => `${(bytes / 1_048_576).toFixed(1)} MB`;

/**
 * Writes one backup under `root` into a folder named by the time: the database dump first (its
 * snapshot is the moment of the backup), then a copy of every object of the photo bucket read
 * through the S3 API, the object list, the manifest and the checksums. The folder is built under a
 * `.partial` name and renamed when complete, so a folder with the dated name is always whole.
 */
export async function createBackup(options: {
  database: AppConfig["database"];
  storage: PhotoStorage;
  root: string;
  progress?: Progress;
  now?: Date;
}): Promise<{ folder: string; manifest: BackupManifest }> {
  const { database, storage, root } = options;
  const say = options.progress ?? (() => undefined);
  const started = options.now ?? new Date();
  const folder = join(root, backupStamp(started));
  if (existsSync(folder)) throw new Error(`${folder} already exists; wait a second and run the backup again.`);
  const partial = `${folder}.partial`;
  rmSync(partial, { recursive: true, force: true });
  mkdirSync(join(partial, OBJECTS_DIR), { recursive: true });
  try {
    say(`database ${database.database} on ${database.host}:${database.port}: counting rows…`);
    const { tableRows, schemaMigration } = await describeDatabase(database);
    say(`dumping ${Object.keys(tableRows).length} tables with mariadb-dump --single-transaction…`);
    await dumpDatabase(database, join(partial, DATABASE_FILE));
    const dumpBytes = statSync(join(partial, DATABASE_FILE)).size;
    say(`database dump: ${megabytes(dumpBytes)}`);

    const keys = await listKeys(storage.client, storage.bucket);
    say(`bucket ${storage.bucket}: copying ${keys.length} objects…`);
    const objects: StoredObject[] = [];
    let objectBytes = 0;
    for (const [index, key] of keys.entries()) {
      const object = await readObject(storage.client, storage.bucket, key);
      const sha256 = sha256Bytes(object.bytes);
      const file = join(partial, OBJECTS_DIR, sha256);
      if (!existsSync(file)) writeFileSync(file, object.bytes);
      objects.push({
        key,
        contentType: object.contentType,
        cacheControl: object.cacheControl,
        metadata: object.metadata,
        bytes: object.bytes.length,
        sha256,
      });
      objectBytes += object.bytes.length;
      if ((index + 1) % 100 === 0) say(`  ${index + 1} of ${keys.length} objects (${megabytes(objectBytes)})`);
    }
    writeFileSync(join(partial, OBJECTS_FILE), `${JSON.stringify(objects, null, 2)}\n`);

    const manifest: BackupManifest = {
      format: BACKUP_FORMAT,
      formatVersion: 1,
      createdAt: started.toISOString(),
      tookMs: Date.now() - started.getTime(),
      source: { databaseHost: `${database.host}:${database.port}`, database: database.database, bucket: storage.bucket },
      schemaMigration,
      database: { file: DATABASE_FILE, tool: await toolVersion("mariadb-dump"), bytes: dumpBytes, tableRows },
      objects: { file: OBJECTS_FILE, count: objects.length, bytes: objectBytes },
    };
    writeFileSync(join(partial, MANIFEST_FILE), `${JSON.stringify(manifest, null, 2)}\n`);

    say("checksums (SHA-256) of every file…");
    const sums = new Map<string, string>();
    for (const name of [MANIFEST_FILE, DATABASE_FILE, OBJECTS_FILE]) sums.set(name, await sha256File(join(partial, name)));
    // The objects' files are named by their SHA-256, which was taken of the bytes written.
    for (const sha256 of [...new Set(objects.map((object) => object.sha256))].sort()) sums.set(`${OBJECTS_DIR}/${sha256}`, sha256);
    writeFileSync(join(partial, CHECKSUMS_FILE), checksumLines(sums));
    renameSync(partial, folder);
    return { folder, manifest };
  } catch (error) {
    rmSync(partial, { recursive: true, force: true });
    throw error;
  }
}
