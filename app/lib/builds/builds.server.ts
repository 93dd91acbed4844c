import { createHash, randomBytes } from "node:crypto";
import { and, asc, desc, eq, gte, inArray, lte } from "drizzle-orm";
import { BuildBookedEmail, BuildCancelledEmail, BuildCrewEmail, BuildReminderEmail } from "~/emails/build-emails";
import {
  buildCrew,
  builds,
  companies,
  consultBlockedDays,
  emailOutbox,
  leadEvents,
  leads,
  proposals,
  users,
  type Build,
  type Company,
  type Lead,
} from "~/db/schema";
import {
  addCalendarDays,
  buildDates,
  buildDaysNeeded,
  daysBetween,
  findClashes,
  isCalendarDate,
  type CalendarDate,
  type Clash,
  type WorkCalendar,
} from "~/domain/build-schedule";
import { buildCalendarFeed, buildCalendarFile, type BuildEvent } from "~/lib/builds/build-calendar";
import { readStoredPlan } from "~/lib/design/stored-plan";
import { zonedDay, zonedTimeToUtc } from "~/lib/format/zoned-time";
import { currentVersion } from "~/lib/leads/lead-workspace.server";
import { isFinishedJob, STATUS_LABEL } from "~/lib/leads/lead-status";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";

/*
 * Builds on the calendar: booked from the signed job's labour-hours and the company's crew day,
 * moved (by dragging or by a new start date), cancelled. Every change raises the build's SEQUENCE and
 * sends the homeowner and the crew the same calendar event, updated (app/lib/builds/build-calendar.ts);
 * a reminder goes to the homeowner the morning before the first day. Writes re-check the build's
 * state and sequence in the same transaction, so of two changes at once one wins and the other is told.
 */

/** Stages from which a job can be put on the calendar: signed (deposit paid) and on. */
const BOOKABLE_STAGES = ["signed", "stone-ordered", "build-booked"] as const;

export type BuildActor = { id: number; companyId: number };
export type BuildFailure = { ok: false; status: 400 | 404 | 409; errors: Record<string, string>; clashes?: string[] };
export type BuildResult = { ok: true; build: Build } | BuildFailure;

/** The company's week and days off (shared with consults), as the scheduling rules read them. */
export async function workCalendarFor(company: Company): Promise<WorkCalendar> {
  const days = await db
    .select({ day: consultBlockedDays.day })
    .from(consultBlockedDays)
    .where(eq(consultBlockedDays.companyId, company.id));
  return { workWeekdays: parseWorkWeekdays(company.workWeekdaysJson), daysOff: new Set(days.map((d) => d.day)) };
}

export function parseWorkWeekdays(json: string): number[] {
  try {
    const value: unknown = JSON.parse(json);
    if (Array.isArray(value)) return value.filter((d): d is number => Number.isInteger(d) && d >= 0 && d <= 6);
  } catch {
    // A damaged value falls back to Monday–Friday.
  }
  return [1, 2, 3, 4, 5];
}

/** Labour-hours of the job as signed (the signed proposal's plan), else of the current design. */
export async function jobLabourHours(lead: Lead): Promise<number> {
  const [signed] = await db
    .select({ designJson: proposals.designJson, planJson: proposals.planJson })
    .from(proposals)
    .where(
      and(
        eq(proposals.leadId, lead.id),
        eq(proposals.companyId, lead.companyId),
        eq(proposals.kind, "proposal"),
        eq(proposals.status, "signed"),
      ),
    )
    .orderBy(desc(proposals.id))
    .limit(1);
  if (signed) return readStoredPlan(signed).plan.labour.hours;
  return (await currentVersion(lead)).plan.labour.hours;
}

export function parseBuildDates(build: Pick<Build, "datesJson">): CalendarDate[] {
  const value: unknown = JSON.parse(build.datesJson);
  return Array.isArray(value) ? value.filter((d): d is string => typeof d === "string" && isCalendarDate(d)) : [];
}

