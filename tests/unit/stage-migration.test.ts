/*
 * Requests saved before the job's stages existed move to them when the database is migrated:
 * new → request in, contacted → called back, proposal sent → proposal out, won → signed,
 * lost → not going ahead with its reason kept.
 */
import { cpSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createClient } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import { expect, test } from "vitest";

const BEFORE_STAGES = "0008_cache_version_triggers";

test("existing requests keep their place in the job under the new stage names", async () => {
  const dir = mkdtempSync(path.join(tmpdir(), "stage-migration-"));
  // The migrations as they stood before the stages: the same folder with the journal cut short.
  const oldFolder = path.join(dir, "old");
  cpSync(path.resolve("drizzle"), oldFolder, { recursive: true });
  const journalPath = path.join(oldFolder, "meta", "_journal.json");
  const journal = JSON.parse(readFileSync(journalPath, "utf8")) as { entries: { tag: string }[] };
  journal.entries = journal.entries.slice(0, journal.entries.findIndex((e) => e.tag === BEFORE_STAGES) + 1);
  writeFileSync(journalPath, JSON.stringify(journal));

  const client = createClient({ url: `file:${path.join(dir, "old.db")}` });
  const db = drizzle(client);
  await migrate(db, { migrationsFolder: oldFolder });
  await client.execute("INSERT INTO companies (slug, name, email) VALUES ('m', 'Migration Masonry', 'office@m.test')");
  const old = ["new", "contacted", "consult-booked", "proposal-sent", "won", "lost"];
  for (const [i, status] of old.entries()) {
    await client.execute({
      sql: `INSERT INTO leads (company_id, ref, status, lost_reason, customer_name, email, phone, street, town, build_window, design_json, plan_json, stone_name, bowl_diameter_in, updated_at)
            VALUES (1, ?, ?, ?, 'Old Customer', 'old@example.test', '555', '1 Road', 'Town', 'not-sure', '{}', '{}', 'Stone', 36, '2026-05-01T00:00:00.000Z')`,
      args: [`old-${i}`, status, status === "lost" ? "Went with a steel bowl." : null],
    });
  }

  await migrate(db, { migrationsFolder: path.resolve("drizzle") });
  const rows = (await client.execute("SELECT ref, status, lost_reason, called_back_at FROM leads ORDER BY ref")).rows;
  expect(rows.map((r) => [r.ref, r.status, r.lost_reason, r.called_back_at])).toEqual([
    ["old-0", "request", null, null],
    ["old-1", "called-back", null, "2026-05-01T00:00:00.000Z"],
    ["old-2", "consult-booked", null, "2026-05-01T00:00:00.000Z"],
    ["old-3", "proposal-out", null, "2026-05-01T00:00:00.000Z"],
    ["old-4", "signed", null, "2026-05-01T00:00:00.000Z"],
    ["old-5", "not-going-ahead", "Went with a steel bowl.", null],
  ]);
  // A request saved after the migration starts at the first step.
  await client.execute(`INSERT INTO leads (company_id, ref, customer_name, email, phone, street, town, build_window, design_json, plan_json, stone_name, bowl_diameter_in)
            VALUES (1, 'fresh', 'New Customer', 'new@example.test', '555', '1 Road', 'Town', 'not-sure', '{}', '{}', 'Stone', 36)`);
  expect((await client.execute("SELECT status FROM leads WHERE ref = 'fresh'")).rows[0]!.status).toBe("request");
  client.close();
});
