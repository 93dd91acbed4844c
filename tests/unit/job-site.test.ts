/*
 * The crew's job on site: who may open it (OWASP ASVS 4.0.3 V4.2.1: records of another company or
 * of another crew answer 404), the checklist's sync (each change once, the latest by the phone's
 * clock wins whatever order the changes arrive in), hours (a quarter hour to 16 h in quarter hours,
 * per person per day), extra material and "built" with its photos.
 */
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { jobExtras, jobHours, jobStepTicks, leadEvents, leadPhotos, leads, users } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { startSession } from "~/lib/auth/session.server";
import { findLeadFor } from "~/lib/auth/staff.server";
import { hoursSchema } from "~/lib/builds/job-site-schema";
import { markBuiltWithPhotos } from "~/lib/builds/job-site.server";
import { storePhotoBytes } from "~/lib/platform/uploads.server";
import { findPhotoFor } from "~/lib/leads/leads.server";
import { listWonJobs, orderCrewJobs } from "~/lib/leads/won-jobs.server";
import { zonedDay } from "~/lib/format/zoned-time";
import { action as jobAction, loader as jobLoader } from "~/routes/app-job";
import { action as ticksAction } from "~/routes/app-job-ticks";
import { action as photosAction } from "~/routes/app-job-photos";
import { loader as jobsLoader } from "~/routes/app-jobs";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { TINY_PNG } from "./support/images";
import { loginAs } from "./support/login";

const people = { crew: "", otherCrew: "", owner: "", estimator: "", otherOwner: "" };
const ids = { booked: 0, built: 0, fresh: 0, crew: 0, otherCrew: 0, companyId: 0 };
let today = "";

beforeAll(async () => {
  const { company } = await demoCompany();
  const other = await demoCompany("north-ridge");
  ids.companyId = company.id;
  today = zonedDay(new Date(), company.timeZone);
  people.crew = await loginAs(company.id, "crew");
  people.owner = await loginAs(company.id, "owner");
  people.estimator = await loginAs(company.id, "estimator");
  people.otherOwner = await loginAs(other.company.id, "owner");
  const [crewUser] = await db.select().from(users).where(eq(users.email, "crew@cinder-slate.test"));
  ids.crew = crewUser!.id;
  // A second crew member of the same company, on no build.
  const [otherCrew] = await db
    .insert(users)
    .values({ companyId: company.id, email: "ilka.crew@cinder-slate.test", name: "Ilka Brandt", role: "crew" })
    .returning();
  ids.otherCrew = otherCrew!.id;
  people.otherCrew = (await startSession(otherCrew!.id)).split(";")[0]!;
  const byName = async (name: string) =>
    (
      await db
        .select()
        .from(leads)
        .where(and(eq(leads.companyId, company.id), eq(leads.customerName, name)))
    )[0]!;
  // The seed books Sunniva Okoro's build with the demo crew member on it, but gives the job to nobody.
  const booked = await byName("Sunniva Okoro");
  expect(booked.crewUserId).toBeNull();
  ids.booked = booked.id;
  ids.built = (await byName("Perpetua Vance")).id;
  ids.fresh = (await byName("Wendell Ashgrove")).id;
});

const get = (url: string, cookie: string) => requestWithCookie(url, cookie);
const postForm = (url: string, cookie: string, fields: Record<string, string>) => {
  const body = new URLSearchParams(fields);
  return requestWithCookie(url, cookie, {
    method: "POST",
    body,
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
  });
};
const postJson = (url: string, cookie: string, value: unknown) =>
  requestWithCookie(url, cookie, {
    method: "POST",
    body: typeof value === "string" ? value : JSON.stringify(value),
    headers: { "Content-Type": "application/json" },
  });

async function status(run: () => Promise<unknown>): Promise<number> {
  try {
    const value = await run();
    if (value instanceof Response) return value.status;
    if (value && typeof value === "object" && "init" in value)
      return (value as { init?: { status?: number } }).init?.status ?? 200;
    return 200;
  } catch (thrown) {
    if (thrown instanceof Response) return thrown.status;
    if (thrown && typeof thrown === "object" && "init" in thrown)
      return (thrown as { init: { status: number } }).init.status;
    throw thrown;
  }
}

const openJob = (leadId: number, cookie: string) =>
  jobLoader(routeArgs(get(`/app/jobs/${leadId}`, cookie), { leadId: String(leadId) }));

