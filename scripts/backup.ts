/*
 * npm run backup [-- --to <folder>]: a consistent copy of the database and the uploaded photos
 * in a dated folder (under BACKUP_DIR, default ./data/backups), safe while the app runs.
 * See scripts/backup-core.ts for how, and README "Backups" for how often and where to keep copies.
 */
import path from "node:path";
import { BackupError, createBackup } from "./backup-core";

const shortPath = (p: string) =>
  path.relative(process.cwd(), p).startsWith("..") ? p : path.relative(process.cwd(), p);
const args = process.argv.slice(2);
const toAt = args.indexOf("--to");
const backupsDir = toAt >= 0 && args[toAt + 1] ? args[toAt + 1]! : (process.env.BACKUP_DIR ?? "./data/backups");
try {
  const { folder, manifest } = await createBackup({
    databaseUrl: process.env.DATABASE_URL ?? "file:./data/emberwright.db",
    uploadsDir: process.env.UPLOADS_DIR ?? "./data/uploads",
    backupsDir,
  });
  console.log(
    `Backup written to ${shortPath(folder)}: ${manifest.rows.leads} requests, ${manifest.rows.companies} companies, ` +
      `${manifest.uploads.files} photos, ${manifest.migrations.count} migrations, database ${(manifest.database.bytes / 1024).toFixed(0)} KiB (integrity ok).`,
  );
} catch (error) {
  console.error(error instanceof BackupError ? `Backup failed: ${error.message}` : error);
  process.exit(1);
}
