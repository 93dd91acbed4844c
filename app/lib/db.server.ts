import { mkdirSync } from "node:fs";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import * as schema from "~/db/schema";
import { env } from "~/lib/env.server";

export type Db = LibSQLDatabase<typeof schema>;

/** Opens a libSQL database (file, memory or server URL); creates the data folder for file URLs. */
export function openDatabase(url: string, authToken?: string): { client: Client; db: Db } {
  if (url.startsWith("file:")) {
    // libSQL does not create parent folders.
    mkdirSync(path.dirname(url.slice("file:".length)), { recursive: true });
  }
  const client = createClient({ url, authToken });
  return { client, db: drizzle(client, { schema }) };
}

/** Applies the committed SQL migrations in drizzle/ and turns on WAL for file databases. */
export async function prepareDatabase(client: Client, db: Db, url: string): Promise<void> {
  if (url.startsWith("file:")) {
    await client.execute("PRAGMA journal_mode = WAL");
    await client.execute("PRAGMA busy_timeout = 5000");
  }
  await client.execute("PRAGMA foreign_keys = ON");
  await migrate(db, { migrationsFolder: path.resolve(process.cwd(), "drizzle") });
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
