import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import fc from "fast-check";
import { Resend } from "resend";
import { afterAll, afterEach, beforeAll, beforeEach, expect, test, vi } from "vitest";
import { startEmailFake, type EmailFake } from "../../../fakes/email/server";

// Tests run against the real resend SDK (6.38.0) so the fake is held to what the app will actually send.
let fake: EmailFake;
let resend: Resend;

const FROM = "Emberwright <quotes@emberwright.test>";
const LEAD = "dana.okafor@example.com";

function validEmail(overrides: Record<string, unknown> = {}) {
  return {
    from: FROM,
    to: LEAD,
    subject: "Your fire pit estimate",
    html: "<p>Thanks for asking about a 44 in round pit.</p>",
    text: "Thanks for asking about a 44 in round pit.",
    ...overrides,
  };
}

// The fake's JSON, read field by field in the assertions below.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
async function listMessages(query = ""): Promise<Array<Record<string, any>>> {
  const response = await fetch(`${fake.url}/_fake/messages${query}`);
  expect(response.status).toBe(200);
  return response.json();
}

async function control(path: string, body?: unknown): Promise<Response> {
  return fetch(`${fake.url}/_fake/${path}`, {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
}

beforeAll(async () => {
  fake = await startEmailFake({ port: 0 });
  resend = new Resend("re_test_key", { baseUrl: fake.url });
});

afterAll(async () => {
  await fake.close();
});

beforeEach(async () => {
  await fetch(`${fake.url}/_fake/messages`, { method: "DELETE" });
  await control("recover");
});

afterEach(() => {
  vi.unstubAllEnvs();
});

test("port 0 picks a free port and the url carries it", () => {
  expect(fake.port).toBeGreaterThan(0);
  expect(fake.url).toBe(`http://127.0.0.1:${fake.port}`);
});

test("a valid message sent with the SDK comes back as { id } and is listed", async () => {
  const { data, error } = await resend.emails.send(
    validEmail({
      to: [LEAD, "Sam Reyes <sam.reyes@example.com>"],
      replyTo: "estimating@emberwright.test",
      headers: { "X-Entity-Ref-ID": "lead-42" },
      tags: [{ name: "kind", value: "lead_received" }],
    }),
  );
  expect(error).toBeNull();
  expect(data?.id).toMatch(/^[0-9a-f-]{36}$/);

  const messages = await listMessages();
  expect(messages).toHaveLength(1);
  expect(messages[0]).toMatchObject({
    id: data!.id,
    from: FROM,
    to: [LEAD, "Sam Reyes <sam.reyes@example.com>"],
    reply_to: ["estimating@emberwright.test"],
    subject: "Your fire pit estimate",
    text: "Thanks for asking about a 44 in round pit.",
    headers: { "X-Entity-Ref-ID": "lead-42" },
    tags: [{ name: "kind", value: "lead_received" }],
    idempotency_key: null,
  });
  expect(Number.isNaN(Date.parse(messages[0].created_at))).toBe(false);
});

test("RESEND_BASE_URL in the environment reaches the fake without a baseUrl option", async () => {
  vi.stubEnv("RESEND_BASE_URL", fake.url);
  const fromEnv = new Resend("re_test_key");
  const { data, error } = await fromEnv.emails.send(validEmail());
  expect(error).toBeNull();
  expect((await listMessages())[0].id).toBe(data!.id);
});

test("the list is newest first and ?to= filters by bare address, ignoring case and display names", async () => {
  await resend.emails.send(validEmail({ subject: "first", to: "Pat Lin <pat@example.com>" }));
  await resend.emails.send(validEmail({ subject: "second" }));
  await resend.emails.send(validEmail({ subject: "third", to: "PAT@example.com" }));

  expect((await listMessages()).map((message) => message.subject)).toEqual(["third", "second", "first"]);
  expect((await listMessages("?to=pat%40example.com")).map((message) => message.subject)).toEqual(["third", "first"]);
});

test("resend.emails.get reads a caught message back in the service's shape", async () => {
  const { data } = await resend.emails.send(validEmail());
  const { data: email, error } = await resend.emails.get(data!.id);
  expect(error).toBeNull();
  expect(email).toMatchObject({ object: "email", id: data!.id, to: [LEAD], subject: "Your fire pit estimate" });
});

test("a missing subject is a 422 naming `subject`, returned as { error } without throwing, and nothing is stored", async () => {
  const { data, error } = await resend.emails.send(validEmail({ subject: undefined }));
  expect(data).toBeNull();
  expect(error).toMatchObject({ statusCode: 422, name: "missing_required_field" });
  expect(error!.message).toContain("`subject`");
  expect(await listMessages()).toHaveLength(0);
});

test("each required or malformed field is answered 422 with a message naming it", async () => {
  const cases: Array<[Record<string, unknown>, string, string]> = [
    [{ from: undefined }, "missing_required_field", "`from`"],
    [{ from: "quotes at emberwright" }, "validation_error", "`from`"],
    [{ to: undefined }, "missing_required_field", "`to`"],
    [{ to: [] }, "missing_required_field", "`to`"],
    [{ to: ["not-an-address"] }, "validation_error", "`to`"],
    [{ to: Array.from({ length: 51 }, (_, i) => `lead${i}@example.com`) }, "validation_error", "`to`"],
    [{ subject: "   " }, "missing_required_field", "`subject`"],
    [{ html: undefined, text: undefined }, "missing_required_field", "`html` or `text`"],
    [{ replyTo: "nobody" }, "validation_error", "`reply_to`"],
    [{ tags: [{ name: "has space", value: "x" }] }, "validation_error", "`tags[0].name`"],
    [{ attachments: [{ filename: "plan.pdf" }] }, "invalid_attachment", "`attachments[0]`"],
  ];
  for (const [overrides, name, field] of cases) {
    const { data, error } = await resend.emails.send(validEmail(overrides));
    expect(data, JSON.stringify(overrides)).toBeNull();
    expect(error, JSON.stringify(overrides)).toMatchObject({ statusCode: 422, name });
    expect(error!.message, JSON.stringify(overrides)).toContain(field);
  }
  expect(await listMessages()).toHaveLength(0);
});

test("50 recipients are accepted", async () => {
  const to = Array.from({ length: 50 }, (_, i) => `lead${i}@example.com`);
  const { error } = await resend.emails.send(validEmail({ to }));
  expect(error).toBeNull();
});

test("the SDK itself refuses to construct without an API key", () => {
  vi.stubEnv("RESEND_API_KEY", "");
  expect(() => new Resend("", { baseUrl: fake.url })).toThrow(/Missing API key/);
});

test("a request without an API key is a 401 missing_api_key and stores nothing", async () => {
  const { data, error } = await resend.emails.send(validEmail(), { headers: { Authorization: "" } });
  expect(data).toBeNull();
  expect(error).toMatchObject({ statusCode: 401, name: "missing_api_key" });

  const raw = await fetch(`${fake.url}/emails`, {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify(validEmail()),
  });
  expect(raw.status).toBe(401);
  expect(await raw.json()).toMatchObject({ statusCode: 401, name: "missing_api_key" });
  expect(await listMessages()).toHaveLength(0);
});

test("with apiKey set, another key is a 403 invalid_api_key", async () => {
  const strict = await startEmailFake({ port: 0, apiKey: "re_the_right_key" });
  try {
    const wrong = await new Resend("re_wrong", { baseUrl: strict.url }).emails.send(validEmail());
    expect(wrong.error).toMatchObject({ statusCode: 403, name: "invalid_api_key" });
    const right = await new Resend("re_the_right_key", { baseUrl: strict.url }).emails.send(validEmail());
    expect(right.error).toBeNull();
  } finally {
    await strict.close();
  }
});

test("the same idempotency key and body twice gives the same id and stores one message", async () => {
  const key = "lead-received/lead_8f2c";
  const first = await resend.emails.send(validEmail(), { idempotencyKey: key });
  const second = await resend.emails.send(validEmail(), { idempotencyKey: key });
  expect(first.error).toBeNull();
  expect(second.error).toBeNull();
  expect(second.data!.id).toBe(first.data!.id);

  const messages = await listMessages();
  expect(messages).toHaveLength(1);
  expect(messages[0].idempotency_key).toBe(key);
});

test("the same idempotency key with a different body is a 409 invalid_idempotent_request", async () => {
  const key = "booking-confirmed/bk_17";
  await resend.emails.send(validEmail(), { idempotencyKey: key });
  const { data, error } = await resend.emails.send(validEmail({ subject: "Changed" }), { idempotencyKey: key });
  expect(data).toBeNull();
  expect(error).toMatchObject({ statusCode: 409, name: "invalid_idempotent_request" });
  expect(await listMessages()).toHaveLength(1);
});

test("an idempotency key over 256 characters is a 400 invalid_idempotency_key", async () => {
  const { error } = await resend.emails.send(validEmail(), { idempotencyKey: "k".repeat(257) });
  expect(error).toMatchObject({ statusCode: 400, name: "invalid_idempotency_key" });
  expect(await listMessages()).toHaveLength(0);
});

test("a failed validation does not burn the idempotency key", async () => {
  const key = "invite/inv_3";
  const bad = await resend.emails.send(validEmail({ subject: "" }), { idempotencyKey: key });
  expect(bad.error?.statusCode).toBe(422);
  const good = await resend.emails.send(validEmail(), { idempotencyKey: key });
  expect(good.error).toBeNull();
});

test("fail mode: the next send returns a 503 error without throwing, then sending works again", async () => {
  expect((await control("fail", { count: 1 })).status).toBe(200);

  const failed = await resend.emails.send(validEmail(), { idempotencyKey: "lead-received/lead_9" });
  expect(failed.data).toBeNull();
  expect(failed.error).toMatchObject({ statusCode: 503, name: "application_error" });
  expect(await listMessages()).toHaveLength(0);

  // The outbox retries with the same key: the failed attempt must not have claimed it.
  const retried = await resend.emails.send(validEmail(), { idempotencyKey: "lead-received/lead_9" });
  expect(retried.error).toBeNull();
  expect(await listMessages()).toHaveLength(1);
});

test("fail mode by time keeps failing until recover, with the status asked for", async () => {
  await control("fail", { forMs: 60_000, status: 500 });
  for (let attempt = 0; attempt < 3; attempt += 1) {
    const { error } = await resend.emails.send(validEmail());
    expect(error).toMatchObject({ statusCode: 500, name: "application_error" });
  }
  const batch = await resend.batch.send([validEmail()]);
  expect(batch.error).toMatchObject({ statusCode: 500 });

  expect(await (await control("recover")).json()).toEqual({ failing: false });
  const { error } = await resend.emails.send(validEmail());
  expect(error).toBeNull();
});

test("timed fail mode ends by itself when its window has passed", async () => {
  let nowMs = Date.parse("2026-05-01T12:00:00Z");
  const clocked = await startEmailFake({ port: 0, now: () => nowMs });
  try {
    const client = new Resend("re_test_key", { baseUrl: clocked.url });
    await fetch(`${clocked.url}/_fake/fail`, { method: "POST", body: JSON.stringify({ forMs: 5_000 }) });
    expect((await client.emails.send(validEmail())).error?.statusCode).toBe(503);
    nowMs += 5_000;
    expect((await client.emails.send(validEmail())).error).toBeNull();
  } finally {
    await clocked.close();
  }
});

test("a 429 fail mode answers rate_limit_exceeded with Retry-After", async () => {
  await control("fail", { count: 1, status: 429 });
  const response = await fetch(`${fake.url}/emails`, {
    method: "POST",
    headers: { Authorization: "Bearer re_test_key", "Content-Type": "application/json" },
    body: JSON.stringify(validEmail()),
  });
  expect(response.status).toBe(429);
  expect(response.headers.get("retry-after")).toBe("1");
  expect(await response.json()).toMatchObject({ name: "rate_limit_exceeded" });
});

test("bad fail-mode requests are 400s that name the field", async () => {
  for (const body of [{}, { count: 0 }, { count: 2, forMs: 10 }, { count: 1, status: 404 }, { forMs: -5 }]) {
    const response = await control("fail", body);
    expect(response.status, JSON.stringify(body)).toBe(400);
    expect((await response.json()).name).toBe("validation_error");
  }
  expect(await (await fetch(`${fake.url}/_fake/fail`)).json()).toEqual({ failing: false });
});

test("with the fake unreachable the SDK returns an error with a null statusCode", async () => {
  const gone = await startEmailFake({ port: 0 });
  await gone.close();
  const { data, error } = await new Resend("re_test_key", { baseUrl: gone.url }).emails.send(validEmail());
  expect(data).toBeNull();
  expect(error).toMatchObject({ statusCode: null, name: "application_error" });
});

test("an .ics attachment round-trips byte for byte", async () => {
  const ics = [
    "BEGIN:VCALENDAR",
    "VERSION:2.0",
    "PRODID:-//Emberwright//Consult//EN",
    "BEGIN:VEVENT",
    "UID:consult-bk_17@emberwright.test",
    "DTSTART:20260514T150000Z",
    "DTEND:20260514T153000Z",
    "SUMMARY:Fire pit design consult — Okafor backyard",
    "END:VEVENT",
    "END:VCALENDAR",
    "",
  ].join("\r\n");
  const photo = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0xff]);

  const { data, error } = await resend.emails.send(
    validEmail({
      attachments: [
        { filename: "consult.ics", content: Buffer.from(ics, "utf8").toString("base64") },
        { filename: "site.png", content: photo, contentType: "image/png" },
      ],
    }),
  );
  expect(error).toBeNull();

  const [listed] = await listMessages();
  expect(listed.attachments[0]).toEqual({
    filename: "consult.ics",
    contentType: "text/calendar",
    size: Buffer.byteLength(ics),
    contentId: null,
    path: null,
  });

  const detail = await (await fetch(`${fake.url}/_fake/messages/${data!.id}`)).json();
  expect(Buffer.from(detail.attachments[0].content, "base64").toString("utf8")).toBe(ics);
  expect(Buffer.from(detail.attachments[1].content, "base64").equals(photo)).toBe(true);

  const download = await fetch(`${fake.url}/m/${data!.id}/attachments/0`);
  expect(download.status).toBe(200);
  expect(download.headers.get("content-type")).toBe("text/calendar");
  expect(download.headers.get("content-disposition")).toContain('filename="consult.ics"');
  expect(download.headers.get("x-content-type-options")).toBe("nosniff");
  expect(await download.text()).toBe(ics);

  expect(fake.store.get(data!.id)?.attachments[1].size).toBe(photo.length);
});