async function sync(leadId: number, cookie: string, changes: unknown) {
  let response: Response;
  try {
    response = (await ticksAction(
      routeArgs(postJson(`/app/jobs/${leadId}/ticks`, cookie, { changes }), { leadId: String(leadId) }),
    )) as Response;
  } catch (thrown) {
    // The API guard throws its 401/403 JSON answer.
    if (!(thrown instanceof Response)) throw thrown;
    response = thrown;
  }
  return { status: response.status, body: (await response.json()) as Record<string, unknown> };
}

describe("who sees the job", () => {
  test("a crew member on the booked build sees the job though it was never given to them: list, page, photos", async () => {
    const crewUser = { id: ids.crew, role: "crew" as const, companyId: ids.companyId, sessionId: "t" };
    expect((await findLeadFor({ ...crewUser, email: "", name: "" } as never, ids.booked))?.id).toBe(ids.booked);
    const listed = await listWonJobs(crewUser);
    expect(listed.map((j) => j.lead.id)).toContain(ids.booked);
    expect(await status(() => openJob(ids.booked, people.crew))).toBe(200);
    const [photo] = await db
      .insert(leadPhotos)
      .values({
        companyId: ids.companyId,
        leadId: ids.booked,
        storedName: `${randomUUID()}.png`,
        originalName: "spot.png",
        mimeType: "image/png",
        sizeBytes: 10,
        source: "site-visit",
      })
      .returning();
    expect(await findPhotoFor(crewUser, photo!.id)).not.toBeNull();
    expect(await findPhotoFor({ id: ids.otherCrew, role: "crew", companyId: ids.companyId }, photo!.id)).toBeNull();
  });

  test("a crew member not on the build, another company's owner, and a request not yet signed: 404", async () => {
    expect(await status(() => openJob(ids.booked, people.otherCrew))).toBe(404);
    expect(await status(() => openJob(ids.booked, people.otherOwner))).toBe(404);
    expect(await status(() => openJob(ids.fresh, people.owner))).toBe(404);
    expect(await status(() => openJob(ids.fresh, people.crew))).toBe(404);
    const change = { clientId: randomUUID(), stepKey: "dig-base", done: true, changedAt: new Date().toISOString() };
    expect((await sync(ids.booked, people.otherCrew, [change])).status).toBe(404);
    expect((await sync(ids.booked, people.otherOwner, [change])).status).toBe(404);
    expect(
      await status(() =>
        jobAction(
          routeArgs(
            postForm(`/app/jobs/${ids.booked}`, people.otherCrew, {
              intent: "hours",
              workerUserId: String(ids.otherCrew),
              day: today,
              hours: "8",
            }),
            { leadId: String(ids.booked) },
          ),
        ),
      ),
    ).toBe(404);
    const list = (await jobsLoader(routeArgs(get("/app/jobs", people.otherCrew)))) as { jobs: unknown[] };
    expect(list.jobs).toEqual([]);
    // Nothing was recorded by any of them.
    expect(await db.select().from(jobStepTicks).where(eq(jobStepTicks.leadId, ids.booked))).toEqual([]);
  });

  test("the estimator reads the page but records nothing (403); the crew's page carries no money", async () => {
    expect(await status(() => openJob(ids.booked, people.estimator))).toBe(200);
    expect((await sync(ids.booked, people.estimator, [])).status).toBe(403);
    const view = await openJob(ids.built, people.crew);
    expect(JSON.stringify(view)).not.toMatch(/Cents|\$\s?\d|"cost"/);
  });

  test("crew see their jobs by the next build day, undated ones after, past ones last (latest first)", () => {
    const jobs = [
      { id: "past-early", buildDays: ["2026-10-01"] },
      { id: "undated", buildDays: [] },
      { id: "later", buildDays: ["2026-12-20", "2026-12-21"] },
      { id: "past-late", buildDays: ["2026-11-02"] },
      // Started yesterday, still going tomorrow: its next day is tomorrow.
      { id: "running", buildDays: ["2026-12-01", "2026-12-03"] },
    ];
    expect(orderCrewJobs(jobs, "2026-12-02").map((j) => j.id)).toEqual([
      "running",
      "later",
      "undated",
      "past-late",
      "past-early",
    ]);
  });
});

// The phone's clock as the server sees it: changes from over a year back or from the future are refused.
const minutesAgo = (minutes: number) => new Date(Date.now() - minutes * 60_000).toISOString();

