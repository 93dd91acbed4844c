import { count, eq } from "drizzle-orm";
import { Resend } from "resend";
import { afterAll, beforeAll, expect, test } from "vitest";
import { emailOutbox, leadEvents, leadPhotos, leads, oneTimeTokens, users } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { deliverDueEmails } from "~/lib/jobs/outbox-worker.server";
import { action } from "~/routes/configurator";
import { action as uploadAction } from "~/routes/request-upload";
import { startEmailFake, type EmailFake } from "../../fakes/email/server";
import { demoCompany, routeArgs } from "./support/demo";
import { TINY_JPEG, TINY_PNG } from "./support/images";

let fake: EmailFake;
let mail: Resend;
beforeAll(async () => {
  fake = await startEmailFake({ port: 0 });
  mail = new Resend("re_test_key", { baseUrl: fake.url });
});
afterAll(() => fake.close());

let ip = 0;
function requestForm(fields: Record<string, string>, photos: File[] = []) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  for (const p of photos) form.append("photos", p);
  // A fresh address per request keeps the per-address limit out of these tests.
  ip += 1;
  const request = new Request("http://localhost/c/cinder-slate", {
    method: "POST",
    body: form,
    headers: { "X-Forwarded-For": `10.9.0.${ip}` },
  });
  return request;
}

async function send(fields: Record<string, string>, photos: File[] = []) {
  const raw = requestForm(fields, photos);
  // FormData bodies carry no Content-Length until serialised; add it as a browser does.
  const body = await raw.arrayBuffer();
  const request = new Request(raw.url, {
    method: "POST",
    body,
    headers: { ...Object.fromEntries(raw.headers), "Content-Length": String(body.byteLength) },
  });
  return (await action(routeArgs(request, { companySlug: "cinder-slate" }))) as
    Response | { data: { errors: Record<string, string> }; init: ResponseInit };
}

const GOOD = {
  customerName: "Rosalind Ferreira",
  email: "rosalind@example.test",
  phone: "(970) 555-0147",
  street: "14 Larkspur Lane",
  town: "Millbrook Falls",
  buildWindow: "this-season",
  notes: "Back corner of the yard, near the maple.",
  consent: "on",
  design: "units=14&courses=4&liner=firebrick",
};

const tableCount = async (table: typeof leads | typeof leadPhotos | typeof emailOutbox) =>
  (await db.select({ n: count() }).from(table))[0]!.n;

test("a request with two photos saves the lead, its photos, an event, the homeowner account and two e-mails at once", async () => {
  await demoCompany();
  const response = await send({ ...GOOD, email: "two.photos@example.test" }, [
    new File([TINY_PNG], "yard.png", { type: "image/png" }),
    new File([TINY_JPEG], "../side.jpg", { type: "image/jpeg" }),
  ]);
  expect(response).toBeInstanceOf(Response);
  const location = (response as Response).headers.get("Location")!;
  expect(location).toMatch(/^\/c\/cinder-slate\/sent\/[\w-]{22}$/);
  const ref = location.split("/").pop()!;
  const [lead] = await db.select().from(leads).where(eq(leads.ref, ref));
  expect(lead).toMatchObject({ customerName: "Rosalind Ferreira", status: "request", town: "Millbrook Falls" });
  expect(JSON.parse(lead!.planJson).ring.unitCount).toBe(14);
  expect(JSON.parse(lead!.designJson).summary.length).toBeGreaterThan(3);
  const photos = await db.select().from(leadPhotos).where(eq(leadPhotos.leadId, lead!.id));
  expect(photos.map((p) => p.originalName).sort()).toEqual(["side.jpg", "yard.png"]);
  expect((await db.select().from(leadEvents).where(eq(leadEvents.leadId, lead!.id))).map((e) => e.kind)).toEqual([
    "received",
  ]);
  const outbox = await db.select().from(emailOutbox).where(eq(emailOutbox.companyId, lead!.companyId));
  expect(outbox.map((o) => o.idempotencyKey)).toEqual(
    expect.arrayContaining([`lead-received/${lead!.id}`, `lead-new/${lead!.id}`]),
  );
  const [homeowner] = await db.select().from(users).where(eq(users.email, "two.photos@example.test"));
  expect(homeowner?.role).toBe("homeowner");
  expect(await db.select().from(oneTimeTokens).where(eq(oneTimeTokens.userId, homeowner!.id))).toHaveLength(1);
});

test("missing and bad fields are named, and nothing is saved", async () => {
  await demoCompany();
  const before = await Promise.all([tableCount(leads), tableCount(leadPhotos), tableCount(emailOutbox)]);
  const result = await send({ ...GOOD, email: "not-an-email", consent: "", phone: "call me" }, [
    new File(["hello"], "yard.jpg", { type: "image/jpeg" }),
  ]);
  expect(result).not.toBeInstanceOf(Response);
  const { data, init } = result as { data: { errors: Record<string, string> }; init: ResponseInit };
  expect(init.status).toBe(400);
  expect(Object.keys(data.errors).sort()).toEqual(["consent", "email", "phone", "photos"]);
  expect(await Promise.all([tableCount(leads), tableCount(leadPhotos), tableCount(emailOutbox)])).toEqual(before);
});

