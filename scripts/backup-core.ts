/*
 * Backups of the embedded database and the uploaded photos (`npm run backup`, `npm run restore`).
 *
 * A backup is a dated folder: `emberwright.db` written by SQLite's VACUUM INTO (one read
 * transaction, so a consistent snapshot while every app process keeps writing: WAL readers never
 * block writers), then `uploads/` copied after it, then `manifest.json`. Photos are written before
 * the record that names them, so every photo the snapshot names is already on disk when the
 * folder is copied; files of requests that were still arriving are harmless extras (the background
 * sweep removes photos no record names). The folder is written under a `.partial` name and
 * renamed when complete, so a crash never leaves something that looks like a backup.
 *
 * A restore checks the copy first: SQLite's integrity check, and the migrations level (every
 * migration recorded in the backup must be one this code has; a backup from newer code is refused,
 * an older one is migrated forward when the app starts).
 */
import { createHash } from "node:crypto";
import { existsSync } from "node:fs";
import { cp, mkdir, readdir, readFile, rename, rm, stat, writeFile } from "node:fs/promises";
import path from "node:path";
import { createClient } from "@libsql/client";
import { readMigrationFiles } from "drizzle-orm/migrator";

export const DB_FILE = "emberwright.db";
export const MANIFEST_FILE = "manifest.json";
export const UPLOADS_FOLDER = "uploads";

export type Manifest = {
  format: 1;
  createdAt: string;
  database: { file: string; bytes: number; sha256: string };
  migrations: { count: number; lastHash: string | null; lastCreatedAt: number | null };
  rows: { companies: number; leads: number; leadPhotos: number; bookings: number };
  uploads: { files: number; bytes: number };
};

export class BackupError extends Error {}

/** The database file behind a `file:` URL; other URLs (a libSQL server) are refused with the reason. */
export function databaseFileOf(url: string): string {
  if (!url.startsWith("file:")) {
    throw new BackupError(
      `DATABASE_URL is ${url.split(":")[0]}:… — npm run backup copies an embedded database file. A libSQL server keeps its own backups: use the server's snapshots or its hosting's point-in-time restore.`,
    );
  }
  return path.resolve(url.slice("file:".length).replace(/^\/\/(?=\/)/, ""));
}

const sha256 = async (file: string) =>
  createHash("sha256")
    .update(await readFile(file))
    .digest("hex");
const sqlString = (s: string) => `'${s.replace(/'/g, "''")}'`;
const stampOf = (date: Date) =>
  date
    .toISOString()
    .replace(/\.\d+Z$/, "Z")
    .replace(/:/g, "-");

async function filesUnder(dir: string): Promise<{ files: number; bytes: number }> {
  if (!existsSync(dir)) return { files: 0, bytes: 0 };
  let files = 0;
  let bytes = 0;
  for (const entry of await readdir(dir, { withFileTypes: true, recursive: true })) {
    if (!entry.isFile()) continue;
    files += 1;
    bytes += (await stat(path.join(entry.parentPath, entry.name))).size;
  }
  return { files, bytes };
}

/** Integrity, migrations and row counts of a database file (opened read-only in spirit: nothing is written). */
export async function inspectDatabase(
  file: string,
): Promise<{ integrity: string[]; migrations: { hash: string; createdAt: number }[]; rows: Manifest["rows"] }> {
  const client = createClient({ url: `file:${file}`, timeout: 5_000 });
  try {
    const integrity = (await client.execute("PRAGMA integrity_check")).rows.map((r) => String(r[0]));
    let migrations: { hash: string; createdAt: number }[] = [];
    try {
      migrations = (
        await client.execute("SELECT hash, created_at FROM __drizzle_migrations ORDER BY created_at")
      ).rows.map((r) => ({ hash: String(r.hash), createdAt: Number(r.created_at) }));
    } catch {
      migrations = [];
    }
    const count = async (table: string) => {
      try {
        return Number((await client.execute(`SELECT count(*) AS n FROM ${table}`)).rows[0]!.n);
      } catch {
        return 0;
      }
    };
    return {
      integrity,
      migrations,
      rows: {
        companies: await count("companies"),
        leads: await count("leads"),
        leadPhotos: await count("lead_photos"),
        bookings: await count("bookings"),
      },
    };
  } finally {
    client.close();
  }
}

