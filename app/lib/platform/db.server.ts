import { mkdirSync } from "node:fs";
import path from "node:path";
import { createClient, type Client, type InStatement, type Transaction, type TransactionMode } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import { readMigrationFiles } from "drizzle-orm/migrator";
import * as schema from "~/db/schema";
import { env } from "~/lib/platform/env.server";

export type Db = LibSQLDatabase<typeof schema>;

/*
 * One writer at a time, with several processes on one file.
 *
 * SQLite lets one connection write at a time (https://sqlite.org/wal.html#concurrency). Between
 * processes, a writer that finds the lock taken waits for it inside the driver (the busy timeout,
 * set on every pooled connection: `PRAGMA busy_timeout` would reach only the one it ran on). Inside
 * one process that wait would be fatal: the driver is synchronous, so a write waiting for this
 * process's own open transaction freezes the event loop the transaction needs to finish. So within
 * a process, writes take turns through an async gate (below), and only a lock held by another
 * process is waited for in the driver; those waits last as long as the other process's transaction
 * (milliseconds: never await the network inside one).
 *
 * A statement refused with SQLITE_BUSY is not retried on the same connection: this driver leaves
 * it unreset, and the connection's next COMMIT then fails with "SQL statements in progress".
 */
export const BUSY_TIMEOUT_MS = 5_000;
// How long a write waits for this process's earlier writes before giving up (a guard, not a pace).
const GATE_TIMEOUT_MS = 15_000;

const messageOf = (error: unknown) =>
  `${(error as Error)?.message ?? error} ${(error as { cause?: Error })?.cause?.message ?? ""}`;
const isBusy = (error: unknown) =>
  String((error as { code?: string })?.code ?? "").startsWith("SQLITE_BUSY") ||
  /SQLITE_BUSY|database is locked/i.test(messageOf(error));

/** An async mutex: `acquire` resolves with a release function once every earlier holder released. */
function createWriteGate() {
  let tail: Promise<void> = Promise.resolve();
  return async function acquire(): Promise<() => void> {
    let release!: () => void;
    const mine = new Promise<void>((resolve) => (release = resolve));
    const before = tail;
    tail = before.then(() => mine);
    let timer: NodeJS.Timeout | undefined;
    try {
      await Promise.race([
        before,
        new Promise<never>((_, reject) => {
          timer = setTimeout(
            () =>
              reject(
                Object.assign(new Error("SQLITE_BUSY: database is locked (this process's writes queued too long)"), {
                  code: "SQLITE_BUSY",
                }),
              ),
            GATE_TIMEOUT_MS,
          );
        }),
      ]);
    } catch (error) {
      // Give up the turn without breaking the line: pass it on when it comes.
      void before.then(release);
      throw error;
    } finally {
      clearTimeout(timer);
    }
    let released = false;
    return () => {
      if (released) return;
      released = true;
      release();
    };
  };
}

const READ_ONLY =
  /^\s*(select|explain|pragma\s+\w+\s*(;|$)|pragma\s+(table_info|index_list|foreign_key_check|integrity_check|quick_check))/i;

/** Whether a statement may write: everything but plain reads (SELECT, a WITH … SELECT, reading pragmas). */
function mayWrite(statement: InStatement): boolean {
  const text = typeof statement === "string" ? statement : statement.sql;
  const body = text.replace(/^(\s*(--[^\n]*\n|\/\*[\s\S]*?\*\/))*/, "");
  if (READ_ONLY.test(body)) return false;
  if (/^\s*with\b/i.test(body)) return /\b(insert|update|delete|replace)\b/i.test(body);
  return true;
}