test("a filled honeypot is refused and nothing is saved", async () => {
  await demoCompany();
  const before = await tableCount(leads);
  const result = (await send({ ...GOOD, website: "http://spam.test" })) as { init: ResponseInit };
  expect(result.init.status).toBe(400);
  expect(await tableCount(leads)).toBe(before);
});

test("with the e-mail service failing the request still stands, and the e-mails go out once when it recovers", async () => {
  await demoCompany();
  const response = (await send({ ...GOOD, email: "while.down@example.test" })) as Response;
  const ref = response.headers.get("Location")!.split("/").pop()!;
  const [lead] = await db.select().from(leads).where(eq(leads.ref, ref));
  expect(lead).toBeDefined();

  await fetch(`${fake.url}/_fake/fail`, {
    method: "POST",
    body: JSON.stringify({ forMs: 60_000, status: 503 }),
    headers: { "Content-Type": "application/json" },
  });
  expect(await deliverDueEmails(new Date(), mail)).toBe(0);
  const [pending] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `lead-received/${lead!.id}`));
  expect(pending).toMatchObject({ status: "pending", attempts: 1 });
  expect(pending!.lastError).toMatch(/^503/);

  await fetch(`${fake.url}/_fake/recover`, { method: "POST" });
  // Retries wait with backoff; deliver as if that time had passed, twice, to prove "once".
  const later = new Date(Date.now() + 60 * 60_000);
  await deliverDueEmails(later, mail);
  await deliverDueEmails(later, mail);
  const messages = (await (await fetch(`${fake.url}/_fake/messages`)).json()) as {
    to: string[];
    subject: string;
    text: string;
  }[];
  const toHomeowner = messages.filter((m) => m.to.includes("while.down@example.test"));
  expect(toHomeowner).toHaveLength(1);
  expect(toHomeowner[0]!.subject).toBe("Cinder & Slate Outdoor Works received your fire-pit request");
  expect(toHomeowner[0]!.text).toContain("/welcome#");
  expect(
    messages.filter(
      (m) =>
        m.subject === "New fire-pit request: Rosalind Ferreira, Millbrook Falls" &&
        m.to.includes("office@cinder-slate.test"),
    ).length,
  ).toBeGreaterThanOrEqual(1);
});

test("one address sending more than the limit of requests in 10 minutes gets 429 with Retry-After", async () => {
  await demoCompany();
  const { action: act } = await import("~/routes/configurator");
  const statuses: number[] = [];
  let retryAfter: string | null = null;
  for (let i = 0; i < 11; i++) {
    const form = new FormData();
    form.set("customerName", "x");
    const raw = new Request("http://localhost/c/cinder-slate", { method: "POST", body: form });
    const body = await raw.arrayBuffer();
    const request = new Request(raw.url, {
      method: "POST",
      body,
      headers: {
        ...Object.fromEntries(raw.headers),
        "Content-Length": String(body.byteLength),
        "X-Forwarded-For": "203.0.113.9",
      },
    });
    const result = (await act(routeArgs(request, { companySlug: "cinder-slate" }))) as { init: ResponseInit };
    statuses.push(result.init.status!);
    retryAfter = new Headers(result.init.headers).get("Retry-After");
  }
  // Ten refused for bad fields (400), the eleventh for the limit (default 10 per address).
  expect(statuses.slice(0, 10)).toEqual(Array(10).fill(400));
  expect(statuses[10]).toBe(429);
  expect(Number(retryAfter)).toBeGreaterThan(0);
});

async function sendThroughUploadEndpoint(fields: Record<string, string>, photos: File[] = []) {
  const raw = requestForm(fields, photos);
  const body = await raw.arrayBuffer();
  const request = new Request("http://localhost/c/cinder-slate/request", {
    method: "POST",
    body,
    headers: { ...Object.fromEntries(raw.headers), "Content-Length": String(body.byteLength) },
  });
  return (await uploadAction(routeArgs(request, { companySlug: "cinder-slate" }))) as Response;
}

test("the upload endpoint answers in JSON: where to go once the request is saved, and each refused field by name with nothing saved", async () => {
  await demoCompany();
  const sent = await sendThroughUploadEndpoint({ ...GOOD, email: "upload.endpoint@example.test" }, [
    new File([TINY_JPEG], "yard.jpg", { type: "image/jpeg" }),
  ]);
  expect(sent.status).toBe(200);
  const { location } = (await sent.json()) as { location: string };
  expect(location).toMatch(/^\/c\/cinder-slate\/sent\/[\w-]{22}$/);
  const [lead] = await db
    .select()
    .from(leads)
    .where(eq(leads.ref, location.split("/").pop()!));
  // The phone as typed, "(970) 555-0147", kept in E.164 (ITU-T E.164).
  expect(lead?.phone).toBe("+19705550147");
  expect(await db.select().from(leadPhotos).where(eq(leadPhotos.leadId, lead!.id))).toHaveLength(1);

  const before = await Promise.all([tableCount(leads), tableCount(leadPhotos)]);
  const refused = await sendThroughUploadEndpoint({ ...GOOD, phone: "call me" });
  expect(refused.status).toBe(400);
  const answer = (await refused.json()) as { errors: Record<string, string>; values: Record<string, string> };
  expect(answer.errors.phone).toMatch(/phone number with its area code/);
  expect(answer.values.customerName).toBe(GOOD.customerName);
  expect(await Promise.all([tableCount(leads), tableCount(leadPhotos)])).toEqual(before);
});
