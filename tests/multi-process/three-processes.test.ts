/*
 * Three production processes started at the same moment on one fresh database, behind the
 * loopback round-robin balancer. What lives outside a process must behave as one system: the
 * schema (migrated once), sessions, uploaded photos, catalogs and settings, the one-holder rule of
 * a consult slot, and a payment notice applied once whichever process gets it (and however often).
 */
import { readdirSync } from "node:fs";
import path from "node:path";
import sharp from "sharp";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { ROOT, SECRETS, startCluster, type Cluster } from "./support/cluster";
import { COMPANY, editForm, postJson, radioValues, sendLead, signIn, yardPhoto } from "./support/http";

let cluster: Cluster;
const rows = async (sql: string, args: (string | number)[] = []) => (await cluster.db.execute({ sql, args })).rows;

beforeAll(async () => {
  cluster = await startCluster({ name: "three", processes: 3 });
});
afterAll(async () => {
  await cluster?.stop();
});

describe("three processes on one database", () => {
  test("all three came up on a fresh database started together; each migration is recorded once and the file is sound", async () => {
    const migrations = readdirSync(path.join(ROOT, "drizzle")).filter((f) => f.endsWith(".sql")).length;
    const [journal] = await rows("SELECT count(*) AS n, count(DISTINCT hash) AS d FROM __drizzle_migrations");
    expect(Number(journal!.n)).toBe(migrations);
    expect(Number(journal!.d)).toBe(migrations);
    // https://sqlite.org/pragma.html#pragma_integrity_check: a sound file answers the single row "ok".
    expect((await rows("PRAGMA integrity_check")).map((r) => r[0])).toEqual(["ok"]);
    for (const app of cluster.apps) expect((await fetch(`${app.origin}/api/health`)).status).toBe(200);
  });

  test("the balancer spreads requests over every process", async () => {
    const backends = new Set<string>();
    for (let i = 0; i < 9; i++)
      backends.add((await fetch(`${cluster.origin}/api/health`)).headers.get("x-emberwright-backend") ?? "");
    expect([...backends].sort()).toEqual(cluster.apps.map((a) => a.origin).sort());
  });

  test("a session started on one process is valid on the others, and signing out on one ends it on all", async () => {
    const [a, b, c] = cluster.apps;
    const cookie = await signIn(a!.origin, cluster.origin, "owner@cinder-slate.test");
    for (const app of [a!, b!, c!]) {
      const res = await fetch(`${app.origin}/app/inbox`, { headers: { Cookie: cookie }, redirect: "manual" });
      expect(res.status, app.origin).toBe(200);
    }
    const out = await fetch(`${c!.origin}/logout`, {
      method: "POST",
      headers: { Cookie: cookie, Origin: cluster.origin },
      redirect: "manual",
    });
    expect(out.status).toBeLessThan(400);
    for (const app of [a!, b!]) {
      const res = await fetch(`${app.origin}/app/inbox`, { headers: { Cookie: cookie }, redirect: "manual" });
      expect(res.status, app.origin).toBe(302);
      expect(res.headers.get("location")).toMatch(/^\/login/);
    }
  });

  test("a photo sent through one process is stored in the shared uploads folder and served by the others", async () => {
    const [a, b, c] = cluster.apps;
    const sent = await sendLead(a!.origin, cluster.origin, {
      email: `photo.${Date.now()}@example.test`,
      photo: await yardPhoto(1),
    });
    expect(sent.status).toBe(302);
    const [lead] = await rows("SELECT id FROM leads WHERE ref = ?", [sent.ref!]);
    const photos = await rows("SELECT id, stored_name FROM lead_photos WHERE lead_id = ?", [Number(lead!.id)]);
    expect(photos).toHaveLength(1);
    expect(readdirSync(cluster.uploadsDir)).toContain(String(photos[0]!.stored_name));
    const staff = await signIn(b!.origin, cluster.origin, "estimator@cinder-slate.test");
    for (const app of [b!, c!]) {
      const res = await fetch(`${app.origin}/photos/${Number(photos[0]!.id)}`, { headers: { Cookie: staff } });
      expect(res.status, app.origin).toBe(200);
      expect(res.headers.get("content-type")).toMatch(/^image\//);
      const meta = await sharp(Buffer.from(await res.arrayBuffer())).metadata();
      expect([meta.width, meta.height]).toEqual([64, 48]);
    }
  });

  test("a catalog price edited through one process is used by another's next plan; a settings change too", async () => {
    const [a, b, c] = cluster.apps;
    const ids = Object.fromEntries(
      (
        await rows(
          "SELECT c.name, c.id, c.price_cents FROM catalog_items c JOIN companies co ON co.id = c.company_id WHERE co.slug = ?",
          [COMPANY],
        )
      ).map((r) => [String(r.name), { id: Number(r.id), priceCents: Number(r.price_cents) }]),
    );
    const unit = ids["Hearthline Taper"]!;
    const body = {
      company: COMPANY,
      ring: { bowlDiameterIn: 36, fit: "at-least" },
      wallUnit: { id: unit.id },
      courses: 4,
      cap: { id: ids["Sill Cap 16"]!.id, innerOverhangIn: 1 },
    };
    // Every process has planned with (and so cached) the current catalog.
    const before = await Promise.all(cluster.apps.map((app) => postJson(app.origin, "/api/plan", body)));
    for (const plan of before) expect(plan.json.price).toEqual(before[0]!.json.price);

    const owner = await signIn(a!.origin, cluster.origin, "owner@cinder-slate.test");
    const saved = await editForm(a!.origin, cluster.origin, owner, `/app/catalog/${unit.id}`, {
      price: ((unit.priceCents * 5) / 100).toFixed(2),
    });
    expect(saved.status).toBe(302);
    expect(Number((await rows("SELECT price_cents FROM catalog_items WHERE id = ?", [unit.id]))[0]!.price_cents)).toBe(
      unit.priceCents * 5,
    );

    const afterB = await postJson(b!.origin, "/api/plan", body);
    const afterA = await postJson(a!.origin, "/api/plan", body);
    expect(afterB.json.price!.lowCents).toBeGreaterThan(before[0]!.json.price!.lowCents);
    expect(afterB.json.price).toEqual(afterA.json.price);

    const settings = await editForm(c!.origin, cluster.origin, owner, "/app/settings/factors", {
      labourRateCentsPerHour: "300",
    });
    expect(settings.status).toBe(302);
    const afterSettingsB = await postJson(b!.origin, "/api/plan", body);
    const afterSettingsC = await postJson(c!.origin, "/api/plan", body);
    expect(afterSettingsB.json.price!.lowCents).toBeGreaterThan(afterB.json.price!.lowCents);
    expect(afterSettingsB.json.price).toEqual(afterSettingsC.json.price);
  });

  test("twenty homeowners booking the same consult time at once, spread over the processes, open exactly one checkout", async () => {
    const stamp = Date.now();
    const leads: string[] = [];
    for (let batch = 0; batch < 4; batch++) {
      const sent = await Promise.all(
        [0, 1, 2, 3, 4].map((i) =>
          sendLead(cluster.origin, cluster.origin, {
            email: `slot.${stamp}.${batch * 5 + i}@example.test`,
            name: `Slot Seeker ${batch * 5 + i}`,
          }),
        ),
      );
      for (const s of sent) expect(s.status).toBe(302);
      leads.push(...sent.map((s) => s.ref!));
    }
    const page = await (await fetch(`${cluster.origin}/c/${COMPANY}/consult/${leads[0]}`)).text();
    const startsAt = radioValues(page, "startsAt")[0];
    expect(startsAt).toBeTruthy();
    const sessionsBefore = (
      (await (await fetch(`${cluster.payments.url}/_fake/sessions`)).json()) as { data: unknown[] }
    ).data.length;

    const answers = await Promise.all(
      leads.map(async (ref) => {
        const res = await fetch(`${cluster.origin}/c/${COMPANY}/consult/${ref}`, {
          method: "POST",
          headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: cluster.origin },
          body: new URLSearchParams({ startsAt: startsAt!, timeZone: "America/Chicago" }).toString(),
          redirect: "manual",
        });
        await res.arrayBuffer();
        return {
          status: res.status,
          location: res.headers.get("location"),
          backend: res.headers.get("x-emberwright-backend"),
        };
      }),
    );
    expect(new Set(answers.map((a) => a.backend)).size).toBe(3);
    const toCheckout = answers.filter((a) => a.status === 303 && a.location?.startsWith(cluster.payments.url));
    expect(toCheckout).toHaveLength(1);
    expect(answers.filter((a) => a.status === 409)).toHaveLength(19);
    const sessions = ((await (await fetch(`${cluster.payments.url}/_fake/sessions`)).json()) as { data: unknown[] })
      .data;
    expect(sessions.length - sessionsBefore).toBe(1);
    const holders = await rows(
      "SELECT count(*) AS n FROM bookings WHERE starts_at = ? AND status IN ('held', 'confirmed')",
      [new Date(startsAt!).toISOString()],
    );
    expect(Number(holders[0]!.n)).toBe(1);
  });

  test("one payment notice delivered to every process at once (and by the payment service) is applied once", async () => {
    const [booking] = await rows(
      "SELECT id, checkout_session_id FROM bookings WHERE status = 'held' AND checkout_session_id IS NOT NULL ORDER BY id DESC LIMIT 1",
    );
    expect(booking).toBeTruthy();
    const bookingId = Number(booking!.id);
    const fake = (p: string, body: unknown) =>
      fetch(`${cluster.payments.url}${p}`, {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify(body),
      });
    // The service's own delivery waits until the twins below are on their way.
    await fake("/_fake/hold-events", { on: true });
    expect(
      (await fake(`/_fake/sessions/${String(booking!.checkout_session_id)}/pay`, { card: "4242424242424242" })).status,
    ).toBe(200);
    const events = (
      (await (await fetch(`${cluster.payments.url}/_fake/events?type=checkout.session.completed`)).json()) as {
        data: { id: string; data: { object: { id: string } } }[];
      }
    ).data;
    const event = events.find((e) => e.data.object.id === booking!.checkout_session_id)!;
    expect(event).toBeTruthy();

    const payload = JSON.stringify(event);
    const stripe = new Stripe(SECRETS.STRIPE_SECRET_KEY);
    const outcomes = await Promise.all([
      ...cluster.apps.map(async (app) => {
        const res = await fetch(`${app.origin}/api/webhooks/stripe`, {
          method: "POST",
          headers: {
            "Content-Type": "application/json",
            "Stripe-Signature": stripe.webhooks.generateTestHeaderString({
              payload,
              secret: SECRETS.STRIPE_WEBHOOK_SECRET,
            }),
          },
          body: payload,
        });
        return { status: res.status, body: (await res.json()) as { outcome?: string } };
      }),
      fake("/_fake/release-events", { order: "created" }).then(() => null),
    ]);
    const answered = outcomes.filter((o): o is NonNullable<typeof o> => o !== null);
    for (const o of answered) expect(o.status).toBe(200);
    expect(answered.filter((o) => o.body.outcome === "applied").length).toBeLessThanOrEqual(1);

    // Wait for the service's own delivery to land too, then count effects.
    await expect
      .poll(
        async () =>
          (
            (await (await fetch(`${cluster.payments.url}/_fake/deliveries`)).json()) as {
              data: { eventId: string; outcome: string }[];
            }
          ).data.filter((d) => d.eventId === event.id && d.outcome === "delivered").length,
        { timeout: 15_000 },
      )
      .toBeGreaterThanOrEqual(1);
    expect(Number((await rows("SELECT count(*) AS n FROM payment_events WHERE id = ?", [event.id]))[0]!.n)).toBe(1);
    expect(String((await rows("SELECT status FROM bookings WHERE id = ?", [bookingId]))[0]!.status)).toBe("confirmed");
    expect(
      Number(
        (
          await rows("SELECT count(*) AS n FROM email_outbox WHERE idempotency_key = ?", [
            `consult-confirmed/${bookingId}`,
          ])
        )[0]!.n,
      ),
    ).toBe(1);
  });

  test("the sign-in limit holds across processes: the 11th failure in a minute is refused whichever process answers", async () => {
    // An account no other check here signs in to; every try comes from one address (the balancer
    // forwards it, and TRUST_PROXY=loopback lets each process read it). Limit: 10 failures a minute
    // per account and address (OWASP ASVS 2.2.1 asks for such a limit; the number is the app's own).
    const email = "crew@cinder-slate.test";
    const tryOnce = async (target: string, i: number) => {
      const res = await fetch(`${target}/login`, {
        method: "POST",
        headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: cluster.origin },
        body: new URLSearchParams({ email, password: `wrong-${i}` }).toString(),
        redirect: "manual",
      });
      await res.arrayBuffer();
      return {
        status: res.status,
        backend: res.headers.get("x-emberwright-backend"),
        retryAfter: res.headers.get("retry-after"),
      };
    };
    const answers = [];
    for (let i = 0; i < 11; i++) answers.push(await tryOnce(cluster.origin, i));
    expect(answers.slice(0, 10).map((a) => a.status)).toEqual(Array(10).fill(401));
    expect(new Set(answers.slice(0, 10).map((a) => a.backend)).size).toBe(3);
    expect(answers[10]!.status).toBe(429);
    expect(Number(answers[10]!.retryAfter)).toBeGreaterThan(0);
    // Straight to each process, too: every one refuses.
    for (const [i, app] of cluster.apps.entries())
      expect((await tryOnce(app.origin, 20 + i)).status, app.origin).toBe(429);
  });

  test("with every process's worker running, each outbox e-mail is sent exactly once", async () => {
    const stamp = Date.now();
    const refs: string[] = [];
    for (let batch = 0; batch < 3; batch++) {
      const sent = await Promise.all(
        [0, 1, 2, 3].map((i) =>
          sendLead(cluster.origin, cluster.origin, { email: `once.${stamp}.${batch * 4 + i}@example.test` }),
        ),
      );
      for (const s of sent) expect(s.status).toBe(302);
      refs.push(...sent.map((s) => s.ref!));
    }
    const ids = (await rows(`SELECT id FROM leads WHERE ref IN (${refs.map(() => "?").join(",")})`, refs)).map((r) =>
      Number(r.id),
    );
    const keys = ids.flatMap((id) => [`lead-received/${id}`, `lead-new/${id}`]);
    const sentCount = async () =>
      Number(
        (
          await rows(
            `SELECT count(*) AS n FROM email_outbox WHERE status = 'sent' AND idempotency_key IN (${keys.map(() => "?").join(",")})`,
            keys,
          )
        )[0]!.n,
      );
    await expect.poll(sentCount, { timeout: 40_000, interval: 500 }).toBe(keys.length);
    // Three more passes of every worker: nothing is sent again.
    await new Promise((r) => setTimeout(r, 3_000));
    expect(
      keys.filter((k) => cluster.mailSends.get(k) !== 1).map((k) => `${k}: ${cluster.mailSends.get(k) ?? 0}`),
    ).toEqual([]);
    // And each row was claimed once: no process took a row another was sending.
    const attempts = await rows(
      `SELECT DISTINCT attempts FROM email_outbox WHERE idempotency_key IN (${keys.map(() => "?").join(",")})`,
      keys,
    );
    expect(attempts.map((r) => Number(r.attempts))).toEqual([1]);
  });

  test("a refund owed is made once, with every process's worker running", async () => {
    const [booking] = await rows(
      "SELECT id, payment_intent_id FROM bookings WHERE status = 'confirmed' AND is_paid = 1 ORDER BY id DESC LIMIT 1",
    );
    expect(booking).toBeTruthy();
    const bookingId = Number(booking!.id);
    const staff = await signIn(cluster.apps[1]!.origin, cluster.origin, "estimator@cinder-slate.test");
    const res = await fetch(`${cluster.apps[1]!.origin}/app/schedule`, {
      method: "POST",
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: cluster.origin, Cookie: staff },
      body: new URLSearchParams({ bookingId: String(bookingId) }).toString(),
      redirect: "manual",
    });
    expect(res.status).toBeLessThan(400);
    type Refund = { payment_intent: string };
    const refunds = async () =>
      ((await (await fetch(`${cluster.payments.url}/_fake/refunds`)).json()) as { data: Refund[] }).data.filter(
        (r) => r.payment_intent === booking!.payment_intent_id,
      ).length;
    await expect.poll(refunds, { timeout: 40_000, interval: 500 }).toBe(1);
    await new Promise((r) => setTimeout(r, 3_000));
    expect(await refunds()).toBe(1);
    const requests = (
      (await (await fetch(`${cluster.payments.url}/_fake/requests`)).json()) as {
        data: { method: string; path: string; idempotencyKey: string | null }[];
      }
    ).data;
    expect(
      requests.filter(
        (r) => r.method === "POST" && r.path === "/v1/refunds" && r.idempotencyKey === `refund:${bookingId}`,
      ),
    ).toHaveLength(1);
  });
});