/** "Friday, December 4; Monday, December 7; Tuesday, December 8". */
export function describeBuildDays(dates: readonly CalendarDate[]): string {
  const format = new Intl.DateTimeFormat("en-US", { weekday: "long", month: "long", day: "numeric", timeZone: "UTC" });
  return dates.map((d) => format.format(new Date(`${d}T12:00:00Z`))).join("; ");
}

export function describeClash(clash: Clash, names: ReadonlyMap<number, string>): string {
  const day = describeBuildDays([clash.date]);
  if (clash.kind === "day-off") return `${day} is a day off.`;
  if (clash.kind === "not-a-working-day") return `${day} is not a working day.`;
  return `${names.get(clash.userId) ?? "A crew member"} is on the ${clash.otherLabel} build on ${day}.`;
}

/** The company's booked builds overlapping the days from…to, with each one's crew and customer. */
export async function listBuilds(companyId: number, fromDay: CalendarDate, toDay: CalendarDate) {
  const rows = await db
    .select({ build: builds, customerName: leads.customerName, street: leads.street, town: leads.town })
    .from(builds)
    .innerJoin(leads, eq(leads.id, builds.leadId))
    .where(
      and(
        eq(builds.companyId, companyId),
        eq(builds.status, "booked"),
        lte(builds.firstDay, toDay),
        gte(builds.lastDay, fromDay),
      ),
    )
    .orderBy(asc(builds.firstDay));
  const crew = rows.length
    ? await db
        .select({ buildId: buildCrew.buildId, userId: users.id, name: users.name })
        .from(buildCrew)
        .innerJoin(users, eq(users.id, buildCrew.userId))
        .where(
          inArray(
            buildCrew.buildId,
            rows.map((r) => r.build.id),
          ),
        )
    : [];
  return rows.map((r) => ({
    ...r.build,
    dates: parseBuildDates(r.build),
    customerName: r.customerName,
    place: `${r.street}, ${r.town}`,
    crew: crew.filter((c) => c.buildId === r.build.id).map((c) => ({ id: c.userId, name: c.name })),
  }));
}

/** A booked build of the company with its job, or null (another company's build, a cancelled one, no such id). */
export async function findCompanyBuild(companyId: number, buildId: number) {
  const [row] = await db
    .select({ build: builds, lead: leads })
    .from(builds)
    .innerJoin(leads, eq(leads.id, builds.leadId))
    .where(and(eq(builds.id, buildId), eq(builds.companyId, companyId), eq(leads.companyId, companyId)))
    .limit(1);
  if (!row || row.build.status !== "booked") return null;
  return { build: { ...row.build, dates: parseBuildDates(row.build) }, lead: row.lead };
}

/** The job's booked build, if any. */
export async function findBookedBuild(lead: Lead) {
  const [build] = await db
    .select()
    .from(builds)
    .where(and(eq(builds.leadId, lead.id), eq(builds.companyId, lead.companyId), eq(builds.status, "booked")))
    .limit(1);
  if (!build) return null;
  const crew = await db
    .select({ id: users.id, name: users.name })
    .from(buildCrew)
    .innerJoin(users, eq(users.id, buildCrew.userId))
    .where(eq(buildCrew.buildId, build.id));
  return { ...build, dates: parseBuildDates(build), crew };
}

/** The booked build days of each of these leads, by lead (what a homeowner sees on /my). */
export async function bookedDaysByLead(leadIds: readonly number[]): Promise<Map<number, CalendarDate[]>> {
  if (leadIds.length === 0) return new Map();
  const rows = await db
    .select({ leadId: builds.leadId, datesJson: builds.datesJson })
    .from(builds)
    .where(and(inArray(builds.leadId, [...leadIds]), eq(builds.status, "booked")));
  return new Map(rows.map((row) => [row.leadId, parseBuildDates(row)]));
}

