import { resolve } from "node:path";
import { BackupRefused, verifyBackup } from "../backup/backup-folder.ts";
import { restoreBackup } from "../backup/restore.ts";
import { ConfigError, loadConfig } from "../config.ts";
import { createPhotoStorage } from "../integrations/storage.ts";

// `npm run restore -- <folder>` runs this twice through the stack runner: first with --check (the
// checksums, before anything is started), then, with the local services up and the API stopped,
// for the restore itself. It takes its settings from the environment the runner gives it.
const args = process.argv.slice(2);
const checkOnly = args.includes("--check");
const [given] = args.filter((arg) => arg !== "--check");
const say = (line: string) => console.log(`[restore] ${line}`);
try {
  if (!given) throw new BackupRefused("give the backup folder: npm run restore -- .data/backups/<date>");
  const folder = resolve(process.env.INIT_CWD ?? process.cwd(), given);
  if (checkOnly) {
    const { manifest } = await verifyBackup(folder);
    say(
      `${folder}: a backup of ${manifest.source.database} and ${manifest.source.bucket} from ${manifest.createdAt}; every checksum matches`,
    );
  } else {
    const config = loadConfig();
    const storage = createPhotoStorage(config.storage);
    try {
      const started = Date.now();
      const { manifest, deleted, restored } = await restoreBackup({ database: config.database, storage, folder, progress: say });
      const tables = Object.entries(manifest.database.tableRows);
      say(
        `done in ${((Date.now() - started) / 1000).toFixed(1)} s: ${config.database.database} and ${config.storage.bucket} are as on ${manifest.createdAt}`,
      );
      say(
        `  database: ${tables.length} tables (orders ${manifest.database.tableRows.buyer_order ?? 0}, ledger entries ${manifest.database.tableRows.ledger_entry ?? 0})`,
      );
      say(`  schema migration: ${manifest.schemaMigration?.name ?? "none applied"}`);
      say(`  bucket: ${deleted} objects removed, ${restored} put back`);
    } finally {
      storage.close();
    }
  }
} catch (error) {
  const message = error instanceof ConfigError || error instanceof BackupRefused ? error.message : (error as Error).message;
  console.error(`[restore] ✗ ${message}`);
  process.exitCode = 1;
}
