/*
 * Backups and restores of the embedded database (scripts/backup-core.ts). The checks a restore
 * makes come from SQLite's own tools: PRAGMA integrity_check (https://sqlite.org/pragma.html#pragma_integrity_check)
 * and VACUUM INTO (https://sqlite.org/lang_vacuum.html#vacuuminto: "the original database is
 * unchanged … the resulting file is a transactionally consistent snapshot").
 */
import { randomUUID } from "node:crypto";
import { existsSync, readdirSync } from "node:fs";
import { mkdir, readFile, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { createClient } from "@libsql/client";
import { expect, test } from "vitest";
import {
  BackupError,
  checkBackup,
  createBackup,
  databaseFileOf,
  DB_FILE,
  MANIFEST_FILE,
  restoreBackup,
  type Manifest,
} from "../../scripts/backup-core";
import { demoCompany } from "./support/demo";

const migrationsFolder = path.resolve(__dirname, "../../drizzle");
const scratch = () => path.join(tmpdir(), "emberwright-tests", `backup-${randomUUID()}`);

async function backupOfTestDatabase() {
  await demoCompany();
  const uploadsDir = process.env.UPLOADS_DIR!;
  await mkdir(uploadsDir, { recursive: true });
  await writeFile(path.join(uploadsDir, `${randomUUID()}.jpg`), Buffer.from([0xff, 0xd8, 0xff, 0xd9]));
  return createBackup({ databaseUrl: process.env.DATABASE_URL!, uploadsDir, backupsDir: scratch() });
}

/** Rewrites the manifest's checksum after a deliberate change, so the deeper checks are reached. */
async function resealManifest(folder: string) {
  const { createHash } = await import("node:crypto");
  const manifest = JSON.parse(await readFile(path.join(folder, MANIFEST_FILE), "utf8")) as Manifest;
  manifest.database.sha256 = createHash("sha256")
    .update(await readFile(path.join(folder, DB_FILE)))
    .digest("hex");
  await writeFile(path.join(folder, MANIFEST_FILE), JSON.stringify(manifest));
}

test("a backup is a dated folder with the database copy, the photos and a manifest that counts them; nothing half-written is left", async () => {
  const { folder, manifest } = await backupOfTestDatabase();
  expect(path.basename(folder)).toMatch(/^emberwright-\d{4}-\d{2}-\d{2}T\d{2}-\d{2}-\d{2}Z$/);
  expect(readdirSync(folder).sort()).toEqual([DB_FILE, MANIFEST_FILE, "uploads"]);
  expect(readdirSync(path.dirname(folder)).some((n) => n.endsWith(".partial"))).toBe(false);
  const live = createClient({ url: process.env.DATABASE_URL! });
  const leads = Number((await live.execute("SELECT count(*) AS n FROM leads")).rows[0]!.n);
  live.close();
  expect(manifest.rows.leads).toBe(leads);
  expect(manifest.rows.leads).toBeGreaterThan(0);
  expect(manifest.uploads.files).toBe(readdirSync(process.env.UPLOADS_DIR!).length);
  expect(manifest.migrations.count).toBe(readdirSync(migrationsFolder).filter((f) => f.endsWith(".sql")).length);
  expect((await checkBackup(folder, migrationsFolder)).pendingMigrations).toBe(0);
});

test("a restore into a fresh data folder brings back the database and the photos", async () => {
  const { folder, manifest } = await backupOfTestDatabase();
  const target = scratch();
  const result = await restoreBackup({
    folder,
    databaseUrl: `file:${path.join(target, "emberwright.db")}`,
    uploadsDir: path.join(target, "uploads"),
    migrationsFolder,
  });
  expect(result.rows).toEqual(manifest.rows);
  expect(readdirSync(path.join(target, "uploads")).sort()).toEqual(readdirSync(path.join(folder, "uploads")).sort());
});

test("a restore over an existing database needs --replace, and keeps the old file beside the new one", async () => {
  const { folder } = await backupOfTestDatabase();
  const target = scratch();
  const args = {
    folder,
    databaseUrl: `file:${path.join(target, "emberwright.db")}`,
    uploadsDir: path.join(target, "uploads"),
    migrationsFolder,
  };
  await restoreBackup(args);
  await expect(restoreBackup(args)).rejects.toThrow(/exists.*--replace/);
  const again = await restoreBackup({ ...args, replace: true });
  expect(again.movedAside).toHaveLength(1);
  expect(existsSync(again.movedAside[0]!)).toBe(true);
});

test("a changed database file is refused by its checksum, before anything is written", async () => {
  const { folder } = await backupOfTestDatabase();
  const file = path.join(folder, DB_FILE);
  const bytes = await readFile(file);
  bytes[bytes.length - 100] = bytes[bytes.length - 100]! ^ 0xff;
  await writeFile(file, bytes);
  const target = scratch();
  await expect(
    restoreBackup({
      folder,
      databaseUrl: `file:${path.join(target, "emberwright.db")}`,
      uploadsDir: path.join(target, "uploads"),
      migrationsFolder,
    }),
  ).rejects.toThrow(/SHA-256/);
  expect(existsSync(target)).toBe(false);
});

test("a damaged database that still matches its manifest fails the integrity check", async () => {
  const { folder } = await backupOfTestDatabase();
  const file = path.join(folder, DB_FILE);
  const bytes = await readFile(file);
  // Scribble over the middle pages (b-tree pages of the tables), keeping the 100-byte header intact.
  const page = bytes.readUInt16BE(16) || 65536;
  bytes.fill(0x5a, page * 3, page * 6);
  await writeFile(file, bytes);
  await resealManifest(folder);
  await expect(checkBackup(folder, migrationsFolder)).rejects.toThrow(BackupError);
  await expect(checkBackup(folder, migrationsFolder)).rejects.toThrow(/integrity|cannot be read|malformed/i);
});

test("a backup from newer code (a migration this code lacks) is refused; an older one is accepted and reports what will run", async () => {
  const newer = (await backupOfTestDatabase()).folder;
  const copy = createClient({ url: `file:${path.join(newer, DB_FILE)}` });
  await copy.execute("INSERT INTO __drizzle_migrations (hash, created_at) VALUES ('from-the-future', 4102444800000)");
  copy.close();
  await resealManifest(newer);
  await expect(checkBackup(newer, migrationsFolder)).rejects.toThrow(/newer code/);

  const older = (await backupOfTestDatabase()).folder;
  const old = createClient({ url: `file:${path.join(older, DB_FILE)}` });
  await old.execute(
    "DELETE FROM __drizzle_migrations WHERE created_at = (SELECT max(created_at) FROM __drizzle_migrations)",
  );
  old.close();
  await resealManifest(older);
  expect((await checkBackup(older, migrationsFolder)).pendingMigrations).toBe(1);
});

test("a libSQL server URL is refused with the reason (the server keeps its own backups)", () => {
  expect(() => databaseFileOf("libsql://db.example.test")).toThrow(/libSQL server keeps its own backups/);
  expect(databaseFileOf("file:./data/x.db")).toBe(path.resolve("data/x.db"));
});
