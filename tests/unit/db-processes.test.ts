/*
 * The database layer with more than one process on one file: three servers starting at once on a
 * fresh database all migrate cleanly, and a write waits for another process's lock instead of
 * failing at once. SQLite's locking and busy handler: https://sqlite.org/lockingv3.html and
 * https://sqlite.org/c3ref/busy_timeout.html ("sleeps … until the lock is released or the timeout").
 */
import { spawn } from "node:child_process";
import { randomUUID } from "node:crypto";
import { mkdirSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, test } from "vitest";
import { openDatabase } from "~/lib/platform/db.server";

const root = path.resolve(__dirname, "../..");
const tsx = path.join(root, "node_modules/.bin/tsx");
const child = path.join(__dirname, "support/db-child.ts");

type Child = { done: Promise<{ code: number | null; out: string }>; go: () => void };

function runChild(env: Record<string, string>, onLine?: (line: string) => void): Child {
  const proc = spawn(tsx, [child], { cwd: root, env: { ...process.env, ...env }, stdio: ["pipe", "pipe", "pipe"] });
  const done = new Promise<{ code: number | null; out: string }>((resolve) => {
    let out = "";
    proc.stdout.on("data", (chunk: Buffer) => {
      out += chunk.toString();
      for (const line of chunk.toString().split("\n")) if (line.trim()) onLine?.(line.trim());
    });
    proc.stderr.on("data", (chunk: Buffer) => (out += chunk.toString()));
    proc.on("exit", (code) => resolve({ code, out }));
  });
  return { done, go: () => proc.stdin.end("go\n") };
}

const freshFile = () => {
  const dir = path.join(tmpdir(), "emberwright-tests", `procs-${randomUUID()}`);
  mkdirSync(dir, { recursive: true });
  return path.join(dir, "emberwright.db");
};

describe("several processes on one database file", () => {
  test("three servers starting at the same moment on a fresh database all migrate, each migration once", async () => {
    const migrations = readdirSync(path.join(root, "drizzle")).filter((f) => f.endsWith(".sql")).length;
    // Two rounds: the race is timing-dependent. Each child says "ready" once loaded; all get "go" together.
    for (let round = 0; round < 2; round++) {
      const file = freshFile();
      let ready = 0;
      let allReady!: () => void;
      const isAllReady = new Promise<void>((r) => (allReady = r));
      const children = [1, 2, 3].map(() =>
        runChild(
          { MODE: "migrate", DATABASE_URL: `file:${file}`, OUTBOX_WORKER: "off" },
          (line) => line === "ready" && ++ready === 3 && allReady(),
        ),
      );
      await isAllReady;
      for (const c of children) c.go();
      const results = await Promise.all(children.map((c) => c.done));
      for (const result of results) {
        expect(result.out).toContain(`migrated ${migrations}`);
        expect(result.code).toBe(0);
      }
      const { client } = openDatabase(`file:${file}`);
      const { rows } = await client.execute(
        "SELECT count(*) AS n, count(DISTINCT hash) AS d FROM __drizzle_migrations",
      );
      expect(Number(rows[0]!.n)).toBe(migrations);
      expect(Number(rows[0]!.d)).toBe(migrations);
      client.close();
    }
  }, 60_000);

  test("a write waits while another process holds the write lock, then succeeds", async () => {
    const file = freshFile();
    const { client } = openDatabase(`file:${file}`);
    await client.execute("PRAGMA journal_mode = WAL");
    await client.execute("CREATE TABLE probe (id INTEGER PRIMARY KEY, who TEXT NOT NULL)");
    let locked!: () => void;
    const isLocked = new Promise<void>((r) => (locked = r));
    const holder = runChild(
      { MODE: "hold", HOLD_MS: "600", DATABASE_URL: `file:${file}` },
      (line) => line === "locked" && locked(),
    ).done;
    await isLocked;
    const started = Date.now();
    await client.execute("INSERT INTO probe (who) VALUES ('waiter')");
    const waited = Date.now() - started;
    expect((await holder).code).toBe(0);
    // It really waited for the other process (the holder keeps the lock 600 ms after saying so).
    expect(waited).toBeGreaterThan(200);
    const { rows } = await client.execute("SELECT who FROM probe ORDER BY id");
    expect(rows.map((r) => r.who)).toEqual(["holder", "waiter"]);
    client.close();
  }, 30_000);
});
