/*
 * Two production processes on one database behind the balancer, under a steady stream of
 * homeowner requests: a backup taken meanwhile holds every request acknowledged before it began,
 * and a process killed with SIGKILL mid-stream loses nothing that was acknowledged while the other
 * carries on. "Acknowledged" is what the homeowner saw: the 302 to the confirmation page.
 */
import { existsSync, readdirSync } from "node:fs";
import path from "node:path";
import { createClient } from "@libsql/client";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { startCluster, type Cluster } from "./support/cluster";
import { sendLead, yardPhoto } from "./support/http";

let cluster: Cluster;

beforeAll(async () => {
  cluster = await startCluster({ name: "two", processes: 2 });
});
afterAll(async () => {
  await cluster?.stop();
});

type Sent = {
  ref: string | null;
  status: number;
  startedAt: number;
  answeredAt: number;
  backend: string | null;
  withPhoto: boolean;
};

/** Workers that send requests through the balancer one after another until `stop()`; every answer is kept. */
function streamLeads(workers: number, label: string, photoEvery = 0) {
  const sent: Sent[] = [];
  let stopped = false;
  let n = 0;
  const photo = yardPhoto(7);
  const loops = Array.from({ length: workers }, async () => {
    while (!stopped) {
      const i = ++n;
      const withPhoto = photoEvery > 0 && i % photoEvery === 0;
      const startedAt = Date.now();
      try {
        const answer = await sendLead(cluster.origin, cluster.origin, {
          email: `${label}.${i}@example.test`,
          name: `Stream ${label} ${i}`,
          photo: withPhoto ? await photo : undefined,
        });
        sent.push({
          ref: answer.ref,
          status: answer.status,
          startedAt,
          answeredAt: Date.now(),
          backend: answer.backend,
          withPhoto,
        });
      } catch {
        sent.push({ ref: null, status: 0, startedAt, answeredAt: Date.now(), backend: null, withPhoto });
      }
    }
  });
  return {
    sent,
    stop: async () => {
      stopped = true;
      await Promise.all(loops);
      return sent;
    },
  };
}

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Waits until `count` answers match (a slow machine sets the pace, not a fixed sleep). */
async function untilAnswers(sent: Sent[], count: number, match: (s: Sent) => boolean, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  while (sent.filter(match).length < count) {
    if (Date.now() > deadline)
      throw new Error(`Only ${sent.filter(match).length} of ${count} expected answers within ${timeoutMs / 1000} s.`);
    await pause(50);
  }
}

async function storedRefs(db: { execute: Cluster["db"]["execute"] }, refs: string[]): Promise<Set<string>> {
  const found = new Set<string>();
  for (let i = 0; i < refs.length; i += 200) {
    const chunk = refs.slice(i, i + 200);
    const { rows } = await db.execute({
      sql: `SELECT ref FROM leads WHERE ref IN (${chunk.map(() => "?").join(",")})`,
      args: chunk,
    });
    for (const r of rows) found.add(String(r.ref));
  }
  return found;
}