/** The client with this process's writes taking turns (see above); reads go straight through. */
function withWriteGate(client: Client): Client {
  const acquire = createWriteGate();
  const gated = async <T>(work: () => Promise<T>): Promise<T> => {
    const release = await acquire();
    try {
      return await work();
    } finally {
      release();
    }
  };
  const gatedTransaction = async (mode?: TransactionMode): Promise<Transaction> => {
    if (mode === "read") return client.transaction(mode);
    const release = await acquire();
    let tx: Transaction;
    try {
      tx = await client.transaction(mode);
    } catch (error) {
      release();
      throw error;
    }
    // The turn lasts until the transaction ends: a failed COMMIT is followed by a rollback.
    return new Proxy(tx, {
      get(target, property) {
        const value = Reflect.get(target, property, target) as unknown;
        if (typeof value !== "function") return value;
        const method = value as (...args: unknown[]) => unknown;
        if (property === "commit") return async () => ((await method.apply(target, [])) as void, release());
        if (property === "rollback")
          return async () => {
            try {
              await method.apply(target, []);
            } finally {
              release();
            }
          };
        if (property === "close")
          return () => {
            try {
              method.apply(target, []);
            } finally {
              release();
            }
          };
        return method.bind(target);
      },
    });
  };
  return new Proxy(client, {
    get(target, property) {
      const value = Reflect.get(target, property, target) as unknown;
      if (typeof value !== "function") return value;
      // The client keeps private fields: always call its methods on the client itself.
      const method = (value as (...args: unknown[]) => Promise<unknown>).bind(target);
      switch (property) {
        case "execute":
          return (statement: InStatement, ...rest: unknown[]) =>
            mayWrite(statement) ? gated(() => method(statement, ...rest)) : method(statement, ...rest);
        case "batch":
          return (statements: InStatement[], mode?: TransactionMode) =>
            mode === "read" ? method(statements, mode) : gated(() => method(statements, mode));
        case "migrate":
        case "executeMultiple":
          return (...args: unknown[]) => gated(() => method(...args));
        case "transaction":
          return gatedTransaction;
        default:
          return method;
      }
    },
  });
}

/** Opens a libSQL database (file, memory or server URL); creates the data folder for file URLs. */
export function openDatabase(url: string, authToken?: string): { client: Client; db: Db } {
  if (url.startsWith("file:")) {
    // libSQL does not create parent folders.
    mkdirSync(path.dirname(url.slice("file:".length)), { recursive: true });
  }
  // `timeout` is the busy timeout of every connection the pool opens (file databases only).
  const client = withWriteGate(createClient({ url, authToken, timeout: BUSY_TIMEOUT_MS }));
  return { client, db: drizzle(client, { schema }) };
}

const MIGRATE_DEADLINE_MS = 60_000;
const MIGRATIONS_TABLE = "__drizzle_migrations";
const migrationsFolder = () => path.resolve(process.cwd(), "drizzle");
const isAlreadyDone = (error: unknown) => /already exists|duplicate column/i.test(messageOf(error));

/** How many migrations the journal records (0 before the first). */
async function appliedMigrations(client: Client): Promise<number> {
  try {
    const { rows } = await client.execute(`SELECT count(*) AS n FROM ${MIGRATIONS_TABLE}`);
    return Number(rows[0]?.n ?? 0);
  } catch {
    return 0;
  }
}

/**
 * Applies the pending migrations of drizzle/ to a database file, holding the write lock from the
 * journal read to the commit (BEGIN IMMEDIATE), so that of several processes starting at once on a
 * fresh file one migrates and the others wait, then find the journal up to date. Same journal table
 * and rule as drizzle's migrator (a migration is pending when it is newer than the last one
 * recorded), so `drizzle-kit migrate` and this agree. Foreign keys are off during the migration, as
 * table rebuilds need, and checked before the commit (https://sqlite.org/lang_altertable.html,
 * "Making Other Kinds Of Table Schema Changes", steps 1, 10 and 12).
 */