/** Writes a backup folder under `backupsDir` and returns its path. */
export async function createBackup(args: {
  databaseUrl: string;
  uploadsDir: string;
  backupsDir: string;
  now?: Date;
}): Promise<{ folder: string; manifest: Manifest }> {
  const source = databaseFileOf(args.databaseUrl);
  if (!existsSync(source)) throw new BackupError(`There is no database at ${source}.`);
  await mkdir(args.backupsDir, { recursive: true });
  const now = args.now ?? new Date();
  let folder = path.join(path.resolve(args.backupsDir), `emberwright-${stampOf(now)}`);
  for (let n = 2; existsSync(folder); n++)
    folder = path.join(path.resolve(args.backupsDir), `emberwright-${stampOf(now)}-${n}`);
  const partial = `${folder}.partial`;
  await rm(partial, { recursive: true, force: true });
  await mkdir(partial, { recursive: true });
  try {
    const copy = path.join(partial, DB_FILE);
    const client = createClient({ url: `file:${source}`, timeout: 30_000 });
    try {
      // One read transaction over the whole file: a snapshot as of its start, safe beside writers.
      await client.execute(`VACUUM INTO ${sqlString(copy)}`);
    } finally {
      client.close();
    }
    // After the snapshot, so every photo it names is already there.
    const uploadsCopy = path.join(partial, UPLOADS_FOLDER);
    if (existsSync(args.uploadsDir))
      await cp(args.uploadsDir, uploadsCopy, { recursive: true, errorOnExist: false, force: true });
    else await mkdir(uploadsCopy);

    const inspected = await inspectDatabase(copy);
    if (inspected.integrity.join() !== "ok")
      throw new BackupError(`The copy failed its integrity check: ${inspected.integrity.slice(0, 5).join("; ")}`);
    const last = inspected.migrations.at(-1) ?? null;
    const manifest: Manifest = {
      format: 1,
      createdAt: now.toISOString(),
      database: { file: DB_FILE, bytes: (await stat(copy)).size, sha256: await sha256(copy) },
      migrations: {
        count: inspected.migrations.length,
        lastHash: last?.hash ?? null,
        lastCreatedAt: last?.createdAt ?? null,
      },
      rows: inspected.rows,
      uploads: await filesUnder(uploadsCopy),
    };
    await writeFile(path.join(partial, MANIFEST_FILE), `${JSON.stringify(manifest, null, 2)}\n`);
    await rename(partial, folder);
    return { folder, manifest };
  } catch (error) {
    await rm(partial, { recursive: true, force: true });
    throw error;
  }
}

/** Everything a restore checks before it touches anything; throws BackupError naming the problem. */
export async function checkBackup(
  folder: string,
  migrationsFolder: string,
): Promise<{ manifest: Manifest; pendingMigrations: number }> {
  const manifestPath = path.join(folder, MANIFEST_FILE);
  const copy = path.join(folder, DB_FILE);
  if (!existsSync(manifestPath) || !existsSync(copy))
    throw new BackupError(`${folder} is not a backup folder: it needs ${MANIFEST_FILE} and ${DB_FILE}.`);
  let manifest: Manifest;
  try {
    manifest = JSON.parse(await readFile(manifestPath, "utf8")) as Manifest;
  } catch {
    throw new BackupError(`${manifestPath} is not readable JSON.`);
  }
  if (manifest.format !== 1)
    throw new BackupError(`${manifestPath} has format ${String(manifest.format)}; this code reads format 1.`);
  if ((await sha256(copy)) !== manifest.database.sha256)
    throw new BackupError(`${copy} is not the file the backup wrote (its SHA-256 differs from the manifest's).`);
  let inspected: Awaited<ReturnType<typeof inspectDatabase>>;
  try {
    inspected = await inspectDatabase(copy);
  } catch (error) {
    throw new BackupError(`${copy} cannot be read as a database: ${(error as Error).message}`);
  }
  if (inspected.integrity.join() !== "ok")
    throw new BackupError(`${copy} failed SQLite's integrity check: ${inspected.integrity.slice(0, 5).join("; ")}`);
  const known = readMigrationFiles({ migrationsFolder });
  const knownHashes = new Set(known.map((m) => m.hash));
  const unknown = inspected.migrations.filter((m) => !knownHashes.has(m.hash));
  if (unknown.length > 0) {
    throw new BackupError(
      `${copy} records ${unknown.length} migration(s) this code does not have (a backup from newer code): restore it with the code it was taken with.`,
    );
  }
  if (inspected.migrations.length === 0)
    throw new BackupError(`${copy} has no migrations journal: it is not an Emberwright database.`);
  return { manifest, pendingMigrations: known.length - inspected.migrations.length };
}

/**
 * Puts a checked backup in place of the database file and the uploads folder. An existing database
 * is refused unless `replace` is set; then it (and its WAL files) is moved aside, not deleted.
 * Stop every app process first.
 */
export async function restoreBackup(args: {
  folder: string;
  databaseUrl: string;
  uploadsDir: string;
  migrationsFolder: string;
  replace?: boolean;
  now?: Date;
}) {
  const { manifest, pendingMigrations } = await checkBackup(args.folder, args.migrationsFolder);
  const target = databaseFileOf(args.databaseUrl);
  const movedAside: string[] = [];
  if (existsSync(target)) {
    if (!args.replace)
      throw new BackupError(
        `${target} exists. Stop every app process, then run the restore again with --replace (the current file is kept beside it).`,
      );
    const stamp = stampOf(args.now ?? new Date());
    for (const suffix of ["", "-wal", "-shm"]) {
      if (!existsSync(target + suffix)) continue;
      const aside = `${target}.before-restore-${stamp}${suffix}`;
      await rename(target + suffix, aside);
      movedAside.push(aside);
    }
  }
  await mkdir(path.dirname(target), { recursive: true });
  const incoming = `${target}.restoring`;
  await cp(path.join(args.folder, DB_FILE), incoming);
  await rename(incoming, target);
  // Photos have unique generated names: copy in what is missing, keep what is there.
  const uploadsCopy = path.join(args.folder, UPLOADS_FOLDER);
  await mkdir(args.uploadsDir, { recursive: true });
  if (existsSync(uploadsCopy))
    await cp(uploadsCopy, args.uploadsDir, { recursive: true, force: false, errorOnExist: false });
  const restored = await inspectDatabase(target);
  if (restored.integrity.join() !== "ok") throw new BackupError(`The restored ${target} failed its integrity check.`);
  return { manifest, pendingMigrations, target, movedAside, rows: restored.rows };
}
