/*
 * Moving a build from the schedule's calendar grid: the drop posts the build, the sequence the page was
 * drawn with and the new first day. The calendar file that goes out is read back with ical.js (RFC 5545
 * §3.8.7.4: SEQUENCE is raised on every change of the event, UID kept). Weekdays of the far-future
 * dates are worked by hand from a 2091 calendar and checked with Intl below.
 */
import ICAL from "ical.js";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { builds, consultBlockedDays, emailOutbox, users, type Company } from "~/db/schema";
import { addCalendarDays, weekdayOf } from "~/domain/build-schedule";
import { bookBuild } from "~/lib/builds/builds.server";
import { db } from "~/lib/platform/db.server";
import { action as scheduleAction, loader as scheduleLoader } from "~/routes/app-schedule";
import { demoCompany, routeArgs } from "./support/demo";
import { createCompanyWithStaff, requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";
import { copyDemoLead, officeUser } from "./support/proposals";

let company: Company;
let crewA: { id: number };
let crewB: { id: number };
let ownerCookie: string;
const ORIGIN = "http://localhost";

beforeAll(async () => {
  ({ company } = await demoCompany());
  const suffix = Math.random().toString(36).slice(2, 8);
  const [a, b] = await db
    .insert(users)
    .values([
      { companyId: company.id, email: `flint.${suffix}@crew.example`, name: `Flint Test ${suffix}`, role: "crew" },
      { companyId: company.id, email: `sorrel.${suffix}@crew.example`, name: `Sorrel Test ${suffix}`, role: "crew" },
    ])
    .returning();
  crewA = a!;
  crewB = b!;
  ownerCookie = await loginAs(company.id, "owner");
});

let weekOffset = 0;
/**
 * A Monday half a year ahead (inside the two years a build may be booked), two weeks after the last
 * one handed out, so no two tests' builds meet.
 */
function farMonday(): string {
  weekOffset += 2;
  let day = addCalendarDays(new Date().toISOString().slice(0, 10), 180 + weekOffset * 7);
  while (weekdayOf(day) !== 1) day = addCalendarDays(day, 1);
  return day;
}

async function bookedBuild(start: string, crewId: number, days = 2) {
  const lead = await copyDemoLead("demo-cinder-slate-07", "signed");
  const owner = await officeUser(company.id, "owner");
  const result = await bookBuild(
    owner,
    lead,
    company,
    { start, crewUserIds: [crewId], days, notes: "", allowClash: false },
    ORIGIN,
  );
  if (!result.ok) throw new Error(JSON.stringify(result));
  return { lead, build: result.build };
}

type Answer = {
  init: { status: number } | null;
  data: { move: { ok: boolean; message: string; clashes: string[]; buildId: number | null } | null };
};

function drop(cookie: string | undefined, fields: Record<string, string>) {
  const body = new URLSearchParams({ intent: "move-build", ...fields });
  return scheduleAction(
    routeArgs(
      requestWithCookie("/app/schedule", cookie, {
        method: "POST",
        body,
        headers: { "Content-Type": "application/x-www-form-urlencoded" },
      }),
    ),
  ) as Promise<Answer>;
}

const statusOf = (answer: Answer) => answer.init?.status ?? 200;

async function buildRow(id: number) {
  return (await db.select().from(builds).where(eq(builds.id, id)))[0]!;
}

function icsOf(row: { attachmentsJson: string }) {
  const [file] = JSON.parse(row.attachmentsJson) as { content: string }[];
  const calendar = new ICAL.Component(ICAL.parse(Buffer.from(file!.content, "base64").toString()));
  const event = new ICAL.Event(calendar.getFirstSubcomponent("vevent")!);
  return { uid: event.uid, sequence: event.sequence, start: event.startDate.toString().slice(0, 10) };
}

test("2091's dates used here fall on the weekdays the tests assume (checked against Intl)", () => {
  const weekday = (d: string) =>
    new Intl.DateTimeFormat("en-US", { weekday: "long", timeZone: "UTC" }).format(new Date(`${d}T12:00:00Z`));
  const monday = farMonday();
  expect(weekday(monday)).toBe("Monday");
  expect(weekday(addCalendarDays(monday, 5))).toBe("Saturday");
});

describe("dropping a build on another day", () => {
  test("the owner's drop moves the build to start that day, keeps its length, raises the sequence and sends the updated event", async () => {
    const monday = farMonday();
    const { build } = await bookedBuild(monday, crewA.id, 2);
    const wednesday = addCalendarDays(monday, 2);
    const answer = await drop(ownerCookie, { buildId: String(build.id), sequence: "0", start: wednesday });
    expect(statusOf(answer)).toBe(200);
    expect(answer.data.move).toMatchObject({ ok: true, buildId: build.id });
    expect(answer.data.move!.message).toMatch(/moved to Wednesday, .*; Thursday, /);
    const after = await buildRow(build.id);
    // Two working days from Wednesday, Monday to Friday: Wednesday and Thursday.
    expect(JSON.parse(after.datesJson)).toEqual([wednesday, addCalendarDays(monday, 3)]);
    expect(after.sequence).toBe(1);
    const [mail] = await db
      .select()
      .from(emailOutbox)
      .where(eq(emailOutbox.idempotencyKey, `build-moved/${build.id}/1`));
    expect(icsOf(mail!)).toEqual({ uid: `build-${build.id}@emberwright`, sequence: 1, start: wednesday });
  });

  test("a drop made with the sequence the page was drawn with, after someone else moved it, is refused with 409 and changes nothing", async () => {
    const monday = farMonday();
    const { build } = await bookedBuild(monday, crewA.id, 1);
    expect(
      statusOf(
        await drop(ownerCookie, { buildId: String(build.id), sequence: "0", start: addCalendarDays(monday, 1) }),
      ),
    ).toBe(200);
    const stale = await drop(ownerCookie, {
      buildId: String(build.id),
      sequence: "0",
      start: addCalendarDays(monday, 3),
    });
    expect(statusOf(stale)).toBe(409);
    expect(stale.data.move).toMatchObject({ ok: false });
    expect(stale.data.move!.message).toMatch(/changed a moment ago/);
    const after = await buildRow(build.id);
    expect(JSON.parse(after.datesJson)).toEqual([addCalendarDays(monday, 1)]);
    expect(after.sequence).toBe(1);
  });

  test("a drop onto days where the same crew member is on another build is refused, the clash named, the build left where it was", async () => {
    const monday = farMonday();
    await bookedBuild(monday, crewB.id, 2);
    const { build } = await bookedBuild(addCalendarDays(monday, 7), crewB.id, 2);
    const answer = await drop(ownerCookie, {
      buildId: String(build.id),
      sequence: "0",
      start: addCalendarDays(monday, 1),
    });
    expect(statusOf(answer)).toBe(409);
    expect(answer.data.move!.message).toMatch(/clashes .*stays where it was/);
    expect(answer.data.move!.clashes.join(" ")).toMatch(/Sorrel Test .* is on the .* build on Tuesday/);
    const after = await buildRow(build.id);
    expect(after.firstDay).toBe(addCalendarDays(monday, 7));
    expect(after.sequence).toBe(0);
  });

  test("a weekday not worked, a day off and a day gone by are refused; the build stays", async () => {
    const monday = farMonday();
    const { build } = await bookedBuild(monday, crewA.id, 1);
    const saturday = await drop(ownerCookie, {
      buildId: String(build.id),
      sequence: "0",
      start: addCalendarDays(monday, 5),
    });
    expect(statusOf(saturday)).toBe(409);
    expect(saturday.data.move!.message).toMatch(/Saturday, .* is not a working day/);
    const friday = addCalendarDays(monday, 4);
    await db.insert(consultBlockedDays).values({ companyId: company.id, day: friday });
    const dayOff = await drop(ownerCookie, { buildId: String(build.id), sequence: "0", start: friday });
    expect(statusOf(dayOff)).toBe(409);
    expect(dayOff.data.move!.message).toMatch(/Friday, .* is a day off/);
    const past = await drop(ownerCookie, { buildId: String(build.id), sequence: "0", start: "2020-03-02" });
    expect(statusOf(past)).toBe(400);
    expect(past.data.move!.message).toMatch(/today or a later day/);
    const notADate = await drop(ownerCookie, { buildId: String(build.id), sequence: "0", start: "2027-02-29" });
    expect(statusOf(notADate)).toBe(400);
    expect(notADate.data.move!.message).toMatch(/must be a date/);
    const noSequence = await drop(ownerCookie, { buildId: String(build.id), start: addCalendarDays(monday, 1) });
    expect(statusOf(noSequence)).toBe(400);
    const after = await buildRow(build.id);
    expect(after.firstDay).toBe(monday);
    expect(after.sequence).toBe(0);
  });

  test("estimators and crew are refused (403); the build stays", async () => {
    const monday = farMonday();
    const { build } = await bookedBuild(monday, crewA.id, 1);
    for (const role of ["estimator", "crew"] as const) {
      const cookie = await loginAs(company.id, role);
      await expect(
        drop(cookie, { buildId: String(build.id), sequence: "0", start: addCalendarDays(monday, 1) }),
      ).rejects.toSatisfy((r: unknown) => r instanceof Response && r.status === 403);
    }
    expect((await buildRow(build.id)).sequence).toBe(0);
  });

  test("another company's owner gets 404 for our build, as for one that does not exist; the build stays", async () => {
    const monday = farMonday();
    const { build } = await bookedBuild(monday, crewA.id, 1);
    const other = await createCompanyWithStaff("Other Hearth Works");
    const answer = await drop(other.people.owner.cookie, {
      buildId: String(build.id),
      sequence: "0",
      start: addCalendarDays(monday, 1),
    });
    expect(statusOf(answer)).toBe(404);
    expect(statusOf(await drop(ownerCookie, { buildId: "999999999", sequence: "0", start: monday }))).toBe(404);
    const after = await buildRow(build.id);
    expect(after.firstDay).toBe(monday);
    expect(after.sequence).toBe(0);
  });
});

describe("the calendar grid", () => {
  test("shows four weeks from the Monday of the chosen day, the builds on them, days off and weekdays not worked", async () => {
    const monday = farMonday();
    const { build, lead } = await bookedBuild(monday, crewA.id, 2);
    const thursday = addCalendarDays(monday, 3);
    await db.insert(consultBlockedDays).values({ companyId: company.id, day: thursday });
    const page = (await scheduleLoader(
      routeArgs(requestWithCookie(`/app/schedule?from=${thursday}`, ownerCookie)),
    )) as {
      grid: {
        start: string;
        next: string;
        previous: string;
        weeks: { day: string; isWorking: boolean; isDayOff: boolean }[][];
        builds: { id: number; customerName: string; dates: string[]; sequence: number }[];
      };
    };
    expect(page.grid.start).toBe(monday);
    expect(page.grid.weeks).toHaveLength(4);
    expect(page.grid.weeks.every((w) => w.length === 7 && weekdayOf(w[0]!.day) === 1)).toBe(true);
    expect(page.grid.next).toBe(addCalendarDays(monday, 28));
    expect(page.grid.previous).toBe(addCalendarDays(monday, -28));
    const cells = page.grid.weeks.flat();
    expect(cells.find((c) => c.day === thursday)!.isDayOff).toBe(true);
    expect(cells.find((c) => c.day === addCalendarDays(monday, 6))!.isWorking).toBe(false);
    expect(page.grid.builds.find((b) => b.id === build.id)).toMatchObject({
      customerName: lead.customerName,
      dates: [monday, addCalendarDays(monday, 1)],
      sequence: 0,
    });
    // A made-up "from" falls back to this week rather than failing.
    const fallback = (await scheduleLoader(
      routeArgs(requestWithCookie("/app/schedule?from=not-a-day", ownerCookie)),
    )) as { grid: { weeks: unknown[] } };
    expect(fallback.grid.weeks).toHaveLength(4);
  });

  test("another company's grid holds none of our builds", async () => {
    const other = await createCompanyWithStaff("Far Quarry Co");
    const monday = farMonday();
    await bookedBuild(monday, crewA.id, 1);
    const page = (await scheduleLoader(
      routeArgs(requestWithCookie(`/app/schedule?from=${monday}`, other.people.owner.cookie)),
    )) as { grid: { builds: unknown[] } };
    expect(page.grid.builds).toEqual([]);
    const [row] = await db
      .select()
      .from(builds)
      .where(and(eq(builds.companyId, company.id), eq(builds.firstDay, monday)));
    expect(row).toBeDefined();
  });
});