describe("the checklist's sync", () => {
  test("each clientId is kept once; the latest change by the phone's clock wins in whatever order they arrive", async () => {
    const first = { clientId: randomUUID(), stepKey: "course-1", done: true, changedAt: minutesAgo(30) };
    const later = { clientId: randomUUID(), stepKey: "course-1", done: false, changedAt: minutesAgo(25) };
    // The later change arrives first (its phone had signal), the earlier one after, and then again.
    const a = await sync(ids.booked, people.crew, [later]);
    expect(a.status).toBe(200);
    expect(a.body.applied).toEqual([later.clientId]);
    const b = await sync(ids.booked, people.crew, [first]);
    expect(b.body.superseded).toEqual([first.clientId]);
    const c = await sync(ids.booked, people.crew, [later, first]);
    expect(c.body.applied).toEqual([later.clientId]);
    const rows = await db
      .select()
      .from(jobStepTicks)
      .where(and(eq(jobStepTicks.leadId, ids.booked), eq(jobStepTicks.stepKey, "course-1")));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ done: false, clientId: later.clientId, changedAt: later.changedAt });
    expect((c.body.ticks as Record<string, { done: boolean }>)["course-1"]!.done).toBe(false);
  });

  test("a batch with two changes of one step ends on the later; a resent batch writes no second event", async () => {
    const on = { clientId: randomUUID(), stepKey: "dig-base", done: true, changedAt: minutesAgo(20) };
    const off = { clientId: randomUUID(), stepKey: "dig-base", done: false, changedAt: minutesAgo(19) };
    const on2 = { clientId: randomUUID(), stepKey: "dig-base", done: true, changedAt: minutesAgo(18) };
    const eventsBefore = await db
      .select()
      .from(leadEvents)
      .where(and(eq(leadEvents.leadId, ids.booked), eq(leadEvents.kind, "build-step")));
    // Sent in the wrong order: the phone's clock decides.
    const first = await sync(ids.booked, people.crew, [on2, off, on]);
    expect((first.body.ticks as Record<string, { done: boolean }>)["dig-base"]!.done).toBe(true);
    await sync(ids.booked, people.crew, [on2, off, on]);
    const events = await db
      .select()
      .from(leadEvents)
      .where(and(eq(leadEvents.leadId, ids.booked), eq(leadEvents.kind, "build-step")));
    // Three changes of state (done, not done, done), once each, whatever was resent.
    const added = events.slice(eventsBefore.length).map((e) => e.detail);
    expect(added).toEqual([
      "Done: Dig and lay the base.",
      "Not done after all: Dig and lay the base.",
      "Done: Dig and lay the base.",
    ]);
  });

  test("a step the job does not have is refused by name; a malformed body is a 400 naming the field", async () => {
    const stray = { clientId: randomUUID(), stepKey: "course-9", done: true, changedAt: new Date().toISOString() };
    const answer = await sync(ids.booked, people.crew, [stray]);
    expect(answer.status).toBe(200);
    expect(answer.body.refused).toEqual([{ clientId: stray.clientId, message: 'This job has no step "course-9".' }]);
    const bad = await sync(ids.booked, people.crew, [{ ...stray, clientId: "not-a-uuid" }]);
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body)).toContain("UUID");
    const notJson = (await ticksAction(
      routeArgs(postJson(`/app/jobs/${ids.booked}/ticks`, people.crew, "{oops"), { leadId: String(ids.booked) }),
    )) as Response;
    expect(notJson.status).toBe(400);
  });
});

