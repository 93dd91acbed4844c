/*
 * The company's crew settings (people, hours a day, working weekdays) as the owner's settings page takes
 * them, and what bookings make of them. Build days = labour-hours ÷ (people × hours a day), rounded up:
 * common practice, no source (the same rule as app/domain/build-schedule.ts, checked here through the
 * pages, not by calling it). Weekday numbers are JavaScript's Date#getUTCDay (0 Sunday … 6 Saturday).
 */
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { companies, users, type Company } from "~/db/schema";
import { addCalendarDays, weekdayOf } from "~/domain/build-schedule";
import { bookBuild, jobLabourHours } from "~/lib/builds/builds.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { crewSettingsSchema } from "~/lib/settings/crew-schema";
import { db } from "~/lib/platform/db.server";
import { loader as buildLoader } from "~/routes/app-lead-build";
import { action as settingsAction, loader as settingsLoader } from "~/routes/app-settings";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";
import { copyDemoLead, officeUser } from "./support/proposals";

let company: Company;
let ownerCookie: string;

beforeAll(async () => {
  ({ company } = await demoCompany());
  ownerCookie = await loginAs(company.id, "owner");
});

type Answer = {
  init: { status: number } | null;
  data: { errors: Record<string, string>; crewErrors: Record<string, string> };
};

function postCrew(fields: Record<string, string | string[]>, cookie = ownerCookie) {
  const body = new URLSearchParams({ intent: "crew" });
  for (const [k, v] of Object.entries(fields)) for (const one of [v].flat()) body.append(k, one);
  return settingsAction(
    routeArgs(
      requestWithCookie("/app/settings", cookie, {
        method: "POST",
        body,
        headers: { "Content-Type": "application/x-www-form-urlencoded" },
      }),
    ),
  ) as Promise<Answer | Response>;
}

const crewColumns = async () => {
  const [row] = await db.select().from(companies).where(eq(companies.id, company.id));
  return {
    crewSize: row!.crewSize,
    crewDayHours: row!.crewDayHours,
    workWeekdaysJson: row!.workWeekdaysJson,
    name: row!.name,
  };
};

const WEEKDAYS = ["1", "2", "3", "4", "5"];

describe("the crew settings form", () => {
  test("the owner's page shows the stored values (the column defaults to start with)", async () => {
    const page = (await settingsLoader(routeArgs(requestWithCookie("/app/settings", ownerCookie)))) as {
      crew: { crewSize: number; crewDayHours: number; workWeekdays: number[] };
    };
    expect(page.crew).toEqual({ crewSize: 2, crewDayHours: 8, workWeekdays: [1, 2, 3, 4, 5] });
  });

  test("good values are saved together and the page says so", async () => {
    const answer = await postCrew({ crewSize: "3", crewDayHours: "9.5", workWeekdays: ["6", "1", "2", "1"] });
    expect(answer).toBeInstanceOf(Response);
    expect((answer as Response).headers.get("Location")).toBe("/app/settings?saved=crew");
    const after = await crewColumns();
    expect(after).toMatchObject({ crewSize: 3, crewDayHours: 9.5, workWeekdaysJson: "[1,2,6]" });
    await postCrew({ crewSize: "2", crewDayHours: "8", workWeekdays: WEEKDAYS });
    expect(await crewColumns()).toMatchObject({ crewSize: 2, crewDayHours: 8, workWeekdaysJson: "[1,2,3,4,5]" });
  });

  test.each([
    [{ crewSize: "0", crewDayHours: "8", workWeekdays: WEEKDAYS }, "crewSize", /between 1 and 12 people/],
    [{ crewSize: "13", crewDayHours: "8", workWeekdays: WEEKDAYS }, "crewSize", /between 1 and 12 people/],
    [{ crewSize: "2.5", crewDayHours: "8", workWeekdays: WEEKDAYS }, "crewSize", /whole number of people/],
    [{ crewSize: "two", crewDayHours: "8", workWeekdays: WEEKDAYS }, "crewSize", /must be a number/],
    [{ crewSize: "", crewDayHours: "8", workWeekdays: WEEKDAYS }, "crewSize", /Enter the crew size/],
    [{ crewSize: "2", crewDayHours: "3.75", workWeekdays: WEEKDAYS }, "crewDayHours", /between 4 and 12 hours/],
    [{ crewSize: "2", crewDayHours: "12.5", workWeekdays: WEEKDAYS }, "crewDayHours", /between 4 and 12 hours/],
    [{ crewSize: "2", crewDayHours: "8.3", workWeekdays: WEEKDAYS }, "crewDayHours", /quarter hours/],
    [{ crewSize: "2", crewDayHours: "8", workWeekdays: [] }, "workWeekdays", /at least one day/],
    [{ crewSize: "2", crewDayHours: "8", workWeekdays: ["7"] }, "workWeekdays", /at least one day/],
    [{ crewSize: "2", crewDayHours: "8", workWeekdays: ["1", "monday"] }, "workWeekdays", /at least one day/],
  ])("%o is refused with 400, the message beside %s, and nothing saved", async (fields, field, message) => {
    const before = await crewColumns();
    const answer = (await postCrew(fields)) as Answer;
    expect(answer.init?.status).toBe(400);
    expect(answer.data.crewErrors[field]).toMatch(message);
    expect(answer.data.errors).toEqual({});
    expect(await crewColumns()).toEqual(before);
  });

  test("one bad field among good ones saves none of them", async () => {
    const before = await crewColumns();
    const answer = (await postCrew({ crewSize: "5", crewDayHours: "10", workWeekdays: [] })) as Answer;
    expect(answer.init?.status).toBe(400);
    expect(Object.keys(answer.data.crewErrors)).toEqual(["workWeekdays"]);
    expect(await crewColumns()).toEqual(before);
  });

  test("estimators and crew cannot change it (403)", async () => {
    for (const role of ["estimator", "crew"] as const) {
      const cookie = await loginAs(company.id, role);
      await expect(postCrew({ crewSize: "9", crewDayHours: "8", workWeekdays: WEEKDAYS }, cookie)).rejects.toSatisfy(
        (r: unknown) => r instanceof Response && r.status === 403,
      );
    }
    expect((await crewColumns()).crewSize).toBe(2);
  });

  test("the schema alone: bounds are inclusive and weekdays come back sorted without repeats", () => {
    expect(crewSettingsSchema.parse({ crewSize: "1", crewDayHours: "4", workWeekdays: ["0"] })).toEqual({
      crewSize: 1,
      crewDayHours: 4,
      workWeekdays: [0],
    });
    expect(
      crewSettingsSchema.parse({ crewSize: "12", crewDayHours: "12", workWeekdays: ["5", "0", "5", "3"] }),
    ).toEqual({ crewSize: 12, crewDayHours: 12, workWeekdays: [0, 3, 5] });
  });
});

