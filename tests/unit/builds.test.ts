/*
 * Builds on the calendar: booked from the job's labour-hours, moved and cancelled with the calendar
 * event updated for everyone (RFC 5545 UID/SEQUENCE, RFC 5546 CANCEL, read back with ical.js), two
 * changes at once settled by the sequence, and the crew's private feed. Day counts worked by hand.
 */
import ICAL from "ical.js";
import { eq, like } from "drizzle-orm";
import { beforeAll, expect, test } from "vitest";
import { buildCrew, builds, companies, emailOutbox, leads, users, type Company } from "~/db/schema";
import { addCalendarDays, buildDates, weekdayOf } from "~/domain/build-schedule";
import {
  BOOKING_DAYS_AHEAD,
  bookBuild,
  describeBuildDays,
  calendarFeedFor,
  cancelBuild,
  issueCalendarFeed,
  jobLabourHours,
  moveBuild,
  revokeCalendarFeed,
  workCalendarFor,
} from "~/lib/builds/builds.server";
import { zonedDay } from "~/lib/format/zoned-time";
import { db } from "~/lib/platform/db.server";
import { action as buildAction, loader as buildLoader } from "~/routes/app-lead-build";
import { loader as myLoader } from "~/routes/my";
import { loader as leadLoader } from "~/routes/app-lead";
import { startSession } from "~/lib/auth/session.server";
import { demoCompany, routeArgs } from "./support/demo";
import { createCompanyWithStaff, requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";
import { copyDemoLead, officeUser } from "./support/proposals";

let company: Company;
let crewA: { id: number; name: string; email: string };
let crewB: { id: number; name: string; email: string };
const ORIGIN = "http://localhost";

beforeAll(async () => {
  ({ company } = await demoCompany());
  const suffix = Math.random().toString(36).slice(2, 8);
  const [a, b] = await db
    .insert(users)
    .values([
      { companyId: company.id, email: `ash.${suffix}@crew.example`, name: `Ash Test ${suffix}`, role: "crew" },
      { companyId: company.id, email: `rowan.${suffix}@crew.example`, name: `Rowan Test ${suffix}`, role: "crew" },
    ])
    .returning();
  crewA = a!;
  crewB = b!;
});

/**
 * A Monday half a year ahead (past the seed's builds, inside the two years a build may be booked),
 * two weeks after the last one handed out, so these builds never meet the seed's or each other's.
 */
let weekOffset = 0;
async function farMonday(): Promise<string> {
  weekOffset += 2;
  let day = addCalendarDays(new Date().toISOString().slice(0, 10), 180 + weekOffset * 7);
  while (weekdayOf(day) !== 1) day = addCalendarDays(day, 1);
  return day;
}

async function signedJob() {
  return copyDemoLead("demo-cinder-slate-07", "signed");
}

const mailFor = (key: string) => db.select().from(emailOutbox).where(like(emailOutbox.idempotencyKey, key));

function icsOf(row: { attachmentsJson: string }) {
  const [file] = JSON.parse(row.attachmentsJson) as { content: string }[];
  const calendar = new ICAL.Component(ICAL.parse(Buffer.from(file!.content, "base64").toString()));
  const event = new ICAL.Event(calendar.getFirstSubcomponent("vevent")!);
  const days: string[] = [];
  const it = event.iterator();
  for (let next = it.next(); next && days.length < 40; next = it.next()) days.push(next.toString().slice(0, 10));
  return {
    method: calendar.getFirstPropertyValue("method"),
    uid: event.uid,
    sequence: event.sequence,
    days,
    status: event.component.getFirstPropertyValue("status"),
  };
}

test("booking lays the job's labour-hours over the crew's days, moves the job to “build booked” and e-mails everyone the event", async () => {
  const lead = await signedJob();
  const owner = await officeUser(company.id, "owner");
  const hours = await jobLabourHours(lead);
  expect(hours).toBeGreaterThan(0);
  const start = await farMonday();
  const result = await bookBuild(
    owner,
    lead,
    company,
    { start, crewUserIds: [crewA.id], days: null, notes: "", allowClash: false },
    ORIGIN,
  );
  if (!result.ok) throw new Error(JSON.stringify(result));
  // Days = ceil(hours / (2 people × 8 h)) with the demo company's crew of 2 on 8-hour days.
  const expectedDays = Math.max(1, Math.ceil(hours / 16 - 1e-9));
  const dates = JSON.parse(result.build.datesJson) as string[];
  expect(dates).toEqual(buildDates(start, expectedDays, await workCalendarFor(company)));
  const [job] = await db.select().from(leads).where(eq(leads.id, lead.id));
  expect(job!.status).toBe("build-booked");

  const [homeowner] = await mailFor(`build-booked/${result.build.id}/0`);
  expect(homeowner!.toAddress).toBe(lead.email);
  const ics = icsOf(homeowner!);
  expect(ics).toMatchObject({
    method: "REQUEST",
    uid: `build-${result.build.id}@emberwright`,
    sequence: 0,
    days: dates,
  });
  const [crewMail] = await mailFor(`build-crew-booked/${result.build.id}/${crewA.id}/0`);
  expect(crewMail!.toAddress).toBe(crewA.email);
  // The reminder waits for 8 a.m. company time the day before the first day.
  const [reminder] = await mailFor(`build-reminder/${result.build.id}/0`);
  expect(reminder!.status).toBe("pending");
  const dayBefore = addCalendarDays(dates[0]!, -1);
  expect(
    new Intl.DateTimeFormat("en-CA", {
      timeZone: company.timeZone,
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      hourCycle: "h23",
    }).format(new Date(reminder!.sendAfter)),
  ).toBe(`${dayBefore}, 08`);
  expect(reminder!.text).toMatch(/utility locate marks/);

  // A second booking for the same job is refused: move it instead.
  const again = await bookBuild(
    owner,
    lead,
    company,
    { start, crewUserIds: [crewA.id], days: 1, notes: "", allowClash: false },
    ORIGIN,
  );
  expect(again).toMatchObject({ ok: false, status: 409 });
});

test("the same crew member on another build the same days is a clash, named, unless the owner books anyway", async () => {
  const owner = await officeUser(company.id, "owner");
  const start = await farMonday();
  const first = await bookBuild(
    owner,
    await signedJob(),
    company,
    { start, crewUserIds: [crewB.id], days: 2, notes: "", allowClash: false },
    ORIGIN,
  );
  expect(first.ok).toBe(true);
  const second = await signedJob();
  const refused = await bookBuild(
    owner,
    second,
    company,
    { start: addCalendarDays(start, 1), crewUserIds: [crewB.id], days: 2, notes: "", allowClash: false },
    ORIGIN,
  );
  expect(refused).toMatchObject({ ok: false, status: 409 });
  if (refused.ok) return;
  expect(refused.clashes).toHaveLength(1);
  expect(refused.clashes![0]).toContain(crewB.name);
  // Nothing half-saved: the job is still signed, no build row.
  expect((await db.select().from(builds).where(eq(builds.leadId, second.id))).length).toBe(0);
  // A different person the same days is no clash.
  const other = await bookBuild(
    owner,
    second,
    company,
    { start: addCalendarDays(start, 1), crewUserIds: [crewA.id], days: 2, notes: "", allowClash: false },
    ORIGIN,
  );
  expect(other.ok).toBe(true);
});

test("moving keeps the UID and raises SEQUENCE; two moves at once: one wins, the other is told; the old reminder is withdrawn", async () => {
  const owner = await officeUser(company.id, "owner");
  const lead = await signedJob();
  const start = await farMonday();
  const booked = await bookBuild(
    owner,
    lead,
    company,
    { start, crewUserIds: [crewA.id], days: 2, notes: "", allowClash: false },
    ORIGIN,
  );
  if (!booked.ok) throw new Error("not booked");
  const target = addCalendarDays(start, 3); // Thursday: Thursday and Friday.
  const [a, b] = await Promise.all([
    moveBuild(
      owner,
      lead,
      company,
      { buildId: booked.build.id, sequence: 0, start: target, days: null, crewUserIds: null, allowClash: true },
      ORIGIN,
    ),
    moveBuild(
      owner,
      lead,
      company,
      {
        buildId: booked.build.id,
        sequence: 0,
        start: addCalendarDays(start, 7),
        days: null,
        crewUserIds: null,
        allowClash: true,
      },
      ORIGIN,
    ),
  ]);
  expect([a.ok, b.ok].sort()).toEqual([false, true]);
  const loser = a.ok ? b : a;
  expect(loser).toMatchObject({ ok: false, status: 409 });
  const [row] = await db.select().from(builds).where(eq(builds.id, booked.build.id));
  expect(row!.sequence).toBe(1);
  const [moved] = await mailFor(`build-moved/${booked.build.id}/1`);
  const ics = icsOf(moved!);
  expect(ics).toMatchObject({ method: "REQUEST", uid: `build-${booked.build.id}@emberwright`, sequence: 1 });
  expect(ics.days).toEqual(JSON.parse(row!.datesJson));
  const [oldReminder] = await mailFor(`build-reminder/${booked.build.id}/0`);
  expect(oldReminder!.status).toBe("cancelled");
  const [newReminder] = await mailFor(`build-reminder/${booked.build.id}/1`);
  expect(newReminder!.status).toBe("pending");
});

test("a first build day before today or more than two years ahead is refused, booking or moving, and nothing changes", async () => {
  // Common practice, no source: nobody books a build for a day gone by, and a date years out is a typo.
  const owner = await officeUser(company.id, "owner");
  const lead = await signedJob();
  // 03:30 UTC on 10 March 2027 is the evening of Tuesday 9 March in the company's zone (America/Chicago,
  // UTC−6 before the clocks change on 14 March): "today" is the company's day, not the server's.
  expect(company.timeZone).toBe("America/Chicago");
  const now = new Date("2027-03-10T03:30:00Z");
  const today = "2027-03-09";
  expect(zonedDay(now, company.timeZone)).toBe(today);
  // Two years on: 2027-03-09 + 730 days = 2029-03-08 (29 February 2028 between), a Thursday, worked by hand.
  const edge = addCalendarDays(today, BOOKING_DAYS_AHEAD);
  expect([edge, weekdayOf(edge)]).toEqual(["2029-03-08", 4]);
  const book = (start: string, at = now) =>
    bookBuild(
      owner,
      lead,
      company,
      { start, crewUserIds: [crewA.id], days: 1, notes: "", allowClash: true, now: at },
      ORIGIN,
    );
  const yesterday = await book("2027-03-08");
  expect(yesterday).toMatchObject({ ok: false, status: 400, errors: { start: /today or a later day/ } });
  const tooFar = await book("2029-03-09");
  expect(tooFar).toMatchObject({ ok: false, status: 400, errors: { start: /within two years, by .*2029/ } });
  // A start inside the window that the working week pushes past it: Saturday 2029-03-10 seen from
  // 2027-03-11 (edge 2029-03-10) would start on Monday 2029-03-12, outside.
  const laterNow = new Date("2027-03-11T18:00:00Z");
  expect(addCalendarDays(zonedDay(laterNow, company.timeZone), BOOKING_DAYS_AHEAD)).toBe("2029-03-10");
  expect(weekdayOf("2029-03-10")).toBe(6);
  expect(await book("2029-03-10", laterNow)).toMatchObject({
    ok: false,
    status: 400,
    errors: { start: /within two years/ },
  });
  expect(await db.select().from(builds).where(eq(builds.leadId, lead.id))).toEqual([]);
  // The last day inside the window is taken (the window's edge, not one day short of it).
  const booked = await book(edge);
  if (!booked.ok) throw new Error(JSON.stringify(booked));
  expect(booked.build.firstDay).toBe(edge);
  const move = (start: string) =>
    moveBuild(
      owner,
      lead,
      company,
      { buildId: booked.build.id, sequence: 0, start, days: null, crewUserIds: null, allowClash: true, now },
      ORIGIN,
    );
  expect(await move("2027-03-06")).toMatchObject({ ok: false, status: 400 });
  expect(await move("2029-04-07")).toMatchObject({ ok: false, status: 400 });
  const [row] = await db.select().from(builds).where(eq(builds.id, booked.build.id));
  expect([row!.sequence, row!.firstDay]).toEqual([0, edge]);
  // Today itself (a working Tuesday) is allowed.
  expect(await move(today)).toMatchObject({ ok: true });
  const [moved] = await db.select().from(builds).where(eq(builds.id, booked.build.id));
  expect([moved!.sequence, moved!.firstDay]).toEqual([1, today]);
});

test("cancelling sends METHOD:CANCEL under the same UID, withdraws the reminder and puts the job back to signed", async () => {
  const owner = await officeUser(company.id, "owner");
  const lead = await signedJob();
  const booked = await bookBuild(
    owner,
    lead,
    company,
    { start: await farMonday(), crewUserIds: [crewA.id], days: 1, notes: "", allowClash: true },
    ORIGIN,
  );
  if (!booked.ok) throw new Error("not booked");
  const stale = await cancelBuild(
    owner,
    lead,
    company,
    { buildId: booked.build.id, sequence: 5, reason: "Rain all week." },
    ORIGIN,
  );
  expect(stale).toMatchObject({ ok: false, status: 409 });
  const cancelled = await cancelBuild(
    owner,
    lead,
    company,
    { buildId: booked.build.id, sequence: 0, reason: "Rain all week." },
    ORIGIN,
  );
  expect(cancelled.ok).toBe(true);
  const [mail] = await mailFor(`build-cancelled/${booked.build.id}/1`);
  expect(icsOf(mail!)).toMatchObject({
    method: "CANCEL",
    status: "CANCELLED",
    sequence: 1,
    uid: `build-${booked.build.id}@emberwright`,
  });
  expect(mail!.text).toContain("Rain all week.");
  expect((await mailFor(`build-crew-cancelled/${booked.build.id}/${crewA.id}/1`)).length).toBe(1);
  expect((await mailFor(`build-reminder/${booked.build.id}/0`))[0]!.status).toBe("cancelled");
  const [job] = await db.select().from(leads).where(eq(leads.id, lead.id));
  expect(job!.status).toBe("signed");
});

test("a crew member's feed lists their builds only; a new link ends the old one, and stopping ends both", async () => {
  const owner = await officeUser(company.id, "owner");
  const lead = await signedJob();
  const booked = await bookBuild(
    owner,
    lead,
    company,
    {
      start: addCalendarDays(new Date().toISOString().slice(0, 10), 40),
      crewUserIds: [crewB.id],
      days: 1,
      notes: "",
      allowClash: true,
    },
    ORIGIN,
  );
  if (!booked.ok) throw new Error(JSON.stringify(booked));
  const first = await issueCalendarFeed(crewB.id, company.id);
  const feed = await calendarFeedFor(first);
  expect(feed).toContain(`UID:build-${booked.build.id}@emberwright`);
  const rowsForB = await db.select({ id: buildCrew.buildId }).from(buildCrew).where(eq(buildCrew.userId, crewB.id));
  expect(feed!.match(/BEGIN:VEVENT/g)!.length).toBeLessThanOrEqual(rowsForB.length);
  const aFeed = await calendarFeedFor(await issueCalendarFeed(crewA.id, company.id));
  expect(aFeed).not.toContain(`UID:build-${booked.build.id}@emberwright`);

  const second = await issueCalendarFeed(crewB.id, company.id);
  expect(await calendarFeedFor(first)).toBeNull();
  expect(await calendarFeedFor(second)).not.toBeNull();
  await revokeCalendarFeed(crewB.id, company.id);
  expect(await calendarFeedFor(second)).toBeNull();
  expect(await calendarFeedFor("../../etc/passwd")).toBeNull();
  expect(await calendarFeedFor("")).toBeNull();
});

test("the build page: owners only, 404 for another company's job, and bad input named by field with nothing saved", async () => {
  const lead = await signedJob();
  const ownerCookie = await loginAs(company.id, "owner");
  const page = (await buildLoader(
    routeArgs(requestWithCookie(`/app/leads/${lead.id}/build`, ownerCookie), { leadId: String(lead.id) }),
  )) as { suggestedDays: number; canBook: boolean };
  expect(page.canBook).toBe(true);
  expect(page.suggestedDays).toBeGreaterThanOrEqual(1);

  const crewCookie = await loginAs(company.id, "crew");
  await expect(
    buildLoader(routeArgs(requestWithCookie(`/app/leads/${lead.id}/build`, crewCookie), { leadId: String(lead.id) })),
  ).rejects.toSatisfy((r: unknown) => r instanceof Response && [302, 403, 404].includes(r.status));

  const other = await createCompanyWithStaff("Other Masonry");
  const otherCookie = other.people.owner.cookie;
  await expect(
    buildLoader(routeArgs(requestWithCookie(`/app/leads/${lead.id}/build`, otherCookie), { leadId: String(lead.id) })),
  ).rejects.toSatisfy((r: unknown) => r instanceof Response && r.status === 404);

  const post = (fields: Record<string, string | string[]>) => {
    const body = new URLSearchParams();
    for (const [k, v] of Object.entries(fields)) for (const one of [v].flat()) body.append(k, one);
    return buildAction(
      routeArgs(
        requestWithCookie(`/app/leads/${lead.id}/build`, ownerCookie, {
          method: "POST",
          body,
          headers: { "Content-Type": "application/x-www-form-urlencoded" },
        }),
        { leadId: String(lead.id) },
      ),
    );
  };
  const badDay = (await post({
    intent: "book",
    start: "2027-02-30",
    days: "",
    crewUserIds: String(crewA.id),
    notes: "",
  })) as { init: { status: number }; data: { errors: Record<string, string> } };
  expect(badDay.init.status).toBe(400);
  expect(badDay.data.errors.start).toMatch(/first build day/);
  const inRange = await farMonday();
  const noCrew = (await post({ intent: "book", start: inRange, days: "2", notes: "" })) as {
    init: { status: number };
    data: { errors: Record<string, string> };
  };
  expect(noCrew.init.status).toBe(400);
  expect(noCrew.data.errors.crewUserIds).toMatch(/crew member/);
  const tooLong = (await post({
    intent: "book",
    start: inRange,
    days: "31",
    crewUserIds: String(crewA.id),
    notes: "",
  })) as { init: { status: number }; data: { errors: Record<string, string> } };
  expect(tooLong.data.errors.days).toMatch(/1 to 30/);
  // Someone else's crew member is refused by name of the field.
  const [otherCrew] = await db
    .insert(users)
    .values({ companyId: other.company.id, email: `x.${Date.now()}@other.example`, name: "Not Ours", role: "crew" })
    .returning();
  const foreign = (await post({
    intent: "book",
    start: inRange,
    days: "1",
    crewUserIds: String(otherCrew!.id),
    notes: "",
  })) as { init: { status: number }; data: { errors: Record<string, string> } };
  expect(foreign.init.status).toBe(400);
  expect(foreign.data.errors.crewUserIds).toMatch(/active crew members of your company/);
  expect((await db.select().from(builds).where(eq(builds.leadId, lead.id))).length).toBe(0);
  // The company row is untouched by any of it.
  const [after] = await db.select().from(companies).where(eq(companies.id, company.id));
  expect(after!.crewSize).toBe(2);
});

test("a built job's build days are a record: moving or cancelling them is refused (409), nothing is e-mailed, the crew keeps the job", async () => {
  // Common practice, no source: once the pit is built, its build days are history, not a plan.
  const owner = await officeUser(company.id, "owner");
  const lead = await signedJob();
  const start = await farMonday();
  const booked = await bookBuild(
    owner,
    lead,
    company,
    { start, crewUserIds: [crewA.id], days: 1, notes: "", allowClash: true },
    ORIGIN,
  );
  if (!booked.ok) throw new Error(JSON.stringify(booked));
  await db.update(leads).set({ status: "built" }).where(eq(leads.id, lead.id));
  const [built] = await db.select().from(leads).where(eq(leads.id, lead.id));
  const mailBefore = (await mailFor(`build-%/${booked.build.id}/%`)).length;
  const cancelled = await cancelBuild(
    owner,
    built!,
    company,
    { buildId: booked.build.id, sequence: 0, reason: "test" },
    ORIGIN,
  );
  expect(cancelled).toMatchObject({ ok: false, status: 409, errors: { reason: /job is built/ } });
  const moved = await moveBuild(
    owner,
    built!,
    company,
    {
      buildId: booked.build.id,
      sequence: 0,
      start: addCalendarDays(start, 7),
      days: null,
      crewUserIds: null,
      allowClash: true,
    },
    ORIGIN,
  );
  expect(moved).toMatchObject({ ok: false, status: 409, errors: { start: /job is built/ } });
  // Marked built between the page loading and the post (the lead read before): refused inside the write.
  const stale = { ...built!, status: "build-booked" as const };
  expect(
    await cancelBuild(owner, stale, company, { buildId: booked.build.id, sequence: 0, reason: "late" }, ORIGIN),
  ).toMatchObject({ ok: false, status: 409 });
  expect(
    await moveBuild(
      owner,
      stale,
      company,
      {
        buildId: booked.build.id,
        sequence: 0,
        start: addCalendarDays(start, 7),
        days: null,
        crewUserIds: null,
        allowClash: true,
      },
      ORIGIN,
    ),
  ).toMatchObject({ ok: false, status: 409 });
  const [row] = await db.select().from(builds).where(eq(builds.id, booked.build.id));
  expect([row!.status, row!.sequence, row!.firstDay]).toEqual(["booked", 0, start]);
  expect(await mailFor(`build-%/${booked.build.id}/%`)).toHaveLength(mailBefore);
});

test("the booked days show where people look: on the homeowner's /my and on the lead page with the crew on the build", async () => {
  const owner = await officeUser(company.id, "owner");
  const lead = await signedJob();
  const start = await farMonday();
  const booked = await bookBuild(
    owner,
    lead,
    company,
    { start, crewUserIds: [crewA.id, crewB.id], days: 2, notes: "", allowClash: true },
    ORIGIN,
  );
  if (!booked.ok) throw new Error(JSON.stringify(booked));
  const days = describeBuildDays(JSON.parse(booked.build.datesJson) as string[]);
  expect(days).toMatch(/^Monday, .+; Tuesday, /);
  const [homeowner] = await db
    .insert(users)
    .values({
      companyId: company.id,
      email: `build.days.${lead.id}@example.test`,
      name: "Build Days Homeowner",
      role: "homeowner",
    })
    .returning();
  await db.update(leads).set({ homeownerId: homeowner!.id }).where(eq(leads.id, lead.id));
  const mine = (await myLoader(
    routeArgs(requestWithCookie("/my", (await startSession(homeowner!.id)).split(";")[0])),
  )) as { requests: { id: number; buildDays: string | null }[] };
  expect(mine.requests.find((r) => r.id === lead.id)!.buildDays).toBe(days);
  const page = (await leadLoader(
    routeArgs(requestWithCookie(`/app/leads/${lead.id}`, await loginAs(company.id, "owner")), {
      leadId: String(lead.id),
    }),
  )) as { build: { days: string; crew: string; canChange: boolean } | null };
  expect(page.build).toEqual({ days, crew: `${crewA.name}, ${crewB.name}`, canChange: true });
});