describe("hours", () => {
  // Quarter hours from 0.25 to 16 (a double shift): the limits of the form.
  test.each([
    ["0.25", 0.25],
    ["7.5", 7.5],
    ["8,25", 8.25],
    ["16", 16],
  ])("%s hours are taken", (typed, hours) => {
    const parsed = hoursSchema.safeParse({ workerUserId: "3", day: "2026-12-01", hours: typed });
    expect(parsed.success && parsed.data.hours).toBe(hours);
  });

  test.each(["0", "0.2", "7.3", "16.25", "-1", "eight", ""])("“%s” hours are refused, naming the field", (typed) => {
    const parsed = hoursSchema.safeParse({ workerUserId: "3", day: "2026-12-01", hours: typed });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0]!.path).toEqual(["hours"]);
    expect(parsed.error!.issues[0]!.message).toMatch(/hours/i);
  });

  test("a day that is not a date (2026-02-30) is refused", () => {
    const parsed = hoursSchema.safeParse({ workerUserId: "3", day: "2026-02-30", hours: "8" });
    expect(parsed.error!.issues[0]!.path).toEqual(["day"]);
  });

  const postHours = (cookie: string, fields: Record<string, string>) =>
    jobAction(
      routeArgs(postForm(`/app/jobs/${ids.booked}`, cookie, { intent: "hours", ...fields }), {
        leadId: String(ids.booked),
      }),
    );

  test("hours for someone on the build's crew are saved, and a second entry for that day replaces the first", async () => {
    const saved = (await postHours(people.crew, {
      workerUserId: String(ids.crew),
      day: today,
      hours: "6.5",
      clientId: randomUUID(),
    })) as Response;
    expect(saved.status).toBe(302);
    await postHours(people.owner, { workerUserId: String(ids.crew), day: today, hours: "7.75" });
    const rows = await db
      .select()
      .from(jobHours)
      .where(and(eq(jobHours.leadId, ids.booked), eq(jobHours.workerUserId, ids.crew)));
    expect(rows.map((r) => [r.day, r.hours])).toEqual([[today, 7.75]]);
    const [event] = await db
      .select()
      .from(leadEvents)
      .where(and(eq(leadEvents.leadId, ids.booked), eq(leadEvents.kind, "build-hours")))
      .orderBy(leadEvents.id)
      .limit(1)
      .offset(1);
    expect(event!.detail).toMatch(/^Hours: Dario Quist worked 7.75 h on .+ \(was 6.5 h\)\.$/);
  });

  test("someone not on the crew, a day after today and bad hours: 400 with the message beside the field, nothing saved", async () => {
    const before = await db.select().from(jobHours).where(eq(jobHours.leadId, ids.booked));
    const notCrew = (await postHours(people.crew, {
      workerUserId: String(ids.otherCrew),
      day: today,
      hours: "8",
    })) as { data: { errors: Record<string, string> }; init: { status: number } };
    expect(notCrew.init.status).toBe(400);
    expect(notCrew.data.errors.workerUserId).toBe("Choose someone on this job's crew.");
    const future = (await postHours(people.crew, {
      workerUserId: String(ids.crew),
      day: "2099-01-04",
      hours: "8",
    })) as { data: { errors: Record<string, string> }; init: { status: number } };
    expect(future.init.status).toBe(400);
    expect(future.data.errors.day).toMatch(/^Day must be today/);
    const odd = (await postHours(people.crew, { workerUserId: String(ids.crew), day: today, hours: "7.1" })) as {
      data: { errors: Record<string, string> };
      init: { status: number };
    };
    expect(odd.init.status).toBe(400);
    expect(odd.data.errors.hours).toMatch(/quarter hours/);
    expect(await db.select().from(jobHours).where(eq(jobHours.leadId, ids.booked))).toEqual(before);
  });
});

describe("extra material", () => {
  const postExtra = (fields: Record<string, string>) =>
    jobAction(
      routeArgs(postForm(`/app/jobs/${ids.booked}`, people.crew, { intent: "extra", ...fields }), {
        leadId: String(ids.booked),
      }),
    );

  test("a catalog item is costed at its price × quantity; the same form posted twice is kept once", async () => {
    const { byName } = await demoCompany();
    const cap = byName("Sill Cap 16");
    const clientId = randomUUID();
    for (let i = 0; i < 2; i += 1)
      expect(((await postExtra({ catalogItemId: String(cap.id), quantity: "2", clientId })) as Response).status).toBe(
        302,
      );
    const rows = await db.select().from(jobExtras).where(eq(jobExtras.clientId, clientId));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ description: "Sill Cap 16", quantity: 2, costCents: cap.priceCents * 2 });
  });

  test("something else needs what it was and its cost; another company's catalog item is refused", async () => {
    const missing = (await postExtra({ catalogItemId: "", quantity: "1", description: "", cost: "" })) as {
      data: { errors: Record<string, string> };
      init: { status: number };
    };
    expect(missing.init.status).toBe(400);
    expect(missing.data.errors.description).toMatch(/Say what was used/);
    expect(missing.data.errors.cost).toMatch(/Cost must be an amount in dollars/);
    const other = await demoCompany("north-ridge");
    const foreign = (await postExtra({ catalogItemId: String(other.catalog[0]!.id), quantity: "1" })) as {
      data: { errors: Record<string, string> };
      init: { status: number };
    };
    expect(foreign.init.status).toBe(400);
    expect(foreign.data.errors.catalogItemId).toBe("Choose an item from the list.");
    const bag = (await postExtra({ description: "Bag of base gravel", quantity: "3", cost: "$21.75" })) as Response;
    expect(bag.status).toBe(302);
  });
});