async function activeCrew(companyId: number, ids: readonly number[]) {
  if (ids.length === 0) return [];
  return db
    .select({ id: users.id, name: users.name, email: users.email })
    .from(users)
    .where(
      and(
        eq(users.companyId, companyId),
        inArray(users.id, [...ids]),
        eq(users.isActive, true),
        inArray(users.role, ["crew", "owner"]),
      ),
    );
}

/** Clashes of the proposed days with the company's other builds, its days off and its week. */
async function clashesFor(
  company: Company,
  calendar: WorkCalendar,
  buildId: number,
  dates: CalendarDate[],
  crewIds: number[],
  names: Map<number, string>,
): Promise<string[]> {
  const others = await listBuilds(company.id, dates[0]!, dates.at(-1)!);
  for (const other of others) for (const person of other.crew) names.set(person.id, person.name);
  const clashes = findClashes(
    { id: buildId, label: "this", crewUserIds: crewIds, dates },
    others
      .filter((o) => o.id !== buildId)
      .map((o) => ({ id: o.id, label: o.customerName, crewUserIds: o.crew.map((c) => c.id), dates: o.dates })),
    calendar,
  );
  return clashes.map((c) => describeClash(c, names));
}

function eventFor(
  build: { id: number; sequence: number },
  dates: CalendarDate[],
  company: Company,
  lead: Lead,
): BuildEvent {
  return {
    buildId: build.id,
    sequence: build.sequence,
    dates,
    title: `Fire pit build: ${lead.customerName}, ${lead.street}`,
    description: `${company.name} builds the fire pit at ${lead.street}, ${lead.town}.`,
    location: `${lead.street}, ${lead.town}`,
    organizer: { name: company.name, email: company.email },
  };
}

/** The outbox rows a change sends: the homeowner, each crew member, and the reminder the day before. */
async function buildMail(args: {
  kind: "booked" | "moved" | "cancelled";
  build: { id: number; sequence: number };
  dates: CalendarDate[];
  company: Company;
  lead: Lead;
  crew: { id: number; name: string; email: string }[];
  origin: string;
  reason?: string;
}) {
  const { kind, build, dates, company, lead } = args;
  const ics = buildCalendarFile(eventFor(build, dates, company, lead), kind === "cancelled" ? "cancelled" : "booked");
  const attachments = [
    {
      filename: kind === "cancelled" ? "fire-pit-build-cancelled.ics" : "fire-pit-build.ics",
      content: Buffer.from(ics).toString("base64"),
      contentType: `text/calendar; method=${kind === "cancelled" ? "CANCEL" : "REQUEST"}`,
    },
  ];
  const days = describeBuildDays(dates);
  const address = `${lead.street}, ${lead.town}`;
  const common = { companyName: company.name, days, address };
  const rows = [
    await prepareOutboxRow({
      idempotencyKey: `build-${kind}/${build.id}/${build.sequence}`,
      companyId: company.id,
      to: lead.email,
      subject:
        kind === "cancelled"
          ? `Build dates cancelled: ${company.name}`
          : `${kind === "moved" ? "New build dates" : "Your fire pit build"}: ${days}`,
      template:
        kind === "cancelled"
          ? BuildCancelledEmail({ ...common, recipientName: lead.customerName, reason: args.reason ?? "" })
          : BuildBookedEmail({ ...common, recipientName: lead.customerName, isMove: kind === "moved" }),
      attachments,
    }),
  ];
  for (const person of args.crew) {
    rows.push(
      await prepareOutboxRow({
        idempotencyKey: `build-crew-${kind}/${build.id}/${person.id}/${build.sequence}`,
        companyId: company.id,
        to: person.email,
        subject: `${kind === "cancelled" ? "Build cancelled" : kind === "moved" ? "Build moved" : "Build"}: ${lead.customerName}, ${days}`,
        template: BuildCrewEmail({
          ...common,
          recipientName: person.name,
          customerName: lead.customerName,
          kind,
          jobLink: `${args.origin}/app/leads/${lead.id}`,
        }),
        attachments,
      }),
    );
  }
  if (kind !== "cancelled") {
    // 8 in the morning, company time, the day before the first build day; never in the past.
    const [year, month, day] = dates[0]!.split("-").map(Number) as [number, number, number];
    const reminderAt = zonedTimeToUtc(year, month, day - 1, 8 * 60, company.timeZone);
    if (reminderAt.getTime() > Date.now()) {
      rows.push(
        await prepareOutboxRow({
          idempotencyKey: reminderKey(build.id, build.sequence),
          companyId: company.id,
          to: lead.email,
          subject: `Tomorrow: ${company.name} starts your fire pit`,
          template: BuildReminderEmail({ ...common, recipientName: lead.customerName }),
          sendAfter: reminderAt,
        }),
      );
    }
  }
  return rows;
}

