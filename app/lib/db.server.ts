import { mkdirSync } from "node:fs";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import * as schema from "~/db/schema";
import { env } from "~/lib/env.server";

export type Db = LibSQLDatabase<typeof schema>;

/**
 * How long a write waits for another connection's lock (milliseconds) before SQLITE_BUSY. Other
 * processes on the same file are other connections; so are this client's own pooled ones.
 */
export const BUSY_TIMEOUT_MS = 5_000;

/** Opens a libSQL database (file, memory or server URL); creates the data folder for file URLs. */
export function openDatabase(url: string, authToken?: string): { client: Client; db: Db } {
  if (url.startsWith("file:")) {
    // libSQL does not create parent folders.
    mkdirSync(path.dirname(url.slice("file:".length)), { recursive: true });
  }
  // The client keeps a pool of connections, and `PRAGMA busy_timeout` would reach only the one it
  // ran on: `timeout` applies to every connection the pool opens (file databases; servers ignore it).
  const client = createClient({ url, authToken, timeout: BUSY_TIMEOUT_MS });
  return { client, db: drizzle(client, { schema }) };
}

const MIGRATE_DEADLINE_MS = 60_000;
const messageOf = (error: unknown) => `${(error as Error)?.message ?? error} ${(error as { cause?: Error })?.cause?.message ?? ""}`;
const isLocked = (error: unknown) => /SQLITE_BUSY|database is locked|SQLITE_LOCKED/i.test(messageOf(error));
const isAlreadyDone = (error: unknown) => /already exists|duplicate column/i.test(messageOf(error));

/** How many migrations the journal records (0 before the first). */
async function appliedMigrations(client: Client): Promise<number> {
  try {
    const { rows } = await client.execute("SELECT count(*) AS n FROM __drizzle_migrations");
    return Number(rows[0]?.n ?? 0);
  } catch {
    return 0;
  }
}

/**
 * Applies the committed SQL migrations in drizzle/ and turns on WAL for file databases. Several
 * processes may start at once on a fresh database: each pending migration set runs in one
 * transaction, so the loser of the race rolls back whole (locked, or "table already exists") and
 * tries again, finding the journal up to date.
 */
export async function prepareDatabase(client: Client, db: Db, url: string): Promise<void> {
  const deadline = Date.now() + MIGRATE_DEADLINE_MS;
  for (let attempt = 1; ; attempt++) {
    const appliedBefore = await appliedMigrations(client).catch(() => 0);
    try {
      // WAL is a property of the file; the pragma is for files only (a libSQL server manages its own).
      if (url.startsWith("file:")) await client.execute("PRAGMA journal_mode = WAL");
      await client.execute("PRAGMA foreign_keys = ON");
      await migrate(db, { migrationsFolder: path.resolve(process.cwd(), "drizzle") });
      return;
    } catch (error) {
      // "Already exists" is a race only when someone else moved the journal meanwhile; otherwise it is
      // a real fault in a migration and must stop the start.
      const isRace = isLocked(error) || (isAlreadyDone(error) && (await appliedMigrations(client).catch(() => 0)) > appliedBefore);
      if (!isRace || Date.now() > deadline) throw error;
      // Another process is migrating: wait a little (with jitter) and read the journal again.
      await new Promise((r) => setTimeout(r, Math.min(1_000, 50 * attempt) + Math.random() * 100));
    }
  }
}

const opened = openDatabase(env.DATABASE_URL, env.DATABASE_AUTH_TOKEN);
export const client = opened.client;
export const db = opened.db;

// Migrations run once, when the server first loads this module.
await prepareDatabase(client, db, env.DATABASE_URL);

let writeQueue: Promise<unknown> = Promise.resolve();

/**
 * Runs an interactive write transaction behind an in-process queue. libSQL answers SQLITE_BUSY at
 * once when a second write meets an open transaction, so writes that need one wait their turn.
 * Never await a network call (payments, e-mail) inside `work`.
 */
export function writeTransaction<T>(work: Parameters<Db["transaction"]>[0] extends (tx: infer Tx) => unknown ? (tx: Tx) => Promise<T> : never): Promise<T> {
  const run = writeQueue.then(() => db.transaction(work));
  writeQueue = run.catch(() => undefined);
  return run;
}
