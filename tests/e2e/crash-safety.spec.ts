import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, rmSync } from "node:fs";
import path from "node:path";
import { createClient } from "@libsql/client";
import { expect, test } from "@playwright/test";

// A server of its own, so killing it does not disturb the other journeys.
const PORT = 3291;
const ROOT = path.resolve("data/e2e-crash");
const DB_URL = `file:${path.join(ROOT, "emberwright.db")}`;
const UPLOADS = path.join(ROOT, "uploads");
const env = {
  ...process.env,
  NODE_ENV: "production",
  DATABASE_URL: DB_URL,
  UPLOADS_DIR: UPLOADS,
  SESSION_SECRET: "crash-test-secret-0123456789abcdef0123456789",
  APP_ORIGIN: `http://127.0.0.1:${PORT}`,
  STRIPE_WEBHOOK_SECRET: "whsec_crash_0123456789",
  STRIPE_SECRET_KEY: "sk_test_crash_0123456789",
  RESEND_API_KEY: "re_crash_0123456789",
  PORT: String(PORT),
  HOST: "127.0.0.1",
  PUBLIC_FORM_LIMIT: "100000",
  // No e-mail service here: mail waits in the outbox, which is what this test inspects.
  RESEND_BASE_URL: "http://127.0.0.1:9",
};

function startServer(): ChildProcess {
  return spawn("node", ["server.mjs"], { env, stdio: "ignore" });
}

async function waitForHealth() {
  for (let i = 0; i < 100; i++) {
    try {
      if ((await fetch(`http://127.0.0.1:${PORT}/api/health`)).ok) return;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error("server did not start");
}

const TOTAL = 400;
// A real 2 × 2 PNG: uploads are decoded and encoded again, so it must be a picture.
const PNG = Buffer.from(
  "89504e470d0a1a0a0000000d494844520000000200000002080600000072b60d240000000970485973000003e8000003e801b57b526b0000001149444154089963385161f31f8419600c00588c09edd7703b820000000049454e44ae426082",
  "hex",
);

function submit(i: number) {
  const form = new FormData();
  for (const [k, v] of Object.entries({
    customerName: `Crash Test ${i}`,
    email: `crash${i}@example.test`,
    phone: "(970) 555-0100",
    street: `${i} Test Row`,
    town: "Millbrook Falls",
    buildWindow: "not-sure",
    consent: "on",
    design: "units=14",
  }))
    form.set(k, v);
  form.append("photos", new File([PNG], "a.png", { type: "image/png" }));
  form.append("photos", new File([PNG], "b.png", { type: "image/png" }));
  return fetch(`http://127.0.0.1:${PORT}/c/cinder-slate`, {
    method: "POST",
    body: form,
    redirect: "manual",
    headers: { Origin: `http://127.0.0.1:${PORT}` },
  }).then(
    (r) => r.status,
    () => 0,
  );
}

test("the app killed (SIGKILL) in the middle of lead submissions leaves no half-written request", async () => {
  test.setTimeout(90_000);
  rmSync(ROOT, { recursive: true, force: true });
  mkdirSync(ROOT, { recursive: true });
  for (const script of ["db:migrate", "db:seed"])
    expect(spawnSync("npm", ["run", "--silent", script], { env, stdio: "ignore" }).status).toBe(0);

  let server = startServer();
  await waitForHealth();
  // Eight senders keep submitting; the server is killed once some requests have landed, so others
  // are caught half-way (photos on disk, transaction open, or answer not yet sent).
  const watcher = createClient({ url: DB_URL });
  let isDead = false;
  let next = 0;
  const statuses: number[] = [];
  const sender = async () => {
    while (!isDead && next < TOTAL) statuses.push(await submit(next++));
  };
  const senders = Array.from({ length: 8 }, sender);
  while (
    Number(
      (await watcher.execute("select count(*) as n from leads where customer_name like 'Crash Test %'")).rows[0]!.n,
    ) < 12
  ) {
    await new Promise((r) => setTimeout(r, 10));
  }
  server.kill("SIGKILL");
  isDead = true;
  await Promise.all(senders);
  watcher.close();
  const accepted = statuses.filter((s) => s === 302 || s === 303).length;
  expect(
    statuses.some((s) => s === 0),
    "some requests were cut off by the kill",
  ).toBe(true);

  server = startServer();
  try {
    await waitForHealth();
    const db = createClient({ url: DB_URL });
    const leads = (await db.execute("select id from leads where customer_name like 'Crash Test %'")).rows.map((r) =>
      Number(r.id),
    );
    // Every request the server answered as saved is there; some in flight may also have landed.
    expect(leads.length).toBeGreaterThanOrEqual(accepted);
    for (const id of leads) {
      const photos = (await db.execute({ sql: "select stored_name from lead_photos where lead_id = ?", args: [id] }))
        .rows;
      expect(photos, `lead ${id} photos`).toHaveLength(2);
      for (const p of photos)
        expect(existsSync(path.join(UPLOADS, String(p.stored_name))), `lead ${id} photo file`).toBe(true);
      const mail = (
        await db.execute({
          sql: "select count(*) as n from email_outbox where idempotency_key in (?, ?)",
          args: [`lead-received/${id}`, `lead-new/${id}`],
        })
      ).rows[0]!;
      expect(Number(mail.n), `lead ${id} e-mails`).toBe(2);
      const events = (await db.execute({ sql: "select count(*) as n from lead_events where lead_id = ?", args: [id] }))
        .rows[0]!;
      expect(Number(events.n), `lead ${id} events`).toBe(1);
    }
    // Files written for requests that never committed have no record; the sweep removes them later.
    const recorded = new Set(
      (await db.execute("select stored_name from lead_photos")).rows.map((r) => String(r.stored_name)),
    );
    const stray = existsSync(UPLOADS) ? readdirSync(UPLOADS).filter((f) => !recorded.has(f)) : [];
    // At most the eight requests in flight, each with two photos, each photo as its incoming file and
    // its re-encoded copy (the incoming file is removed only after the copy is written).
    expect(stray.length).toBeLessThanOrEqual(8 * 2 * 2);
    test.info().annotations.push({
      type: "crash",
      description: `answered saved ${accepted}, saved ${leads.length}, stray files ${stray.length}`,
    });
    console.log(`crash test: answered saved ${accepted}, saved ${leads.length}, stray files ${stray.length}`);
    db.close();
  } finally {
    server.kill("SIGKILL");
  }
});