/** The day-before reminder's outbox key: one per build and sequence, so a move queues a new one. */
const reminderKey = (buildId: number, sequence: number) => `build-reminder/${buildId}/${sequence}`;

/** Withdraws the reminders of every earlier sequence of the build that have not gone out yet. */
function withdrawEarlierReminders(
  tx: Pick<typeof db, "update">,
  companyId: number,
  build: { id: number; sequence: number },
) {
  const keys = Array.from({ length: build.sequence }, (_, s) => reminderKey(build.id, s));
  return tx
    .update(emailOutbox)
    .set({ status: "cancelled" })
    .where(
      and(
        eq(emailOutbox.companyId, companyId),
        inArray(emailOutbox.idempotencyKey, keys),
        eq(emailOutbox.status, "pending"),
      ),
    );
}

type BookInput = {
  start: CalendarDate;
  crewUserIds: number[];
  days: number | null;
  notes: string;
  allowClash: boolean;
  /** The moment "today" is taken from (the company's day); now when absent. */
  now?: Date;
};

/** How far ahead a build can be booked: a date years out is a typo (2062 for 2026), not a plan. */
export const BOOKING_DAYS_AHEAD = 730;

/** Works out the days and checks the crew; shared by booking and moving. */
async function prepareDays(
  company: Company,
  buildId: number,
  input: Omit<BookInput, "notes">,
  labourHours: number,
): Promise<BuildFailure | { ok: true; dates: CalendarDate[]; crew: { id: number; name: string; email: string }[] }> {
  const today = zonedDay(input.now ?? new Date(), company.timeZone);
  const tooFar = (): BuildFailure => ({
    ok: false as const,
    status: 400 as const,
    errors: {
      start: `Choose a first build day within two years, by ${describeBuildDays([addCalendarDays(today, BOOKING_DAYS_AHEAD)])}.`,
    },
  });
  const ahead = daysBetween(today, input.start);
  if (ahead < 0)
    return {
      ok: false as const,
      status: 400 as const,
      errors: { start: "Choose today or a later day as the first build day." },
    };
  if (ahead > BOOKING_DAYS_AHEAD) return tooFar();
  const calendar = await workCalendarFor(company);
  const crew = await activeCrew(company.id, input.crewUserIds);
  if (input.crewUserIds.length === 0 || crew.length !== new Set(input.crewUserIds).size) {
    return {
      ok: false as const,
      status: 400 as const,
      errors: { crewUserIds: "Choose one or more active crew members of your company." },
    };
  }
  const days =
    input.days ??
    buildDaysNeeded({ labourHours, crewSize: Math.max(crew.length, company.crewSize), dayHours: company.crewDayHours });
  let dates: CalendarDate[];
  try {
    dates = buildDates(input.start, days, calendar);
  } catch {
    return {
      ok: false as const,
      status: 400 as const,
      errors: { start: "No working day to start on: check the working weekdays and days off." },
    };
  }
  // Days off and non-working weekdays may push the first day past the window.
  if (daysBetween(today, dates[0]!) > BOOKING_DAYS_AHEAD) return tooFar();
  const names = new Map(crew.map((c) => [c.id, c.name]));
  const clashes = await clashesFor(
    company,
    calendar,
    buildId,
    dates,
    crew.map((c) => c.id),
    names,
  );
  if (clashes.length && !input.allowClash) {
    return {
      ok: false as const,
      status: 409 as const,
      errors: { start: "These days clash with other bookings. Choose other days, or tick “Book anyway”." },
      clashes,
    };
  }
  return { ok: true, dates, crew };
}