describe("bookings follow the crew settings", () => {
  test("a larger crew is suggested fewer build days for the same job", async () => {
    const lead = await copyDemoLead("demo-cinder-slate-07", "signed");
    const hours = await jobLabourHours(lead);
    // Enough hours that one person and four people need different numbers of days.
    expect(hours).toBeGreaterThan(8);
    const suggested = async () =>
      (
        (await buildLoader(
          routeArgs(requestWithCookie(`/app/leads/${lead.id}/build`, ownerCookie), { leadId: String(lead.id) }),
        )) as { suggestedDays: number; crewSize: number }
      ).suggestedDays;
    await postCrew({ crewSize: "1", crewDayHours: "8", workWeekdays: WEEKDAYS });
    const alone = await suggested();
    await postCrew({ crewSize: "4", crewDayHours: "8", workWeekdays: WEEKDAYS });
    const four = await suggested();
    await postCrew({ crewSize: "2", crewDayHours: "8", workWeekdays: WEEKDAYS });
    expect(alone).toBe(Math.ceil(hours / 8 - 1e-9));
    expect(four).toBe(Math.max(1, Math.ceil(hours / 32 - 1e-9)));
    expect(alone).toBeGreaterThan(four);
  });

  test("the crew day's hours count too, and a booking lays its days on the working weekdays only", async () => {
    const lead = await copyDemoLead("demo-cinder-slate-07", "signed");
    const hours = await jobLabourHours(lead);
    // A Monday a year ahead: clear of the seed's builds, inside the two years a build may be booked.
    let laterStart = addCalendarDays(new Date().toISOString().slice(0, 10), 365);
    while (weekdayOf(laterStart) !== 1) laterStart = addCalendarDays(laterStart, 1);
    await postCrew({ crewSize: "1", crewDayHours: "4", workWeekdays: ["2", "4"] });
    const page = (await buildLoader(
      routeArgs(requestWithCookie(`/app/leads/${lead.id}/build`, ownerCookie), { leadId: String(lead.id) }),
    )) as { suggestedDays: number };
    expect(page.suggestedDays).toBe(Math.ceil(hours / 4 - 1e-9));
    const [crew] = await db
      .insert(users)
      .values({ companyId: company.id, email: `tally.${Date.now()}@crew.example`, name: "Tally Test", role: "crew" })
      .returning();
    const result = await bookBuild(
      await officeUser(company.id, "owner"),
      lead,
      await getCompany(company.id),
      { start: laterStart, crewUserIds: [crew!.id], days: 3, notes: "", allowClash: false },
      "http://localhost",
    );
    await postCrew({ crewSize: "2", crewDayHours: "8", workWeekdays: WEEKDAYS });
    if (!result.ok) throw new Error(JSON.stringify(result));
    const dates = JSON.parse(result.build.datesJson) as string[];
    // Tuesdays and Thursdays only, from the start day on.
    expect(dates.map(weekdayOf)).toEqual([2, 4, 2]);
    expect(dates[0]! >= laterStart && dates[0]! <= addCalendarDays(laterStart, 6)).toBe(true);
  });
});
