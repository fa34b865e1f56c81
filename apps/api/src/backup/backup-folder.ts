import { createHash } from "node:crypto";
import { createReadStream, existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative, sep } from "node:path";
import { z } from "zod";

/*
 * One backup is one dated folder:
 *   manifest.json   what, when, from where, the schema migration that was current, counts and sizes
 *   database.sql    the MariaDB dump (mariadb-dump --single-transaction)
 *   objects.json    every object of the photo bucket: key, content type, cache header, metadata, size, SHA-256
 *   objects/<sha256>  each object's bytes, named by their SHA-256 (one file for identical bytes)
 *   SHA256SUMS      "<sha256>  <path>" for every file above (the format `sha256sum -c` reads)
 */

export const BACKUP_FORMAT = "grainyard-backup";
export const MANIFEST_FILE = "manifest.json";
export const DATABASE_FILE = "database.sql";
export const OBJECTS_FILE = "objects.json";
export const OBJECTS_DIR = "objects";
export const CHECKSUMS_FILE = "SHA256SUMS";

const sha256Schema = z.string().regex(/^[0-9a-f]{64}$/);

const storedObjectSchema = z.object({
  key: z
    .string()
    .min(1)
    .max(1024)
    .refine((key) => !key.startsWith("/"), "an object key may not start with /"),
  contentType: z.string().min(1),
  cacheControl: z.string().nullable(),
  metadata: z.record(z.string(), z.string()),
  bytes: z.number().int().nonnegative(),
  sha256: sha256Schema,
});
export type StoredObject = z.infer<typeof storedObjectSchema>;
const objectListSchema = z.array(storedObjectSchema);

const manifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  formatVersion: z.literal(1),
  createdAt: z.string(),
  tookMs: z.number(),
  source: z.object({ databaseHost: z.string(), database: z.string(), bucket: z.string() }),
  schemaMigration: z.object({ name: z.string(), timestamp: z.number() }).nullable(),
  database: z.object({
    file: z.literal(DATABASE_FILE),
    tool: z.string(),
    bytes: z.number(),
    /** Rows per table, counted in a consistent snapshot taken just before the dump's own. */
    tableRows: z.record(z.string(), z.number()),
  }),
  objects: z.object({ file: z.literal(OBJECTS_FILE), count: z.number(), bytes: z.number() }),
});
export type BackupManifest = z.infer<typeof manifestSchema>;

export async function sha256File(file: string): Promise<string> {
  const hash = createHash("sha256");
  for await (const chunk of createReadStream(file)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

export const sha256Bytes = (bytes: Buffer) => createHash("sha256").update(bytes).digest("hex");

/** Every file under `dir`, as paths relative to it with forward slashes. */
function filesUnder(dir: string): string[] {
  const found: string[] = [];
  const walk = (at: string) => {
    for (const entry of readdirSync(at, { withFileTypes: true })) {
      const path = join(at, entry.name);
      if (entry.isDirectory()) walk(path);
      else found.push(relative(dir, path).split(sep).join("/"));
    }
  };
  walk(dir);
  return found.sort();
}

export function checksumLines(sums: Map<string, string>): string {
  return [...sums.entries()].map(([path, sum]) => `${sum}  ${path}\n`).join("");
}

export class BackupRefused extends Error {}

/**
 * Checks a backup folder before anything is touched: it is a Grainyard backup, every file listed in
 * SHA256SUMS is there with its checksum, no file is there that is not listed, and every object the
 * list names has its bytes. Resolves with the manifest and the object list; throws BackupRefused
 * naming every problem otherwise.
 */
export async function verifyBackup(folder: string): Promise<{ manifest: BackupManifest; objects: StoredObject[] }> {
  if (!existsSync(folder)) throw new BackupRefused(`${folder} does not exist.`);
  if (!statSync(folder).isDirectory()) throw new BackupRefused(`${folder} is not a folder.`);
  const sumsFile = join(folder, CHECKSUMS_FILE);
  const manifestFile = join(folder, MANIFEST_FILE);
  if (!existsSync(manifestFile) || !existsSync(sumsFile))
    throw new BackupRefused(
      `${folder} is not a Grainyard backup (no ${MANIFEST_FILE} and ${CHECKSUMS_FILE}); give the dated folder npm run backup wrote.`,
    );

  const listed = new Map<string, string>();
  for (const [index, line] of readFileSync(sumsFile, "utf8").split("\n").entries()) {
    if (!line) continue;
    const match = /^([0-9a-f]{64}) {2}(.+)$/.exec(line);
    if (!match || match[2]!.split("/").includes("..") || match[2]!.startsWith("/"))
      throw new BackupRefused(`${CHECKSUMS_FILE} line ${index + 1} is not "<sha256>  <path>": the backup is damaged.`);
    listed.set(match[2]!, match[1]!);
  }

  const problems: string[] = [];
  for (const [path, expected] of listed) {
    const file = join(folder, path);
    if (!existsSync(file)) problems.push(`${path} is missing`);
    else if ((await sha256File(file)) !== expected) problems.push(`${path} does not match its checksum`);
  }
  for (const path of filesUnder(folder))
    if (path !== CHECKSUMS_FILE && !listed.has(path)) problems.push(`${path} is not part of the backup`);
  for (const required of [MANIFEST_FILE, DATABASE_FILE, OBJECTS_FILE])
    if (!listed.has(required)) problems.push(`${required} is not listed in ${CHECKSUMS_FILE}`);
  if (problems.length)
    throw new BackupRefused(`the backup in ${folder} is damaged or changed, so nothing was restored:\n  - ${problems.join("\n  - ")}`);

  const manifest = manifestSchema.safeParse(JSON.parse(readFileSync(manifestFile, "utf8")));
  if (!manifest.success)
    throw new BackupRefused(`${MANIFEST_FILE} in ${folder} is not a Grainyard backup manifest of a format this version reads.`);
  const objects = objectListSchema.safeParse(JSON.parse(readFileSync(join(folder, OBJECTS_FILE), "utf8")));
  if (!objects.success) throw new BackupRefused(`${OBJECTS_FILE} in ${folder} is not a list of stored objects.`);
  const withoutBytes = objects.data.filter((object) => listed.get(`${OBJECTS_DIR}/${object.sha256}`) !== object.sha256);
  if (withoutBytes.length)
    throw new BackupRefused(
      `${withoutBytes.length} objects in ${OBJECTS_FILE} have no bytes in ${OBJECTS_DIR}/ (first: ${withoutBytes[0]!.key}).`,
    );
  if (objects.data.length !== manifest.data.objects.count)
    throw new BackupRefused(`${OBJECTS_FILE} lists ${objects.data.length} objects, the manifest ${manifest.data.objects.count}.`);
  return { manifest: manifest.data, objects: objects.data };
}