/** Books the job's build; the job moves to "build booked" and everyone gets the calendar event. */
export async function bookBuild(
  user: BuildActor,
  lead: Lead,
  company: Company,
  input: BookInput,
  origin: string,
): Promise<BuildResult> {
  if (!(BOOKABLE_STAGES as readonly string[]).includes(lead.status)) {
    return {
      ok: false,
      status: 400,
      errors: { start: "A build is booked once the job is signed and the deposit is paid." },
    };
  }
  if (await findBookedBuild(lead))
    return { ok: false, status: 409, errors: { start: "This job already has build dates: move them instead." } };
  const labourHours = await jobLabourHours(lead);
  const prepared = await prepareDays(company, 0, input, labourHours);
  if (!prepared.ok) return prepared;
  const { dates, crew } = prepared;
  const at = new Date().toISOString();
  try {
    const build = await writeTransaction(async (tx) => {
      const [row] = await tx
        .insert(builds)
        .values({
          companyId: company.id,
          leadId: lead.id,
          datesJson: JSON.stringify(dates),
          firstDay: dates[0]!,
          lastDay: dates.at(-1)!,
          labourHours,
          notes: input.notes,
          stageBefore: lead.status === "build-booked" ? "signed" : lead.status,
          bookedByUserId: user.id,
          createdAt: at,
          updatedAt: at,
        })
        .returning();
      await tx.insert(buildCrew).values(crew.map((c) => ({ buildId: row!.id, userId: c.id, companyId: company.id })));
      await tx
        .update(leads)
        .set({ status: "build-booked", crewUserId: lead.crewUserId ?? crew[0]!.id, updatedAt: at })
        .where(and(eq(leads.id, lead.id), eq(leads.companyId, company.id)));
      await tx.insert(leadEvents).values({
        companyId: company.id,
        leadId: lead.id,
        actorUserId: user.id,
        kind: "build-booked",
        detail: `Build booked for ${describeBuildDays(dates)} with ${crew.map((c) => c.name).join(", ")}. ${STATUS_LABEL[lead.status]} → ${STATUS_LABEL["build-booked"]}.`,
        createdAt: at,
      });
      const mail = await buildMail({ kind: "booked", build: row!, dates, company, lead, crew, origin });
      await tx.insert(emailOutbox).values(mail).onConflictDoNothing();
      return row!;
    });
    return { ok: true, build };
  } catch (error) {
    // The partial unique index: another booking for this job landed first.
    if (String((error as Error).message).includes("UNIQUE"))
      return {
        ok: false,
        status: 409,
        errors: { start: "This job was booked a moment ago. Reload to see its dates." },
      };
    throw error;
  }
}