test("attachment content that is not base64 is a 422 invalid_attachment", async () => {
  const { error } = await resend.emails.send(
    validEmail({ attachments: [{ filename: "a.ics", content: "not base64!" }] }),
  );
  expect(error).toMatchObject({ statusCode: 422, name: "invalid_attachment" });
  expect(error!.message).toContain("attachments[0].content");
});

test("batch send stores every message and answers { data: [{ id }] }", async () => {
  const { data, error } = await resend.batch.send([validEmail({ subject: "one" }), validEmail({ subject: "two" })], {
    idempotencyKey: "weekly-digest/2026-19",
  });
  expect(error).toBeNull();
  expect(data!.data).toHaveLength(2);
  const again = await resend.batch.send([validEmail({ subject: "one" }), validEmail({ subject: "two" })], {
    idempotencyKey: "weekly-digest/2026-19",
  });
  expect(again.data!.data).toEqual(data!.data);
  expect((await listMessages()).map((message) => message.subject)).toEqual(["two", "one"]);
});

test("a strict batch with one bad e-mail stores none; a permissive one stores the good ones", async () => {
  const emails = [validEmail({ subject: "good" }), validEmail({ to: "nobody" })];
  const strict = await resend.batch.send(emails);
  expect(strict.error).toMatchObject({ statusCode: 422, name: "validation_error" });
  expect(strict.error!.message).toContain("index 1");
  expect(await listMessages()).toHaveLength(0);

  const permissive = await resend.batch.send(emails, { batchValidation: "permissive" });
  expect(permissive.error).toBeNull();
  expect(permissive.data!.data).toHaveLength(1);
  expect(permissive.data!.errors).toEqual([{ index: 1, message: expect.stringContaining("`to`") }]);
  expect(await listMessages()).toHaveLength(1);
});

