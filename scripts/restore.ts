/*
 * npm run restore -- <backup folder> [--replace]: checks a backup (SQLite integrity check, file
 * checksum, migrations level) and puts it in place at DATABASE_URL and UPLOADS_DIR. Stop every app
 * process first. An existing database is refused without --replace, and kept beside the new one
 * with it. See scripts/backup-core.ts.
 */
import path from "node:path";
import { BackupError, restoreBackup } from "./backup-core";

const args = process.argv.slice(2);
const folder = args.find((a) => !a.startsWith("--"));
if (!folder) {
  console.error("Usage: npm run restore -- <backup folder> [--replace]");
  process.exit(2);
}
try {
  const result = await restoreBackup({
    folder: path.resolve(folder),
    databaseUrl: process.env.DATABASE_URL ?? "file:./data/emberwright.db",
    uploadsDir: process.env.UPLOADS_DIR ?? "./data/uploads",
    migrationsFolder: path.resolve("drizzle"),
    replace: args.includes("--replace"),
  });
  console.log(
    `Restored the backup of ${result.manifest.createdAt} to ${result.target}: ${result.rows.leads} requests, ${result.rows.companies} companies (integrity ok).` +
      (result.pendingMigrations > 0
        ? ` ${result.pendingMigrations} newer migration(s) will be applied when the app starts.`
        : "") +
      (result.movedAside.length ? ` The previous database is kept as ${result.movedAside[0]}.` : ""),
  );
} catch (error) {
  console.error(error instanceof BackupError ? `Restore refused: ${error.message}` : error);
  process.exit(1);
}