/** Moves a booked build to new days (same crew unless given), raising its sequence; a stale sequence is a 409. */
export async function moveBuild(
  user: BuildActor,
  lead: Lead,
  company: Company,
  input: {
    buildId: number;
    sequence: number;
    start: CalendarDate;
    days: number | null;
    crewUserIds: number[] | null;
    allowClash: boolean;
    now?: Date;
  },
  origin: string,
): Promise<BuildResult> {
  const current = await findBookedBuild(lead);
  if (!current || current.id !== input.buildId)
    return { ok: false, status: 404, errors: { start: "That build was not found." } };
  if (isFinishedJob(lead)) return { ok: false, status: 409, errors: { start: FINISHED_BUILD_MESSAGE } };
  if (current.sequence !== input.sequence)
    return { ok: false, status: 409, errors: { start: "This build changed a moment ago. Reload to see its dates." } };
  const crewIds = input.crewUserIds ?? current.crew.map((c) => c.id);
  const prepared = await prepareDays(
    company,
    current.id,
    {
      start: input.start,
      crewUserIds: crewIds,
      days: input.days ?? current.dates.length,
      allowClash: input.allowClash,
      now: input.now,
    },
    current.labourHours,
  );
  if (!prepared.ok) return prepared;
  const { dates, crew } = prepared;
  const at = new Date().toISOString();
  const removed = current.crew.filter((c) => !crew.some((k) => k.id === c.id));
  const removedWithMail = await activeCrew(
    company.id,
    removed.map((c) => c.id),
  );
  // Rendered ahead (slow, local): the transaction holds only writes.
  const next = { id: current.id, sequence: current.sequence + 1 };
  const mail = await buildMail({ kind: "moved", build: next, dates, company, lead, crew, origin });
  if (removedWithMail.length)
    mail.push(
      ...(
        await buildMail({
          kind: "cancelled",
          build: next,
          dates: current.dates,
          company,
          lead,
          crew: removedWithMail,
          origin,
        })
      ).slice(1),
    );
  const build = await writeTransaction(async (tx) => {
    // A job marked built meanwhile keeps its build days: the check is made again inside the write.
    if (await isFinishedInWrite(tx, lead.id)) return "finished" as const;
    const [row] = await tx
      .update(builds)
      .set({
        datesJson: JSON.stringify(dates),
        firstDay: dates[0]!,
        lastDay: dates.at(-1)!,
        sequence: next.sequence,
        updatedAt: at,
      })
      .where(and(eq(builds.id, current.id), eq(builds.status, "booked"), eq(builds.sequence, input.sequence)))
      .returning();
    if (!row) return null;
    await tx.delete(buildCrew).where(eq(buildCrew.buildId, row.id));
    await tx.insert(buildCrew).values(crew.map((c) => ({ buildId: row.id, userId: c.id, companyId: company.id })));
    // The reminder for the old first day is withdrawn; the new one comes with the new sequence.
    await withdrawEarlierReminders(tx, company.id, row);
    await tx.insert(leadEvents).values({
      companyId: company.id,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "build-moved",
      detail: `Build moved from ${describeBuildDays(current.dates)} to ${describeBuildDays(dates)}.`,
      createdAt: at,
    });
    await tx.insert(emailOutbox).values(mail).onConflictDoNothing();
    return row;
  });
  if (build === "finished") return { ok: false, status: 409, errors: { start: FINISHED_BUILD_MESSAGE } };
  if (!build)
    return { ok: false, status: 409, errors: { start: "This build changed a moment ago. Reload to see its dates." } };
  return { ok: true, build };
}

/** Cancels a booked build: METHOD:CANCEL to everyone, the reminder withdrawn, the job back to its stage before. */
export async function cancelBuild(
  user: BuildActor,
  lead: Lead,
  company: Company,
  input: { buildId: number; sequence: number; reason: string },
  origin: string,
): Promise<BuildResult> {
  const current = await findBookedBuild(lead);
  if (!current || current.id !== input.buildId)
    return { ok: false, status: 404, errors: { reason: "That build was not found." } };
  if (isFinishedJob(lead)) return { ok: false, status: 409, errors: { reason: FINISHED_BUILD_MESSAGE } };
  const crew = await activeCrew(
    company.id,
    current.crew.map((c) => c.id),
  );
  const at = new Date().toISOString();
  // Rendered ahead (slow, local): the transaction holds only writes.
  const mail = await buildMail({
    kind: "cancelled",
    build: { id: current.id, sequence: current.sequence + 1 },
    dates: current.dates,
    company,
    lead,
    crew,
    origin,
    reason: input.reason,
  });
  const build = await writeTransaction(async (tx) => {
    // A job marked built meanwhile keeps its build days: the check is made again inside the write.
    if (await isFinishedInWrite(tx, lead.id)) return "finished" as const;
    const [row] = await tx
      .update(builds)
      .set({
        status: "cancelled",
        sequence: current.sequence + 1,
        cancelledAt: at,
        cancelReason: input.reason,
        updatedAt: at,
      })
      .where(and(eq(builds.id, current.id), eq(builds.status, "booked"), eq(builds.sequence, input.sequence)))
      .returning();
    if (!row) return null;
    await withdrawEarlierReminders(tx, company.id, row);
    await tx
      .update(leads)
      .set({ status: row.stageBefore, updatedAt: at })
      .where(and(eq(leads.id, lead.id), eq(leads.companyId, company.id), eq(leads.status, "build-booked")));
    await tx.insert(leadEvents).values({
      companyId: company.id,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "build-cancelled",
      detail: `Build of ${describeBuildDays(current.dates)} cancelled: ${input.reason}`,
      createdAt: at,
    });
    await tx.insert(emailOutbox).values(mail).onConflictDoNothing();
    return row;
  });
  if (build === "finished") return { ok: false, status: 409, errors: { reason: FINISHED_BUILD_MESSAGE } };
  if (!build)
    return { ok: false, status: 409, errors: { reason: "This build changed a moment ago. Reload to see it." } };
  return { ok: true, build };
}