async function migrateFileDatabase(url: string): Promise<void> {
  const migrations = readMigrationFiles({ migrationsFolder: migrationsFolder() });
  const deadline = Date.now() + MIGRATE_DEADLINE_MS;
  for (;;) {
    // One connection, so the pragmas and the transaction share it; a fresh one for every try.
    const client = createClient({ url, concurrency: 1, timeout: BUSY_TIMEOUT_MS });
    try {
      await client.execute("PRAGMA journal_mode = WAL");
      await client.execute("PRAGMA foreign_keys = OFF");
      const tx = await client.transaction("write");
      try {
        await tx.execute(
          `CREATE TABLE IF NOT EXISTS ${MIGRATIONS_TABLE} (id SERIAL PRIMARY KEY, hash text NOT NULL, created_at numeric)`,
        );
        const [last] = (await tx.execute(`SELECT created_at FROM ${MIGRATIONS_TABLE} ORDER BY created_at DESC LIMIT 1`))
          .rows;
        const lastAt = last ? Number(last.created_at) : Number.NEGATIVE_INFINITY;
        const pending = migrations.filter((m) => m.folderMillis > lastAt);
        for (const migration of pending) {
          for (const statement of migration.sql) if (statement.trim()) await tx.execute(statement);
          await tx.execute({
            sql: `INSERT INTO ${MIGRATIONS_TABLE} ("hash", "created_at") VALUES (?, ?)`,
            args: [migration.hash, migration.folderMillis],
          });
        }
        if (pending.length > 0) {
          const broken = (await tx.execute("PRAGMA foreign_key_check")).rows;
          if (broken.length > 0)
            throw new Error(
              `The migrations leave ${broken.length} row(s) pointing at missing rows (first in table ${String(broken[0]![0])}); nothing was changed.`,
            );
        }
        await tx.commit();
        return;
      } finally {
        tx.close();
      }
    } catch (error) {
      // Another process is migrating and took longer than one busy wait: try again on a new connection.
      if (!isBusy(error) || Date.now() > deadline) throw error;
    } finally {
      client.close();
    }
  }
}

/**
 * Applies the committed SQL migrations in drizzle/ (and, for files, turns on WAL: the journal mode
 * is a property of the file; a libSQL server manages its own). Safe when several processes start at
 * once on a fresh database.
 */
export async function prepareDatabase(client: Client, db: Db, url: string): Promise<void> {
  if (url.startsWith("file:")) {
    await migrateFileDatabase(url);
    await client.execute("PRAGMA foreign_keys = ON");
    return;
  }
  // A libSQL server: drizzle's migrator sends the pending set as one batch, which the server runs
  // as one transaction; the loser of a race ("already exists") rolls back whole and reads again.
  const deadline = Date.now() + MIGRATE_DEADLINE_MS;
  for (let attempt = 1; ; attempt++) {
    const appliedBefore = await appliedMigrations(client);
    try {
      await client.execute("PRAGMA foreign_keys = ON");
      await migrate(db, { migrationsFolder: migrationsFolder() });
      return;
    } catch (error) {
      // "Already exists" is a race only when someone else moved the journal meanwhile; otherwise it
      // is a real fault in a migration and must stop the start.
      const isRace = isBusy(error) || (isAlreadyDone(error) && (await appliedMigrations(client)) > appliedBefore);
      if (!isRace || Date.now() > deadline) throw error;
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
 * Runs an interactive write transaction behind an in-process queue (the client's write gate holds
 * other writes of this process until it ends). Never await a network call (payments, e-mail)
 * inside `work`.
 */
export function writeTransaction<T>(
  work: Parameters<Db["transaction"]>[0] extends (tx: infer Tx) => unknown ? (tx: Tx) => Promise<T> : never,
): Promise<T> {
  const run = writeQueue.then(() => db.transaction(work));
  writeQueue = run.catch(() => undefined);
  return run;
}

/** One round trip to the database (the health check); throws when it cannot be reached. */
export async function pingDatabase(): Promise<void> {
  await client.execute("select 1");
}
