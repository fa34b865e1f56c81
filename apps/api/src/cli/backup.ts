import { resolve } from "node:path";
import { createBackup } from "../backup/backup.ts";
import { ConfigError, loadConfig } from "../config.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { useLocalStackEnvironment } from "./local-environment.ts";

// `npm run backup` (through the stack runner, which starts the local services when Grainyard is not
// running): a consistent MariaDB dump and a copy of the photo bucket into a dated folder under
// .data/backups/ (or GRAINYARD_BACKUP_DIR), with a manifest and SHA-256 checksums.
useLocalStackEnvironment();
const say = (line: string) => console.log(`[backup] ${line}`);
try {
  const config = loadConfig();
  const root = resolve(process.env.GRAINYARD_BACKUP_DIR ?? resolve(import.meta.dirname, "../../../../.data/backups"));
  const storage = createPhotoStorage(config.storage);
  try {
    const { folder, manifest } = await createBackup({ database: config.database, storage, root, progress: say });
    const tables = Object.entries(manifest.database.tableRows);
    const rows = tables.reduce((sum, [, n]) => sum + n, 0);
    const mb = (bytes: number) => `${(bytes / 1_048_576).toFixed(1)} MB`;
    say(`done in ${(manifest.tookMs / 1000).toFixed(1)} s: ${folder}`);
    say(`  database ${manifest.source.database}: ${tables.length} tables, ${rows} rows, dump ${mb(manifest.database.bytes)}`);
    say(`  orders ${manifest.database.tableRows.buyer_order ?? 0}, ledger entries ${manifest.database.tableRows.ledger_entry ?? 0}`);
    say(`  schema migration: ${manifest.schemaMigration?.name ?? "none applied"}`);
    say(`  bucket ${manifest.source.bucket}: ${manifest.objects.count} objects, ${mb(manifest.objects.bytes)}`);
    say(`restore it with: npm run restore -- ${folder}`);
  } finally {
    storage.close();
  }
} catch (error) {
  console.error(`[backup] ✗ ${error instanceof ConfigError ? error.message : (error as Error).message}`);
  process.exitCode = 1;
}
