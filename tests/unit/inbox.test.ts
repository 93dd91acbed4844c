/*
 * The inbox against the demo seed plus forty extra requests: every answer is compared with a plain
 * filter-and-sort over all of the company's rows done here in JavaScript (common practice, no
 * source: an oracle written apart from the SQL).
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, expect, test } from "vitest";
import { bookings, LEAD_STATUSES, leads, users, type Lead } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { DEFAULT_INBOX_FILTERS, type InboxFilters, type InboxPage } from "~/lib/leads/inbox-options";
import { parseInboxQuery } from "~/lib/leads/inbox-schema";
import { loadInboxPage } from "~/lib/leads/inbox.server";
import { loader as inboxLoader } from "~/routes/app-inbox";
import { loader as csvLoader } from "~/routes/app-inbox-csv";
import { loader as apiLoader } from "~/routes/api/leads";
import { action as seenAction } from "~/routes/app-inbox-seen";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

let companyId = 0;
let estimatorId = 0;
let ownerId = 0;
let all: Lead[] = [];
const TZ = "America/Chicago";

beforeAll(async () => {
  const { company } = await demoCompany();
  companyId = company.id;
  expect(company.timeZone).toBe(TZ);
  const staff = await db.select().from(users).where(eq(users.companyId, companyId));
  estimatorId = staff.find((u) => u.role === "estimator")!.id;
  ownerId = staff.find((u) => u.role === "owner")!.id;
  const [template] = await db.select().from(leads).where(eq(leads.ref, "demo-cinder-slate-01"));
  const statuses = LEAD_STATUSES;
  const extra = Array.from({ length: 40 }, (_, i) => ({
    companyId,
    ref: `inbox-test-${i}`,
    status: statuses[i % statuses.length]!,
    stopReason: statuses[i % statuses.length] === "not-going-ahead" ? "Too far to travel." : null,
    assignedUserId: i % 3 === 0 ? estimatorId : i % 3 === 1 ? ownerId : null,
    customerName: `${i % 2 ? "zara" : "Abel"} Paging ${String(i).padStart(2, "0")}`,
    email: `paging.${i}@example.test`,
    phone: `(555) 013-${String(1000 + i).padStart(4, "0")}`,
    street: `${i} Test Row`,
    town: i % 4 === 0 ? "Fernwick" : "Harrow Bend",
    buildWindow: "not-sure" as const,
    designJson: template!.designJson,
    planJson: template!.planJson,
    stoneName: template!.stoneName,
    bowlDiameterIn: 30 + i * 0.5,
    priceLowCents: i % 5 === 0 ? null : 100_000 + i * 1000,
    priceHighCents: i % 5 === 0 ? null : 130_000 + i * 1000,
    // Spread over the last 90 days, a few hours apart.
    createdAt: new Date(Date.now() - (i * 53 + 7) * 3_600_000).toISOString(),
  }));
  await db.insert(leads).values(extra);
  // Two requests either side of local midnight on 10 June 2026: Chicago keeps CDT, UTC−5, in June
  // (IANA time zone database), so 04:30Z is still 9 June there and 05:30Z is 10 June.
  await db.insert(leads).values([
    {
      ...extra[0]!,
      ref: "inbox-test-before-midnight",
      customerName: "Late Lorcan",
      createdAt: "2026-06-10T04:30:00.000Z",
    },
    {
      ...extra[0]!,
      ref: "inbox-test-after-midnight",
      customerName: "Early Edda",
      createdAt: "2026-06-10T05:30:00.000Z",
    },
  ]);
  all = await db.select().from(leads).where(eq(leads.companyId, companyId));
});

const page = (filters: Partial<InboxFilters>) =>
  loadInboxPage({ companyId, timeZone: TZ, filters: { ...DEFAULT_INBOX_FILTERS, ...filters }, unseenSince: null });

const newestFirst = (a: Lead, b: Lead) =>
  a.createdAt < b.createdAt ? 1 : a.createdAt > b.createdAt ? -1 : b.id - a.id;

test("the first page holds the 25 newest requests and the second page the next 25, no row twice", async () => {
  const expected = [...all].sort(newestFirst).map((l) => l.id);
  const first = await page({});
  const second = await page({ page: 2 });
  expect(first.rows.map((r) => r.id)).toEqual(expected.slice(0, 25));
  expect(second.rows.map((r) => r.id)).toEqual(expected.slice(25, 50));
  expect(first.total).toBe(all.length);
  expect(first.pageCount).toBe(Math.ceil(all.length / 25));
  expect(first.pageSize).toBe(25);
});

test("a page past the end is empty but still counts every request", async () => {
  const past = await page({ page: 99 });
  expect(past.rows).toEqual([]);
  expect(past.total).toBe(all.length);
});

test("the status filter keeps one status, and the counts per status ignore it", async () => {
  for (const status of LEAD_STATUSES) {
    const result = await page({ status });
    const expected = all.filter((l) => l.status === status).sort(newestFirst);
    expect(result.rows.map((r) => r.id)).toEqual(expected.slice(0, 25).map((l) => l.id));
    expect(result.total).toBe(expected.length);
    expect(result.counts[status]).toBe(expected.length);
    expect(result.counts.all).toBe(all.length);
  }
});

test('the assignee filter finds a person\'s requests, and "none" the unassigned ones', async () => {
  const mine = await page({ assignee: estimatorId, page: 1 });
  const expectedMine = all.filter((l) => l.assignedUserId === estimatorId);
  expect(mine.total).toBe(expectedMine.length);
  expect(mine.rows.every((r) => r.assignee?.id === estimatorId)).toBe(true);
  const none = await page({ assignee: "none" });
  expect(none.total).toBe(all.filter((l) => l.assignedUserId === null).length);
  expect(none.rows.every((r) => r.assignee === null)).toBe(true);
  // The counts follow the other filters.
  expect(mine.counts.all).toBe(expectedMine.length);
});

test("the date range reads days in the company's time zone, both ends included", async () => {
  const june10 = await page({ from: "2026-06-10", to: "2026-06-10" });
  expect(june10.rows.map((r) => r.customerName)).toEqual(["Early Edda"]);
  const june9 = await page({ from: "2026-06-09", to: "2026-06-09" });
  expect(june9.rows.map((r) => r.customerName)).toEqual(["Late Lorcan"]);
  const both = await page({ from: "2026-06-09", to: "2026-06-10" });
  expect(both.total).toBe(2);
});

test("search finds a name, an e-mail, a town and a phone number written any way, ignoring case", async () => {
  expect((await page({ q: "wendell" })).rows.map((r) => r.customerName)).toEqual(["Wendell Ashgrove"]);
  expect((await page({ q: "PRIYA.VANDERMOLEN@" })).rows.map((r) => r.customerName)).toEqual(["Priya Vandermolen"]);
  const fernwick = await page({ q: "fernwick" });
  expect(fernwick.total).toBe(all.filter((l) => l.town === "Fernwick").length);
  expect(fernwick.total).toBeGreaterThan(0);
  // Wendell's number is stored in E.164 as +12175550101 and shown as (217) 555-0101.
  expect((await page({ q: "555-0101" })).rows.map((r) => r.customerName)).toEqual(["Wendell Ashgrove"]);
  expect((await page({ q: "(217) 555-0101" })).rows.map((r) => r.customerName)).toEqual(["Wendell Ashgrove"]);
  expect((await page({ q: "2175550101" })).rows.map((r) => r.customerName)).toEqual(["Wendell Ashgrove"]);
  expect((await page({ q: "217.555.0101" })).rows.map((r) => r.customerName)).toEqual(["Wendell Ashgrove"]);
});

test("search treats % and _ as plain characters, not wildcards", async () => {
  expect((await page({ q: "%" })).total).toBe(0);
  expect((await page({ q: "_" })).total).toBe(0);
});

test("sorting by customer is alphabetical without regard to case, either way", async () => {
  const byName = [...all].sort(
    (a, b) => a.customerName.toLowerCase().localeCompare(b.customerName.toLowerCase()) || a.id - b.id,
  );
  const asc = await page({ sort: "customer", dir: "asc" });
  expect(asc.rows.map((r) => r.customerName)).toEqual(byName.slice(0, 25).map((l) => l.customerName));
  const desc = await page({ sort: "customer", dir: "desc" });
  expect(desc.rows[0]!.customerName.toLowerCase() >= desc.rows[24]!.customerName.toLowerCase()).toBe(true);
  expect(desc.rows[0]!.customerName.toLowerCase()).toBe(byName.at(-1)!.customerName.toLowerCase());
});

test("sorting by price puts requests without a price last, whichever way", async () => {
  const priced = all.filter((l) => l.priceLowCents !== null).length;
  for (const dir of ["asc", "desc"] as const) {
    const rows: InboxPage["rows"] = [];
    for (let p = 1; p <= Math.ceil(all.length / 25); p++)
      rows.push(...(await page({ sort: "price", dir, page: p })).rows);
    const prices = rows.map((r) => r.priceLowCents);
    expect(prices.slice(priced).every((v) => v === null)).toBe(true);
    const known = prices.slice(0, priced) as number[];
    expect(known).toEqual([...known].sort((a, b) => (dir === "asc" ? a - b : b - a)));
  }
});

test("sorting by stage follows the job's steps, request first, stopped jobs last", async () => {
  const rows: InboxPage["rows"] = [];
  for (let p = 1; p <= Math.ceil(all.length / 25); p++)
    rows.push(...(await page({ sort: "status", dir: "asc", page: p })).rows);
  const order = rows.map((r) => LEAD_STATUSES.indexOf(r.status));
  expect(order).toEqual([...order].sort((a, b) => a - b));
  expect(rows[0]!.status).toBe("request");
  expect(rows.at(-1)!.status).toBe("not-going-ahead");
});

test("sorting by bowl, estimator and consult gives ordered pages", async () => {
  const bowls = (await page({ sort: "bowl", dir: "desc" })).rows.map((r) => r.bowlDiameterIn);
  expect(bowls).toEqual([...bowls].sort((a, b) => b - a));
  const names = (await page({ sort: "assignee", dir: "asc" })).rows.map((r) => r.assignee?.name ?? "~");
  expect(names).toEqual([...names].sort((a, b) => a.toLowerCase().localeCompare(b.toLowerCase())));
  // Booked consults first, soonest first; requests without one after them.
  const consults = (await page({ sort: "consult", dir: "asc" })).rows.map((r) => r.consult?.startsAt ?? null);
  expect(consults).toHaveLength(25);
  const booked = consults.filter((c): c is string => c !== null);
  expect(consults.slice(0, booked.length)).toEqual([...booked].sort());
  expect(consults.slice(booked.length).every((c) => c === null)).toBe(true);
});

test("bad filters are refused with a message naming each field", () => {
  const result = parseInboxQuery(
    new URLSearchParams("status=maybe&page=0&from=2026-13-01&sort=colour&dir=up&assignee=bob"),
  );
  expect(result.ok).toBe(false);
  if (result.ok) return;
  expect(Object.keys(result.errors).sort()).toEqual(["assignee", "dir", "from", "page", "sort", "status"]);
  expect(result.errors.status).toContain("request, called-back");
  expect(result.errors.from).toContain("2026-12-02");
  const reversed = parseInboxQuery(new URLSearchParams("from=2026-06-10&to=2026-06-01"));
  expect(reversed).toEqual({
    ok: false,
    errors: { to: "To must be on or after From: the end date comes before the start date." },
  });
  const long = parseInboxQuery(new URLSearchParams({ q: "x".repeat(101) }));
  expect(long.ok ? null : long.errors.q).toBe("Search must be at most 100 characters.");
});

test("the inbox page answers bad filters with 400 and the messages, the API with 400 JSON, the CSV with 400 text", async () => {
  const cookie = await loginAs(companyId, "estimator");
  const pageResult = (await inboxLoader(routeArgs(requestWithCookie("/app/inbox?status=maybe", cookie)))) as {
    init: { status: number };
    data: { errors: Record<string, string> };
  };
  expect(pageResult.init.status).toBe(400);
  expect(pageResult.data.errors.status).toMatch(/^Stage must be one of/);
  const api = await apiLoader(routeArgs(requestWithCookie("/api/leads?page=-1&since=yesterday", cookie)));
  expect(api.status).toBe(400);
  const body = (await api.json()) as { errors: { path: string; message: string }[] };
  expect(body.errors.map((e) => e.path).sort()).toEqual(["page", "since"]);
  const csv = (await csvLoader(routeArgs(requestWithCookie("/app/inbox.csv?to=soon", cookie)))) as Response;
  expect(csv.status).toBe(400);
  expect(await csv.text()).toContain("to: To must be a date");
});

test("the API gives the same page as the inbox for the same filters, as JSON", async () => {
  const cookie = await loginAs(companyId, "owner");
  const response = await apiLoader(
    routeArgs(requestWithCookie("/api/leads?status=request&sort=customer&dir=asc", cookie)),
  );
  expect(response.status).toBe(200);
  const body = (await response.json()) as InboxPage;
  const direct = await page({ status: "request", sort: "customer", dir: "asc" });
  expect(body.rows.map((r) => r.id)).toEqual(direct.rows.map((r) => r.id));
  expect(body.query).toBe("status=request&sort=customer&dir=asc");
  expect(body.counts).toEqual(direct.counts);
});

function parseCsv(text: string): string[][] {
  // RFC 4180 reader for the test: quoted fields may hold commas, doubled quotes and line breaks.
  const rows: string[][] = [];
  let row: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") {
      row.push(field);
      field = "";
    } else if (c === "\r" && text[i + 1] === "\n") {
      row.push(field);
      rows.push(row);
      row = [];
      field = "";
      i++;
    } else field += c;
  }
  return rows;
}

test("the CSV holds every request under the filters, all pages, in the inbox's order, with a dated file name", async () => {
  const cookie = await loginAs(companyId, "estimator");
  const response = (await csvLoader(
    routeArgs(requestWithCookie("/app/inbox.csv?q=harrow&sort=customer&dir=asc", cookie)),
  )) as Response;
  expect(response.headers.get("Content-Type")).toBe("text/csv; charset=utf-8");
  expect(response.headers.get("Content-Disposition")).toMatch(
    /^attachment; filename="emberwright-leads-cinder-slate-\d{4}-\d{2}-\d{2}\.csv"$/,
  );
  const text = (await response.text()).replace(/^\uFEFF/, "");
  const [header, ...rows] = parseCsv(text);
  expect(header).toEqual([
    "Request",
    "Received",
    "Stage",
    "Why stopped",
    "Customer",
    "E-mail",
    "Phone",
    "Street",
    "Town",
    "Bowl (in)",
    "Wall stone",
    "Price low (USD)",
    "Price high (USD)",
    "Consult",
    "Estimator",
  ]);
  const expected = all
    .filter((l) => [l.customerName, l.email, l.phone, l.town].some((v) => v.toLowerCase().includes("harrow")))
    .sort((a, b) => a.customerName.toLowerCase().localeCompare(b.customerName.toLowerCase()) || a.id - b.id);
  expect(expected.length).toBeGreaterThan(25);
  expect(rows.map((r) => Number(r[0]))).toEqual(expected.map((l) => l.id));
  const wren = rows.find((r) => r[4] === "Gunnar Halvorsen")!;
  expect(wren[2]).toBe("Not going ahead");
  expect(wren[3]).toBe("Chose a portable steel fire bowl instead.");
});

test("a CSV cell that a spreadsheet would run as a formula is written as text", async () => {
  const [template] = all;
  await db.insert(leads).values({
    ...template!,
    id: undefined,
    ref: "inbox-test-formula",
    customerName: '=HYPERLINK("http://evil.example","Click, me")',
    town: "@Harrowgate",
    phone: "+1 555 010 0000",
    notes: "",
  });
  const cookie = await loginAs(companyId, "owner");
  const text = await (
    (await csvLoader(routeArgs(requestWithCookie("/app/inbox.csv?q=Harrowgate", cookie)))) as Response
  ).text();
  const [, row] = parseCsv(text.replace(/^\uFEFF/, ""));
  expect(row![4]).toBe(`'=HYPERLINK("http://evil.example","Click, me")`);
  expect(row![8]).toBe("'@Harrowgate");
  expect(row![6]).toBe("'+1 555 010 0000");
  // The raw line quotes the cell and doubles its quotes (RFC 4180 §2.6–2.7).
  expect(text).toContain(`"'=HYPERLINK(""http://evil.example"",""Click, me"")"`);
  await db.delete(leads).where(and(eq(leads.ref, "inbox-test-formula"), eq(leads.companyId, companyId)));
});

test("opening the inbox marks newer requests unseen, then remembers the visit; polling the API does not", async () => {
  const cookie = await loginAs(companyId, "estimator");
  const seenBefore = new Date(Date.now() - 30 * 3_600_000).toISOString();
  await db.update(users).set({ inboxSeenAt: seenBefore }).where(eq(users.id, estimatorId));
  const first = (await inboxLoader(routeArgs(requestWithCookie("/app/inbox", cookie)))) as { inbox: InboxPage };
  expect(first.inbox.unseenSince).toBe(seenBefore);
  const expectedUnseen = all.filter((l) => l.createdAt > seenBefore).length;
  expect(first.inbox.unseenCount).toBe(expectedUnseen);
  expect(first.inbox.rows.filter((r) => r.isUnseen).length).toBe(expectedUnseen);
  // Reading the page changes nothing; the page then posts the moment it was read.
  const [unchanged] = await db.select({ seen: users.inboxSeenAt }).from(users).where(eq(users.id, estimatorId));
  expect(unchanged!.seen).toBe(seenBefore);
  const viewedAt = (first as unknown as { viewedAt: string }).viewedAt;
  const seen = await seenAction(
    routeArgs(
      requestWithCookie("/app/inbox/seen", cookie, { method: "POST", body: new URLSearchParams({ at: viewedAt }) }),
    ),
  );
  expect(seen.status).toBe(204);
  const [after] = await db.select({ seen: users.inboxSeenAt }).from(users).where(eq(users.id, estimatorId));
  expect(after!.seen).toBe(viewedAt);
  // An older time never moves the mark back; a malformed one is refused, naming the field.
  await seenAction(
    routeArgs(
      requestWithCookie("/app/inbox/seen", cookie, { method: "POST", body: new URLSearchParams({ at: seenBefore }) }),
    ),
  );
  const bad = await seenAction(
    routeArgs(
      requestWithCookie("/app/inbox/seen", cookie, { method: "POST", body: new URLSearchParams({ at: "yesterday" }) }),
    ),
  );
  expect(bad.status).toBe(400);
  expect(((await bad.json()) as { errors: { path: string }[] }).errors[0]!.path).toBe("at");
  const [kept] = await db.select({ seen: users.inboxSeenAt }).from(users).where(eq(users.id, estimatorId));
  expect(kept!.seen).toBe(viewedAt);

  const polled = (await (
    await apiLoader(routeArgs(requestWithCookie(`/api/leads?since=${encodeURIComponent(seenBefore)}`, cookie)))
  ).json()) as InboxPage;
  expect(polled.unseenCount).toBe(expectedUnseen);
  const [still] = await db.select({ seen: users.inboxSeenAt }).from(users).where(eq(users.id, estimatorId));
  expect(still!.seen).toBe(after!.seen);

  const second = (await inboxLoader(routeArgs(requestWithCookie("/app/inbox", cookie)))) as { inbox: InboxPage };
  expect(second.inbox.unseenCount).toBe(0);
  expect(second.inbox.rows.some((r) => r.isUnseen)).toBe(false);
});

test("the consult column shows a confirmed booking in the company's time, and ignores a cancelled one", async () => {
  const wendell = all.find((l) => l.ref === "demo-cinder-slate-02")!;
  const marcus = all.find((l) => l.ref === "demo-cinder-slate-04")!;
  const booking = { companyId, amountCents: 15000, holdExpiresAt: "2031-03-01T00:00:00.000Z" };
  await db.insert(bookings).values([
    // 15:00 UTC on 4 March 2031 is 9:00 in Chicago, still on CST (UTC−6) until 9 March (IANA tz database).
    {
      ...booking,
      leadId: wendell.id,
      startsAt: "2031-03-04T15:00:00.000Z",
      endsAt: "2031-03-04T16:00:00.000Z",
      status: "confirmed" as const,
    },
    {
      ...booking,
      leadId: marcus.id,
      startsAt: "2031-03-05T15:00:00.000Z",
      endsAt: "2031-03-05T16:00:00.000Z",
      status: "cancelled" as const,
    },
  ]);
  const found = await page({ q: "Wendell" });
  expect(found.rows[0]!.consult).toEqual({ startsAt: "2031-03-04T15:00:00.000Z", label: "Tue, Mar 4, 9:00 AM" });
  const cancelled = await page({ q: "Oyelaran" });
  expect(cancelled.rows[0]!.consult?.startsAt ?? null).not.toBe("2031-03-05T15:00:00.000Z");
});

test("someone opening the inbox for the first time sees nothing marked new, and the count agrees with the marks", async () => {
  const [fresh] = await db
    .insert(users)
    .values({ companyId, email: "first.visit@cinder-slate.test", name: "First Visit", role: "estimator" })
    .returning();
  const { startSession } = await import("~/lib/auth/session.server");
  const cookie = (await startSession(fresh!.id)).split(";")[0]!;
  const first = (await inboxLoader(routeArgs(requestWithCookie("/app/inbox", cookie)))) as { inbox: InboxPage };
  expect(first.inbox.unseenCount).toBe(0);
  expect(first.inbox.rows.some((r) => r.isUnseen)).toBe(false);
  expect(first.inbox.unseenSince).not.toBeNull();
});
