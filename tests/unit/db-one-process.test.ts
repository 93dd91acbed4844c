/*
 * Writes inside one process while an interactive write transaction is open (a lead being saved,
 * a payment notice being applied): another request's plain write must wait for the transaction to
 * commit, without failing and without freezing the process meanwhile. SQLite allows one writer at
 * a time (https://sqlite.org/lockingv3.html, https://sqlite.org/wal.html#concurrency).
 */
import { sql } from "drizzle-orm";
import { expect, test } from "vitest";
import { db, writeTransaction } from "~/lib/platform/db.server";

test("a plain write during an open write transaction waits for the commit, and the process keeps serving meanwhile", async () => {
  await db.run(sql`CREATE TABLE IF NOT EXISTS probe_one (id INTEGER PRIMARY KEY, who TEXT NOT NULL)`);
  let release!: () => void;
  const released = new Promise<void>((r) => (release = r));
  let inside!: () => void;
  const isInside = new Promise<void>((r) => (inside = r));
  const transaction = writeTransaction(async (tx) => {
    await tx.run(sql`INSERT INTO probe_one (who) VALUES ('transaction')`);
    inside();
    // Awaiting inside the transaction, as work that renders e-mails does.
    await released;
  });
  await isInside;
  const started = Date.now();
  // (A query builder runs when awaited: start it now.)
  const plain = (async () => db.run(sql`INSERT INTO probe_one (who) VALUES ('plain')`))();
  // The event loop still turns: a timer set now fires on time while the plain write waits.
  const timerLag = await new Promise<number>((resolve) => {
    const at = Date.now();
    setTimeout(() => resolve(Date.now() - at - 100), 100);
  });
  expect(timerLag).toBeLessThan(400);
  release();
  await transaction;
  await plain;
  expect(Date.now() - started).toBeLessThan(3_000);
  const rows = await db.all<{ who: string }>(sql`SELECT who FROM probe_one ORDER BY id`);
  expect(rows.map((r) => r.who)).toEqual(["transaction", "plain"]);
});
