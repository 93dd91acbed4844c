// What both fakes do at the HTTP edge (body limits, unreadable JSON, replays, refused methods and
// paths), pinned so the handlers can be reorganised without the answers changing.
import { mkdtempSync, rmSync } from "node:fs";
import { request } from "node:http";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { startEmailFake, type EmailFake } from "../../../fakes/email/server";
import { startPaymentsFake, type PaymentsFake } from "../../../fakes/payments/server";

const EMAIL_KEY = "Bearer re_test_key";
const PAYMENTS_KEY = "Bearer sk_test_emberwright_unit";

/** One raw request (fetch cannot show a connection being closed); the answer with its headers. */
function send(url: string, init: { method: string; headers?: Record<string, string>; body?: string | Buffer }) {
  return new Promise<{ status: number; headers: Record<string, string | string[] | undefined>; text: string }>(
    (resolve, reject) => {
      const req = request(url, { method: init.method, headers: init.headers }, (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () =>
          resolve({ status: res.statusCode!, headers: res.headers, text: Buffer.concat(chunks).toString("utf8") }),
        );
      });
      // The server may answer and close before the whole body is written.
      req.on("error", (error: NodeJS.ErrnoException) =>
        error.code === "EPIPE" || error.code === "ECONNRESET" ? undefined : reject(error),
      );
      req.end(init.body);
    },
  );
}

describe("e-mail fake", () => {
  let fake: EmailFake;
  beforeAll(async () => {
    fake = await startEmailFake({ port: 0 });
  });
  afterAll(() => fake.close());

  test("a body over 40 MB is a 413 validation_error and the connection is closed", async () => {
    const body = Buffer.alloc(40 * 1024 * 1024 + 10, 0x61);
    const answer = await send(`${fake.url}/emails`, {
      method: "POST",
      headers: { Authorization: EMAIL_KEY, "Content-Type": "application/json" },
      body,
    });
    expect(answer.status).toBe(413);
    expect(answer.headers.connection).toBe("close");
    expect(JSON.parse(answer.text)).toEqual({
      statusCode: 413,
      name: "validation_error",
      message: "The request body is larger than 40 MB; send large files by `path` instead.",
    });
  }, 30_000);

  test("a body that is not JSON is a 400 validation_error, for sends and for the fail control", async () => {
    for (const path of ["/emails", "/emails/batch", "/_fake/fail"]) {
      const answer = await send(`${fake.url}${path}`, {
        method: "POST",
        headers: { Authorization: EMAIL_KEY },
        body: "{not json",
      });
      expect(answer.status, path).toBe(400);
      expect(JSON.parse(answer.text), path).toEqual({
        statusCode: 400,
        name: "validation_error",
        message: "The request body is not valid JSON.",
      });
    }
  });

  test("a replayed send answers the first answer with no replay header; an unknown control is a 404", async () => {
    const headers = { Authorization: EMAIL_KEY, "Content-Type": "application/json", "Idempotency-Key": "same-twice" };
    const body = JSON.stringify({ from: "a@emberwright.test", to: "b@example.com", subject: "Hi", text: "Hello" });
    const first = await send(`${fake.url}/emails`, { method: "POST", headers, body });
    const second = await send(`${fake.url}/emails`, { method: "POST", headers, body });
    expect(second.status).toBe(200);
    expect(second.text).toBe(first.text);
    expect(second.headers["idempotent-replayed"]).toBeUndefined();
    const unknown = await send(`${fake.url}/_fake/nothing-here`, { method: "POST" });
    expect(unknown.status).toBe(404);
    expect(JSON.parse(unknown.text)).toMatchObject({
      name: "not_found",
      message: "Unknown control endpoint; see fakes/email/README.md.",
    });
  });

  test("GET on a send path and POST on a message are 405 method_not_allowed; a garbled path is a 400", async () => {
    expect(
      (await send(`${fake.url}/emails/batch`, { method: "GET", headers: { Authorization: EMAIL_KEY } })).status,
    ).toBe(405);
    expect(
      (await send(`${fake.url}/emails/some-id`, { method: "POST", headers: { Authorization: EMAIL_KEY } })).status,
    ).toBe(405);
    const garbled = await send(`${fake.url}/emails/%E0%A4%A`, { method: "GET", headers: { Authorization: EMAIL_KEY } });
    expect(garbled.status).toBe(400);
    expect(JSON.parse(garbled.text)).toEqual({
      statusCode: 400,
      name: "validation_error",
      message: "The request path is not valid.",
    });
  });
});