/** Whether the job is built (or paid in full), read inside the write that would change its build. */
async function isFinishedInWrite(tx: Pick<typeof db, "select">, leadId: number): Promise<boolean> {
  const [stage] = await tx
    .select({ status: leads.status, pausedStage: leads.pausedStage })
    .from(leads)
    .where(eq(leads.id, leadId));
  return !stage || isFinishedJob(stage);
}

/** Why a finished job's build stays as it is. */
const FINISHED_BUILD_MESSAGE =
  "The job is built: its build days are a record of the work now, and can no longer be moved or cancelled.";

const hashToken = (token: string) => createHash("sha256").update(token).digest("hex");

/** A new private feed link for the person (any older link stops working); returns the secret once. */
export async function issueCalendarFeed(userId: number, companyId: number): Promise<string> {
  const token = randomBytes(24).toString("base64url");
  await db
    .update(users)
    .set({ calendarFeedTokenHash: hashToken(token) })
    .where(and(eq(users.id, userId), eq(users.companyId, companyId)));
  return token;
}

export async function revokeCalendarFeed(userId: number, companyId: number): Promise<void> {
  await db
    .update(users)
    .set({ calendarFeedTokenHash: null })
    .where(and(eq(users.id, userId), eq(users.companyId, companyId)));
}

export async function hasCalendarFeed(userId: number): Promise<boolean> {
  const [row] = await db.select({ hash: users.calendarFeedTokenHash }).from(users).where(eq(users.id, userId)).limit(1);
  return Boolean(row?.hash);
}

/**
 * The feed of a link's owner: their booked builds from 30 days back on; null for an unknown or revoked link or an
 * inactive person.
 */
export async function calendarFeedFor(token: string, now = new Date()): Promise<string | null> {
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) return null;
  const [person] = await db
    .select()
    .from(users)
    .where(and(eq(users.calendarFeedTokenHash, hashToken(token)), eq(users.isActive, true)))
    .limit(1);
  if (!person) return null;
  const [company] = await db.select().from(companies).where(eq(companies.id, person.companyId));
  const today = zonedDay(now, company!.timeZone);
  const rows = await db
    .select({ build: builds, lead: leads })
    .from(buildCrew)
    .innerJoin(builds, eq(builds.id, buildCrew.buildId))
    .innerJoin(leads, eq(leads.id, builds.leadId))
    .where(
      and(
        eq(buildCrew.userId, person.id),
        eq(builds.companyId, person.companyId),
        eq(builds.status, "booked"),
        gte(builds.lastDay, addCalendarDays(today, -30)),
      ),
    )
    .orderBy(asc(builds.firstDay));
  return buildCalendarFeed(
    rows.map((r) => eventFor(r.build, parseBuildDates(r.build), company!, r.lead)),
    `${person.name}: builds`,
  );
}