test("messages and idempotency keys survive a restart when a data file is given", async () => {
  const dir = mkdtempSync(join(tmpdir(), "email-fake-"));
  const dataFile = join(dir, "nested", "mail.json");
  try {
    const first = await startEmailFake({ port: 0, dataFile });
    const sent = await new Resend("re_test_key", { baseUrl: first.url }).emails.send(
      validEmail({
        attachments: [{ filename: "quote.txt", content: Buffer.from("44 in bowl, 3 courses").toString("base64") }],
      }),
      { idempotencyKey: "quote-sent/q_5" },
    );
    await first.close();

    const second = await startEmailFake({ port: 0, dataFile });
    try {
      const messages = await (await fetch(`${second.url}/_fake/messages`)).json();
      expect(messages.map((message: { id: string }) => message.id)).toEqual([sent.data!.id]);
      const download = await fetch(`${second.url}/m/${sent.data!.id}/attachments/0`);
      expect(await download.text()).toBe("44 in bowl, 3 courses");

      const retried = await new Resend("re_test_key", { baseUrl: second.url }).emails.send(
        validEmail({
          attachments: [{ filename: "quote.txt", content: Buffer.from("44 in bowl, 3 courses").toString("base64") }],
        }),
        { idempotencyKey: "quote-sent/q_5" },
      );
      expect(retried.data!.id).toBe(sent.data!.id);
      expect(second.store.size).toBe(1);
    } finally {
      await second.close();
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

test("DELETE /_fake/messages clears the store and reports how many went", async () => {
  await resend.emails.send(validEmail());
  await resend.emails.send(validEmail());
  const response = await fetch(`${fake.url}/_fake/messages`, { method: "DELETE" });
  expect(await response.json()).toEqual({ deleted: 2 });
  expect(await listMessages()).toHaveLength(0);
});

test("the web inbox escapes what it prints and shows the HTML part in a script-less sandbox", async () => {
  const { data } = await resend.emails.send(
    validEmail({
      subject: 'Quote <script>alert("x")</script>',
      html: '<p onclick="steal()">Bowl 36 in</p><script>alert(1)</script>',
      text: "Plain <b>text</b> part",
      attachments: [{ filename: '"><img src=x>.ics', content: Buffer.from("BEGIN:VCALENDAR").toString("base64") }],
    }),
  );

  const inbox = await fetch(`${fake.url}/`);
  expect(inbox.headers.get("content-type")).toContain("text/html");
  expect(inbox.headers.get("content-security-policy")).toContain("default-src 'none'");
  const inboxHtml = await inbox.text();
  expect(inboxHtml).toContain("<title>Emberwright mail catcher (local)</title>");
  expect(inboxHtml).toContain("Quote &lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;");
  expect(inboxHtml).not.toContain("<script");
  expect(inboxHtml).toContain(LEAD);

  const page = await (await fetch(`${fake.url}/m/${data!.id}`)).text();
  expect(page).not.toContain("<script");
  expect(page).not.toContain("<img");
  expect(page).toMatch(
    /<iframe[^>]* sandbox=""[^>]* srcdoc="&lt;p onclick=&quot;steal\(\)&quot;&gt;Bowl 36 in&lt;\/p&gt;&lt;script&gt;/,
  );
  expect(page).toContain("Plain &lt;b&gt;text&lt;/b&gt; part");
  expect(page).toContain(`href="/m/${data!.id}/attachments/0"`);

  expect((await fetch(`${fake.url}/m/no-such-id`)).status).toBe(404);
});

test("unknown API paths and methods answer in the service's error shape", async () => {
  const notFound = await fetch(`${fake.url}/domains`, { headers: { Authorization: "Bearer re_test_key" } });
  expect(notFound.status).toBe(404);
  expect(await notFound.json()).toMatchObject({ statusCode: 404, name: "not_found" });

  const wrongMethod = await fetch(`${fake.url}/emails`, { headers: { Authorization: "Bearer re_test_key" } });
  expect(wrongMethod.status).toBe(405);
  expect(await wrongMethod.json()).toMatchObject({ statusCode: 405, name: "method_not_allowed" });
});

test("hostile and random bodies get a 4xx, never a 5xx, and the fake stays up", async () => {
  const hostile = ["", "{", "null", "[]", '"x"', "1e999", '{"__proto__":{"polluted":1}}', "\u0000\uffff"];
  const randomBodies = fc.oneof(
    fc.json(),
    fc.string(),
    fc
      .record(
        {
          from: fc.jsonValue(),
          to: fc.jsonValue(),
          subject: fc.jsonValue(),
          html: fc.jsonValue(),
          attachments: fc.jsonValue(),
        },
        { requiredKeys: [] },
      )
      .map((value) => JSON.stringify(value)),
  );
  const post = (path: string, body: string) =>
    fetch(`${fake.url}${path}`, {
      method: "POST",
      headers: { Authorization: "Bearer re_test_key", "Content-Type": "application/json" },
      body,
    });

  for (const body of hostile) {
    for (const path of ["/emails", "/emails/batch"]) {
      const status = (await post(path, body)).status;
      expect(status, `${path} ${JSON.stringify(body)}`).toBeGreaterThanOrEqual(400);
      expect(status, `${path} ${JSON.stringify(body)}`).toBeLessThan(500);
    }
  }
  await fc.assert(
    fc.asyncProperty(randomBodies, fc.constantFrom("/emails", "/emails/batch"), async (body, path) => {
      const status = (await post(path, body)).status;
      return status < 500;
    }),
    { numRuns: 150 },
  );
  expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  expect((await resend.emails.send(validEmail())).error).toBeNull();
});