describe("payments fake", () => {
  let fake: PaymentsFake;
  let stateDir: string;
  beforeAll(async () => {
    stateDir = mkdtempSync(join(tmpdir(), "payments-fake-http-"));
    fake = await startPaymentsFake({
      port: 0,
      webhookUrl: null,
      stateFile: join(stateDir, "state.json"),
      log: () => {},
    });
  });
  afterAll(async () => {
    await fake.close();
    rmSync(stateDir, { recursive: true, force: true });
  });

  const form = { "Content-Type": "application/x-www-form-urlencoded" };

  test("an API body over 1 MB is a 413 in the error shape, with the connection closed; a control body gets { error }", async () => {
    const body = Buffer.alloc(1024 * 1024 + 10, 0x61);
    const api = await send(`${fake.url}/v1/refunds`, {
      method: "POST",
      headers: { Authorization: PAYMENTS_KEY, ...form },
      body,
    });
    expect(api.status).toBe(413);
    expect(api.headers.connection).toBe("close");
    expect(api.headers["request-id"]).toMatch(/^req_/);
    expect(JSON.parse(api.text)).toMatchObject({
      error: { type: "invalid_request_error", message: "Request body is larger than 1 MB." },
    });
    const control = await send(`${fake.url}/_fake/reset`, { method: "POST", body });
    expect(control.status).toBe(413);
    expect(JSON.parse(control.text)).toEqual({ error: "Request body is larger than 1 MB." });
  });

  test("control bodies must be JSON objects", async () => {
    const notJson = await send(`${fake.url}/_fake/fail-next`, { method: "POST", body: "{nope" });
    expect(notJson.status).toBe(400);
    expect(JSON.parse(notJson.text)).toEqual({ error: "The body must be JSON." });
    const array = await send(`${fake.url}/_fake/fail-next`, { method: "POST", body: "[1]" });
    expect(array.status).toBe(400);
    expect(JSON.parse(array.text)).toEqual({ error: "The body must be a JSON object." });
    const unknown = await send(`${fake.url}/_fake/nothing`, { method: "GET" });
    expect(unknown.status).toBe(404);
    expect(JSON.parse(unknown.text)).toEqual({ error: "No control at GET /nothing." });
    expect((await send(`${fake.url}/_fake/reset`, { method: "PUT" })).status).toBe(405);
  });

  test("a replay answers the stored body with Idempotent-Replayed and is logged as replayed", async () => {
    await send(`${fake.url}/_fake/reset`, { method: "POST" });
    const headers = { Authorization: PAYMENTS_KEY, ...form, "Idempotency-Key": "create-twice" };
    const body = [
      "mode=payment",
      "success_url=http%3A%2F%2Flocalhost%2Fok",
      "line_items[0][price_data][currency]=usd",
      "line_items[0][price_data][unit_amount]=100",
      "line_items[0][price_data][product_data][name]=Consult",
      "line_items[0][quantity]=1",
    ].join("&");
    const created = await send(`${fake.url}/v1/checkout/sessions`, { method: "POST", headers, body });
    expect(created.status).toBe(200);
    expect(created.headers["idempotency-key"]).toBe("create-twice");
    const replay = await send(`${fake.url}/v1/checkout/sessions`, { method: "POST", headers, body });
    expect(replay.status).toBe(200);
    expect(replay.headers["idempotent-replayed"]).toBe("true");
    expect(replay.text).toBe(created.text);
    expect(replay.headers["request-id"]).not.toBe(created.headers["request-id"]);
    const log = JSON.parse((await send(`${fake.url}/_fake/requests`, { method: "GET" })).text);
    expect(log.data.map((r: { status: number; replayed: boolean }) => [r.status, r.replayed])).toEqual([
      [200, false],
      [200, true],
    ]);
  });

  test("wrong content type, unknown URL, wrong method and a garbled id are refused in the error shape", async () => {
    const typed = await send(`${fake.url}/v1/refunds`, {
      method: "POST",
      headers: { Authorization: PAYMENTS_KEY, "Content-Type": "application/json" },
      body: "{}",
    });
    expect(typed.status).toBe(400);
    expect(JSON.parse(typed.text).error.message).toBe(
      "Send parameters form-encoded (Content-Type: application/x-www-form-urlencoded).",
    );
    const unknown = await send(`${fake.url}/v1/customers`, { method: "GET", headers: { Authorization: PAYMENTS_KEY } });
    expect(unknown.status).toBe(404);
    expect(JSON.parse(unknown.text).error.message).toBe("Unrecognized request URL (GET: /v1/customers).");
    const wrongMethod = await send(`${fake.url}/v1/refunds`, {
      method: "GET",
      headers: { Authorization: PAYMENTS_KEY },
    });
    expect(wrongMethod.status).toBe(404);
    const garbled = await send(`${fake.url}/v1/refunds/%E0%A4%A`, {
      method: "GET",
      headers: { Authorization: PAYMENTS_KEY },
    });
    expect(garbled.status).toBe(400);
    expect(JSON.parse(garbled.text).error).toMatchObject({ message: "Malformed id in the URL.", param: "id" });
    const page = await send(`${fake.url}/pay/cs_nothing`, { method: "GET" });
    expect(page.status).toBe(404);
    expect((await send(`${fake.url}/nowhere`, { method: "GET" })).status).toBe(404);
  });
});
