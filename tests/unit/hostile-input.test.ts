/*
 * Hostile text and ids posted to forms. Header injection: a CR or LF in a value that ends up in an
 * e-mail header starts a new header (RFC 5322 §2.2: header fields end at CRLF), so every homeowner
 * field loses control characters at the form's schema. Trojan-Source style reordering: bidi
 * overrides (Unicode Standard Annex #9, U+202A–U+202E, U+2066–U+2069) make a stored name read
 * differently from what it is. Ids: a form's hidden id is whatever the client sends.
 */
import { eq } from "drizzle-orm";
import { expect, test } from "vitest";
import { companies, consultBlockedDays, emailOutbox, leads } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { leadFormSchema } from "~/lib/leads/lead-schema";
import { action as consultHoursAction } from "~/routes/app-consult-hours";
import { action as scheduleAction } from "~/routes/app-schedule";
import { action as myAction } from "~/routes/my";
import { action as configuratorAction } from "~/routes/configurator";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

const GOOD = {
  customerName: "Rosalind Ferreira",
  email: "rosalind.hostile@example.test",
  phone: "(970) 555-0147",
  street: "14 Larkspur Lane",
  town: "Millbrook Falls",
  buildWindow: "this-season",
  notes: "Back corner of the yard.",
  consent: "on",
  design: "units=14&courses=4&liner=firebrick",
};

let address = 0;
async function postLead(fields: Record<string, string>) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  const raw = new Request("http://localhost/c/cinder-slate", { method: "POST", body: form });
  const body = await raw.arrayBuffer();
  address += 1;
  const request = new Request(raw.url, {
    method: "POST",
    body,
    headers: {
      ...Object.fromEntries(raw.headers),
      "Content-Length": String(body.byteLength),
      "X-Forwarded-For": `198.51.100.${address}`,
    },
  });
  return configuratorAction(routeArgs(request, { companySlug: "cinder-slate" }));
}

const post = (url: string, cookie: string, fields: Record<string, string>) =>
  requestWithCookie(url, cookie, {
    method: "POST",
    body: new URLSearchParams(fields),
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
  });

const statusOf = (result: unknown) =>
  result instanceof Response ? result.status : ((result as { init?: { status?: number } }).init?.status ?? 200);

test("header injection: a name and town with CR LF and a Bcc line are stored as one line, and the office e-mail's subject has no line break", async () => {
  await demoCompany();
  const response = (await postLead({
    ...GOOD,
    customerName: "Eve Mallory\r\nBcc: everyone@attacker.test",
    town: "Millbrook\nFalls\u0000\u0007",
  })) as Response;
  expect(response.status).toBe(302);
  const ref = response.headers.get("Location")!.split("/").pop()!;
  const [lead] = await db.select().from(leads).where(eq(leads.ref, ref));
  expect(lead!.customerName).toBe("Eve Mallory Bcc: everyone@attacker.test");
  expect(lead!.town).toBe("Millbrook Falls");
  const mails = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `lead-new/${lead!.id}`));
  expect(mails[0]!.subject).toBe("New fire-pit request: Eve Mallory Bcc: everyone@attacker.test, Millbrook Falls");
  expect(mails[0]!.subject).not.toMatch(/[\r\n]/);
});

test("bidi overrides, zero-width spaces and C1 controls are stripped from every homeowner field; notes keep their line breaks", () => {
  const parsed = leadFormSchema.parse({
    ...GOOD,
    // U+202E RIGHT-TO-LEFT OVERRIDE would show "gpj.exe" reversed; U+0085 is NEXT LINE (a C1 control).
    customerName: "Ada\u202E Lovelace\u202C",
    street: "1\u200B2 Main\u0085Street",
    town: "\u2066Springfield\u2069",
    notes: "First line\r\nSecond line\u202E\u0000",
    phone: "970\u0000 555 0147",
  });
  expect(parsed.customerName).toBe("Ada Lovelace");
  expect(parsed.street).toBe("1 2 Main Street");
  expect(parsed.town).toBe("Springfield");
  expect(parsed.notes).toBe("First line\nSecond line");
  expect(parsed.phone).toBe("+19705550147");
});

test("consult hours: intent=unblock&id=abc is refused with 400 naming the field, and nothing is deleted", async () => {
  const { company } = await demoCompany();
  const cookie = await loginAs(company.id, "owner");
  await db.insert(consultBlockedDays).values({ companyId: company.id, day: "2031-07-04" });
  for (const id of ["abc", "", "1e3", "-1", "0x10", "1.5", "99999999999999999999"]) {
    const result = await consultHoursAction(routeArgs(post("/app/consult-hours", cookie, { intent: "unblock", id })));
    expect(statusOf(result), `id=${JSON.stringify(id)}`).toBe(400);
    expect((result as { data: { errors: Record<string, string> } }).data.errors.day).toBe(
      "Choose a blocked day to open again.",
    );
  }
  expect(await db.select().from(consultBlockedDays).where(eq(consultBlockedDays.companyId, company.id))).toHaveLength(
    1,
  );
});

test("cancelling a consult with a booking id like 1e3 or 0x10 is refused as a bad id (400), not read as 1000 or 16", async () => {
  const { company } = await demoCompany();
  const owner = await loginAs(company.id, "owner");
  const homeowner = await loginAs(company.id, "homeowner");
  for (const bookingId of ["1e3", "0x10", " 7e0", "abc"]) {
    const staff = await scheduleAction(routeArgs(post("/app/schedule", owner, { bookingId })));
    expect(statusOf(staff), `schedule bookingId=${bookingId}`).toBe(400);
    const mine = await myAction(routeArgs(post("/my", homeowner, { bookingId })));
    expect(statusOf(mine), `my bookingId=${bookingId}`).toBe(400);
  }
  // The company row is untouched by any of it.
  expect((await db.select().from(companies).where(eq(companies.id, company.id)))[0]!.slug).toBe("cinder-slate");
});