describe("two processes under a stream of requests", () => {
  test("a backup taken under write load holds every request acknowledged before it started, and restores into a fresh data folder", async () => {
    const stream = streamLeads(4, `backup-${Date.now()}`, 3);
    await untilAnswers(stream.sent, 8, (s) => s.status === 302);
    const backupStartedAt = Date.now();
    const backupsDir = path.join(cluster.dataDir, "backups");
    await cluster.runScript("scripts/backup.ts", ["--to", backupsDir]);
    const backupEndedAt = Date.now();
    await pause(500);
    const sent = await stream.stop();

    const ackedBefore = sent.filter((s) => s.status === 302 && s.answeredAt < backupStartedAt);
    const ackedDuring = sent.filter(
      (s) => s.status === 302 && s.answeredAt >= backupStartedAt && s.answeredAt <= backupEndedAt,
    );
    expect(ackedBefore.length).toBeGreaterThanOrEqual(8);
    // Writes really went on while the backup ran.
    expect(ackedDuring.length).toBeGreaterThan(0);
    expect(sent.filter((s) => s.status !== 302)).toEqual([]);

    const [folder] = readdirSync(backupsDir).filter((n) => !n.endsWith(".partial"));
    const fresh = path.join(cluster.dataDir, "restored");
    await cluster.runScript("scripts/restore.ts", [path.join(backupsDir, folder!)], {
      DATABASE_URL: `file:${path.join(fresh, "emberwright.db")}`,
      UPLOADS_DIR: path.join(fresh, "uploads"),
    });
    const restored = createClient({ url: `file:${path.join(fresh, "emberwright.db")}` });
    try {
      const found = await storedRefs(
        restored,
        ackedBefore.map((s) => s.ref!),
      );
      expect(ackedBefore.filter((s) => !found.has(s.ref!)).map((s) => s.ref)).toEqual([]);
      // Every photo of those requests came back with them.
      const withPhotos = ackedBefore.filter((s) => s.withPhoto).map((s) => s.ref!);
      expect(withPhotos.length).toBeGreaterThan(0);
      const { rows } = await restored.execute({
        sql: `SELECT p.stored_name FROM lead_photos p JOIN leads l ON l.id = p.lead_id WHERE l.ref IN (${withPhotos.map(() => "?").join(",")})`,
        args: withPhotos,
      });
      expect(rows.length).toBe(withPhotos.length);
      for (const r of rows)
        expect(existsSync(path.join(fresh, "uploads", String(r.stored_name))), String(r.stored_name)).toBe(true);
      expect((await restored.execute("PRAGMA integrity_check")).rows.map((r) => r[0])).toEqual(["ok"]);
    } finally {
      restored.close();
    }
  });

  test("kill -9 of one process mid-stream: every acknowledged request is stored, the other process carries on, and the killed one comes back", async () => {
    const [victim, survivor] = cluster.apps;
    const stream = streamLeads(6, `kill-${Date.now()}`);
    for (const app of [victim!, survivor!])
      await untilAnswers(stream.sent, 3, (s) => s.status === 302 && s.backend === app.origin);
    const killedAt = Date.now();
    victim!.kill9();
    await untilAnswers(stream.sent, 8, (s) => s.status === 302 && s.startedAt > killedAt + 1_000);
    const sent = await stream.stop();

    const acked = sent.filter((s) => s.status === 302);
    const before = acked.filter((s) => s.answeredAt < killedAt);
    const after = acked.filter((s) => s.startedAt > killedAt + 1_000);
    // Both processes were answering before the kill; only the survivor after it.
    expect(new Set(before.map((s) => s.backend))).toEqual(new Set([victim!.origin, survivor!.origin]));
    expect(after.length).toBeGreaterThanOrEqual(8);
    expect(new Set(after.map((s) => s.backend))).toEqual(new Set([survivor!.origin]));
    // What failed was in flight on the killed process (at most one request per worker).
    const failed = sent.filter((s) => s.status !== 302);
    expect(failed.length).toBeLessThanOrEqual(6);
    for (const f of failed) expect(f.startedAt).toBeLessThanOrEqual(killedAt + 1_000);

    // Nothing acknowledged is lost.
    const found = await storedRefs(
      cluster.db,
      acked.map((s) => s.ref!),
    );
    expect(acked.filter((s) => !found.has(s.ref!)).map((s) => s.ref)).toEqual([]);
    expect((await cluster.db.execute("PRAGMA integrity_check")).rows.map((r) => r[0])).toEqual(["ok"]);

    // The survivor's background worker sends the confirmation e-mails of every acknowledged
    // request, including those the killed process had stored but not yet sent. Rows the killed
    // process had claimed keep its lease until it lapses (5 minutes); move those leases to the past,
    // as if that time had gone by, so the survivor retakes them.
    await cluster.db.execute({
      sql: "UPDATE email_outbox SET lease_expires_at = '2000-01-01T00:00:00.000Z' WHERE status = 'pending' AND lease_owner LIKE ?",
      args: [`%:${victim!.child.pid}:%`],
    });
    const keys = acked.map((s) => s.ref!);
    await expect
      .poll(
        async () => {
          const { rows } = await cluster.db.execute({
            sql: `SELECT count(*) AS n FROM email_outbox o JOIN leads l ON o.idempotency_key = 'lead-received/' || l.id WHERE o.status = 'sent' AND l.ref IN (${keys.map(() => "?").join(",")})`,
            args: keys,
          });
          return Number(rows[0]!.n);
        },
        { timeout: 40_000, interval: 500 },
      )
      .toBe(keys.length);

    // The killed process starts again on the same file (SQLite recovers the WAL) and takes its share.
    await cluster.restart(0);
    await expect.poll(() => cluster.balancer.liveTargets().length, { timeout: 10_000 }).toBe(2);
    const again = await Promise.all(
      [1, 2, 3, 4].map((i) =>
        sendLead(cluster.origin, cluster.origin, { email: `back.${Date.now()}.${i}@example.test` }),
      ),
    );
    expect(again.map((a) => a.status)).toEqual([302, 302, 302, 302]);
    expect(new Set(again.map((a) => a.backend)).size).toBe(2);
  });
});