describe("built", () => {
  async function postPhotos(leadId: number, cookie: string, intent: string, photos: Uint8Array<ArrayBuffer>[]) {
    const form = new FormData();
    form.set("intent", intent);
    for (const bytes of photos) form.append("photos", new File([bytes], "done.png", { type: "image/png" }));
    const body = new Response(form);
    const bytes = await body.arrayBuffer();
    const request = requestWithCookie(`/app/jobs/${leadId}/photos`, cookie, {
      method: "POST",
      body: bytes,
      headers: { "Content-Type": body.headers.get("Content-Type")!, "Content-Length": String(bytes.byteLength) },
    });
    const result = await photosAction(routeArgs(request, { leadId: String(leadId) }));
    return result instanceof Response
      ? { status: result.status, errors: {} as Record<string, string>, location: result.headers.get("Location") }
      : {
          status: (result as { init: { status: number } }).init.status,
          errors: (result as { data: { errors: Record<string, string> } }).data.errors,
          location: null,
        };
  }

  test("built needs a photo; with one it is saved as a final photo and the job moves to built", async () => {
    const none = await postPhotos(ids.booked, people.crew, "built", []);
    expect(none.status).toBe(400);
    expect(none.errors.photos).toMatch(/at least one photo/);
    expect((await db.select().from(leads).where(eq(leads.id, ids.booked)))[0]!.status).toBe("build-booked");

    const progress = await postPhotos(ids.booked, people.crew, "progress", [TINY_PNG]);
    expect(progress.status).toBe(302);
    const done = await postPhotos(ids.booked, people.crew, "built", [TINY_PNG]);
    expect(done).toMatchObject({ status: 302, location: `/app/jobs/${ids.booked}?saved=built#built` });
    expect((await db.select().from(leads).where(eq(leads.id, ids.booked)))[0]!.status).toBe("built");
    const sources = (await db.select().from(leadPhotos).where(eq(leadPhotos.leadId, ids.booked))).map((p) => p.source);
    expect(sources).toContain("progress");
    expect(sources).toContain("final");
    // A second "built" is refused and keeps no photo.
    const count = sources.length;
    const again = await postPhotos(ids.booked, people.crew, "built", [TINY_PNG]);
    expect(again.status).toBe(409);
    expect(await db.select().from(leadPhotos).where(eq(leadPhotos.leadId, ids.booked))).toHaveLength(count);

    // A "built" that read the job before it was marked built (two phones at once) gets past the first
    // check, saves its photos, then loses: its photos and its timeline line are both taken back.
    const finalLines = async () =>
      (
        await db
          .select()
          .from(leadEvents)
          .where(and(eq(leadEvents.leadId, ids.booked), eq(leadEvents.kind, "build-final-photos")))
      ).length;
    const linesBefore = await finalLines();
    const [lead] = await db.select().from(leads).where(eq(leads.id, ids.booked));
    const [crewUser] = await db.select().from(users).where(eq(users.email, "crew@cinder-slate.test"));
    const late = await markBuiltWithPhotos({ ...crewUser!, sessionId: "late" }, { ...lead!, status: "build-booked" }, [
      await storePhotoBytes(TINY_PNG, "late.png"),
    ]);
    expect(late).toMatchObject({ ok: false, status: 409 });
    expect(await db.select().from(leadPhotos).where(eq(leadPhotos.leadId, ids.booked))).toHaveLength(count);
    expect(await finalLines()).toBe(linesBefore);
  });

  test("a file that is not a picture is refused beside the photo field", async () => {
    const text = new TextEncoder().encode("<html><script>alert(1)</script></html>") as Uint8Array<ArrayBuffer>;
    const refused = await postPhotos(ids.built, people.crew, "progress", [text]);
    expect(refused.status).toBe(400);
    expect(refused.errors.photos).toMatch(/not a JPEG, PNG or WebP/);
  });
});

test("build photos and the site visit's photos may be as large as a request's; the job page's other forms stay small", async () => {
  const { bodyLimitFor, LEAD_FORM_LIMIT, WORKSPACE_FORM_LIMIT } = await import("~/lib/platform/body-limits.server");
  expect(bodyLimitFor("/app/jobs/12/photos").bytes).toBe(LEAD_FORM_LIMIT);
  expect(bodyLimitFor("/app/jobs/12/photos.data").bytes).toBe(LEAD_FORM_LIMIT);
  expect(bodyLimitFor("/app/leads/12/visit").bytes).toBe(LEAD_FORM_LIMIT);
  expect(bodyLimitFor("/app/jobs/12").bytes).toBe(WORKSPACE_FORM_LIMIT);
  expect(bodyLimitFor("/app/jobs/12/ticks").bytes).toBe(WORKSPACE_FORM_LIMIT);
});
