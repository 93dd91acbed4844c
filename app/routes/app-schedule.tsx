import { data, Link, useFetcher, useNavigate, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/app-schedule";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { ConfirmAction } from "~/components/ui/confirm-action";
import { FormAlert } from "~/components/ui/field";
import { BuildCalendarGrid, type GridBuild, type GridDay } from "~/components/build-calendar-grid";
import { fieldErrors, formId } from "~/lib/format/form-fields";
import { cancelBooking, cancelRefusalStatus } from "~/lib/consults/booking.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { nextDay, startOfZonedDay, zonedDay } from "~/lib/format/zoned-time";
import { listConsultsBetween, listUpcomingConsults } from "~/lib/consults/schedule.server";
import {
  describeBuildDays,
  findCompanyBuild,
  listBuilds,
  moveBuild,
  parseBuildDates,
  workCalendarFor,
} from "~/lib/builds/builds.server";
import { addCalendarDays, isCalendarDate, isWorkingDay, weekdayOf } from "~/domain/build-schedule";
import { appOrigin } from "~/lib/platform/email.server";
import { formatMoney } from "~/lib/format/money";
import { requireUser } from "~/lib/auth/session.server";
import { possessive } from "~/lib/format/wording";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Schedule · Emberwright" }];

const SCHEDULE_ROLES = ["owner", "estimator"] as const;
/** Weeks the calendar grid shows at once; the arrows page by as many. */
const GRID_WEEKS = 4;

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: SCHEDULE_ROLES });
  const company = await getCompany(user.companyId);
  const rows = await listUpcomingConsults(user.companyId);
  const time = (iso: string) =>
    new Intl.DateTimeFormat("en-US", { timeZone: company.timeZone, hour: "numeric", minute: "2-digit" }).format(
      new Date(iso),
    );
  const days = new Map<string, typeof items>();
  const items = rows.map((r) => ({
    id: r.booking.id,
    leadId: r.leadId,
    day: zonedDay(new Date(r.booking.startsAt), company.timeZone),
    from: time(r.booking.startsAt),
    to: time(r.booking.endsAt),
    customerName: r.customerName,
    place: `${r.street}, ${r.town}`,
    isPaid: r.booking.isPaid,
    status: r.booking.status,
    fee: formatMoney(r.booking.amountCents),
  }));
  for (const item of items) days.set(item.day, [...(days.get(item.day) ?? []), item]);
  // Builds from today for the next three months, beside the consults (days off are shared).
  const today = zonedDay(new Date(), company.timeZone);
  const grid = await calendarGrid(user.companyId, company, today, new URL(request.url).searchParams.get("from"));
  const builds = (await listBuilds(user.companyId, today, addCalendarDays(today, 92))).map((b) => ({
    id: b.id,
    leadId: b.leadId,
    daysText: describeBuildDays(b.dates),
    dayCount: b.dates.length,
    customerName: b.customerName,
    place: b.place,
    crew: b.crew.map((c) => c.name).join(", "),
    sequence: b.sequence,
    firstDay: b.dates[0] ?? b.firstDay,
  }));
  return {
    today,
    grid,
    timeZone: company.timeZone,
    days: [...days.entries()].map(([day, list]) => ({ day, items: list })),
    builds,
    canEditHours: user.role === "owner",
    canBook: user.role === "owner",
  };
}

/** The grid's weeks from the Monday of `from` (or of today), with the builds and consults on them. */
async function calendarGrid(
  companyId: number,
  company: Awaited<ReturnType<typeof getCompany>>,
  today: string,
  from: string | null,
) {
  const anchor = from && isCalendarDate(from) && from >= "2000-01-01" && from <= "2199-12-31" ? from : today;
  const start = addCalendarDays(anchor, -((weekdayOf(anchor) + 6) % 7));
  const end = addCalendarDays(start, GRID_WEEKS * 7 - 1);
  const [calendar, builds, consults] = await Promise.all([
    workCalendarFor(company),
    listBuilds(companyId, start, end),
    listConsultsBetween(
      companyId,
      startOfZonedDay(start, company.timeZone),
      startOfZonedDay(nextDay(end), company.timeZone),
    ),
  ]);
  const month = new Intl.DateTimeFormat("en-US", { month: "short", timeZone: "UTC" });
  const long = new Intl.DateTimeFormat("en-US", { weekday: "long", month: "long", day: "numeric", timeZone: "UTC" });
  const weeks: GridDay[][] = [];
  for (let w = 0; w < GRID_WEEKS; w++) {
    const week: GridDay[] = [];
    for (let d = 0; d < 7; d++) {
      const day = addCalendarDays(start, w * 7 + d);
      const noon = new Date(`${day}T12:00:00Z`);
      const dayOfMonth = Number(day.slice(8));
      week.push({
        day,
        dayOfMonth,
        monthShort: dayOfMonth === 1 || (w === 0 && d === 0) ? month.format(noon) : null,
        longLabel: long.format(noon),
        isWorking: calendar.workWeekdays.includes(weekdayOf(day)),
        isDayOff: calendar.daysOff.has(day),
        isPast: day < today,
        isToday: day === today,
      });
    }
    weeks.push(week);
  }
  const time = (iso: string) =>
    new Intl.DateTimeFormat("en-US", { timeZone: company.timeZone, hour: "numeric", minute: "2-digit" }).format(
      new Date(iso),
    );
  return {
    start,
    end,
    previous: addCalendarDays(start, -GRID_WEEKS * 7),
    next: addCalendarDays(start, GRID_WEEKS * 7),
    rangeText: `${long.format(new Date(`${start}T12:00:00Z`))} to ${long.format(new Date(`${end}T12:00:00Z`))}`,
    weeks,
    builds: builds.map((b): GridBuild => ({
      id: b.id,
      leadId: b.leadId,
      sequence: b.sequence,
      customerName: b.customerName,
      dates: b.dates,
      crew: b.crew.map((c) => c.name).join(", "),
      isOver: b.lastDay < today,
    })),
    consults: consults.map((c) => ({
      id: c.booking.id,
      leadId: c.leadId,
      day: zonedDay(new Date(c.booking.startsAt), company.timeZone),
      from: time(c.booking.startsAt),
      customerName: c.customerName,
    })),
  };
}

const cancelSchema = z.object({ bookingId: formId("Choose a consult to cancel.") });

const SEQUENCE_MESSAGE = "Reload the schedule: the build's version is missing.";
const moveSchema = z.object({
  buildId: formId("Choose a build to move."),
  sequence: z
    .string({ error: SEQUENCE_MESSAGE })
    .trim()
    .regex(/^\d{1,9}$/, { error: SEQUENCE_MESSAGE })
    .transform(Number),
  start: z
    .string({ error: "Choose the new first day." })
    .trim()
    .refine(isCalendarDate, { error: "The new first day must be a date, like 2026-12-07." }),
});

type MoveOutcome = { buildId: number | null; ok: boolean; message: string; clashes: string[] };
const refuseMove = (status: 400 | 404 | 409, message: string, buildId: number | null = null, clashes: string[] = []) =>
  data({ error: null, done: false, move: { buildId, ok: false, message, clashes } satisfies MoveOutcome }, { status });

/**
 * A build dropped on another day of the grid (or given a day in its "Move to…" field): owners only, the
 * company's own booked builds only, a working day from today on, and the sequence the page was drawn
 * with, so a move made meanwhile elsewhere is refused (409) rather than overwritten.
 */
async function moveFromSchedule(request: Request, fields: Record<string, FormDataEntryValue>) {
  const user = await requireUser(request, { roles: ["owner"] });
  const parsed = moveSchema.safeParse(fields);
  if (!parsed.success) {
    const errors = fieldErrors(parsed.error);
    return refuseMove(400, errors.start ?? errors.buildId ?? Object.values(errors)[0]!);
  }
  const { buildId, sequence, start } = parsed.data;
  const found = await findCompanyBuild(user.companyId, buildId);
  if (!found) return refuseMove(404, "That build was not found: it may have been cancelled.", buildId);
  const company = await getCompany(user.companyId);
  const today = zonedDay(new Date(), company.timeZone);
  const name = found.lead.customerName;
  if (found.build.lastDay < today)
    return refuseMove(409, `${possessive(name)} build is over: its dates stay as they were.`, buildId);
  if (start < today) return refuseMove(400, "Choose today or a later day as the new first day.", buildId);
  const calendar = await workCalendarFor(company);
  if (!isWorkingDay(start, calendar)) {
    const why = calendar.daysOff.has(start) ? "a day off" : "not a working day";
    return refuseMove(409, `${describeBuildDays([start])} is ${why}: choose a working day.`, buildId);
  }
  const result = await moveBuild(
    user,
    found.lead,
    company,
    { buildId, sequence, start, days: null, crewUserIds: null, allowClash: false },
    appOrigin(request),
  );
  if (!result.ok) {
    const message =
      result.status === 409 && result.clashes?.length
        ? `${possessive(name)} build clashes on those days, so it stays where it was. Choose other days, or move it anyway from its build page.`
        : Object.values(result.errors)[0]!;
    return refuseMove(result.status, message, buildId, result.clashes ?? []);
  }
  const move: MoveOutcome = {
    buildId,
    ok: true,
    message: `${possessive(name)} build moved to ${describeBuildDays(parseBuildDates(result.build))}. The homeowner and crew are sent the updated calendar event.`,
    clashes: [],
  };
  return data({ error: null, done: false, move });
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: SCHEDULE_ROLES });
  const fields = await readTextFields(request);
  if (fields.intent === "move-build") return moveFromSchedule(request, fields);
  const parsed = cancelSchema.safeParse(fields);
  if (!parsed.success)
    return data({ error: parsed.error.issues[0]!.message, done: false, move: null }, { status: 400 });
  const cancelled = await cancelBooking({
    bookingId: parsed.data.bookingId,
    companyId: user.companyId,
    by: "staff",
    actorUserId: user.id,
  });
  if (!cancelled.ok)
    return data({ error: cancelled.message, done: false, move: null }, { status: cancelRefusalStatus(cancelled) });
  return data({ error: null, done: true, move: null });
}

export default function ScheduleRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { days, timeZone, canEditHours, builds, canBook, grid, today } = loaderData;
  const navigation = useNavigation();
  const navigate = useNavigate();
  const mover = useFetcher<typeof action>({ key: "move-build" });
  // Without JavaScript a "Move to…" form posts as a page; with it, through the fetcher.
  const move = mover.data?.move ?? actionData?.move ?? null;
  const isMoving = mover.state !== "idle";
  const movingBuildId = isMoving ? Number(mover.formData?.get("buildId")) || null : null;
  const movingName = [...grid.builds, ...builds].find((b) => b.id === movingBuildId)?.customerName;
  const submitMove = (build: GridBuild, day: string) => {
    void mover.submit(
      { intent: "move-build", buildId: String(build.id), sequence: String(build.sequence), start: day },
      { method: "post", action: "/app/schedule" },
    );
  };
  const chooseBuild = (build: GridBuild) => {
    const field = document.getElementById(`move-to-${build.id}`);
    if (field) {
      field.scrollIntoView({ block: "center" });
      field.focus();
    } else void navigate(`/app/leads/${build.leadId}/build`);
  };
  const dayLabel = (day: string) =>
    new Intl.DateTimeFormat("en-US", { weekday: "long", month: "long", day: "numeric", timeZone: "UTC" }).format(
      new Date(`${day}T12:00:00Z`),
    );
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-extrabold">Schedule</h1>
          <p className="text-char-600">Builds and booked design consults, in {timeZone.replace(/_/g, " ")} time.</p>
        </div>
        {canEditHours ? (
          <Link to="/app/consult-hours" className="btn-quiet">
            Consult hours
          </Link>
        ) : null}
      </div>
      {actionData?.error ? <FormAlert>{actionData.error}</FormAlert> : null}
      <div aria-live="polite" className="empty:hidden">
        {isMoving ? (
          <p className="rounded-lg bg-ash-100 px-4 py-3 text-sm font-semibold text-char-700">
            {movingName ? `Moving ${possessive(movingName)} build…` : "Moving the build…"}
          </p>
        ) : move?.ok ? (
          <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
            {move.message}
          </p>
        ) : move ? (
          <div
            role="alert"
            className="rounded-lg border border-alert-600/30 bg-alert-100 px-4 py-3 text-sm font-semibold text-alert-700"
          >
            <p>{move.message}</p>
            {move.clashes.length ? (
              <ul className="mt-1 list-disc pl-5 font-normal">
                {move.clashes.map((c) => (
                  <li key={c}>{c}</li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : null}
      </div>
      <section className="card" aria-labelledby="grid-heading">
        <div className="flex flex-wrap items-center justify-between gap-3 border-b border-ash-200 bg-ash-100 px-4 py-2">
          <div>
            <h2 id="grid-heading" className="font-extrabold">
              Calendar
            </h2>
            <p className="text-sm text-char-600">
              {canBook
                ? "Drag a build onto another day to make that its first day, or use its “Move to…” field below."
                : "Builds and consults by day. Owners move builds."}{" "}
              Hatched days take no builds.
            </p>
          </div>
          <nav aria-label="Calendar weeks" className="flex flex-wrap gap-2">
            <Link to={`?from=${grid.previous}`} className="btn-quiet" preventScrollReset>
              ← Earlier<span className="sr-only"> four weeks</span>
            </Link>
            {grid.start > today || grid.end < today ? (
              <Link to="?" className="btn-quiet" preventScrollReset>
                This week
              </Link>
            ) : null}
            <Link to={`?from=${grid.next}`} className="btn-quiet" preventScrollReset>
              Later<span className="sr-only"> four weeks</span> →
            </Link>
          </nav>
        </div>
        <p className="px-4 pt-2 text-sm font-semibold text-char-700">
          {grid.rangeText}
          <span className="font-normal text-char-600 md:hidden">
            {" "}
            · swipe the calendar sideways for the rest of the week
          </span>
        </p>
        <div className="p-2">
          <BuildCalendarGrid
            weeks={grid.weeks}
            builds={grid.builds}
            consults={grid.consults}
            canMove={canBook}
            movingBuildId={movingBuildId}
            caption={`Builds and consults, ${grid.rangeText}`}
            onMove={submitMove}
            onChoose={chooseBuild}
          />
        </div>
      </section>
      {actionData?.done ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          Consult cancelled; the fee is being refunded and both sides are e-mailed.
        </p>
      ) : null}
      <section className="overflow-hidden card" aria-labelledby="builds-heading">
        <h2 id="builds-heading" className="border-b border-ash-200 bg-ash-100 px-4 py-2 font-extrabold">
          Builds
        </h2>
        {builds.length === 0 ? (
          <p className="px-4 py-3 text-char-600">No builds booked in the next three months.</p>
        ) : null}
        <ul className="divide-y divide-ash-200">
          {builds.map((b) => (
            <li key={b.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
              <div className="min-w-0">
                <p className="font-extrabold">
                  <Link
                    to={`/app/leads/${b.leadId}`}
                    className="font-bold text-ember-700 underline underline-offset-2 hover:no-underline"
                  >
                    {b.customerName}
                  </Link>{" "}
                  · {b.dayCount} day{b.dayCount === 1 ? "" : "s"}
                </p>
                <p className="text-sm break-words text-char-700">{b.daysText}</p>
                <p className="text-sm text-char-600">
                  {b.place} · crew: {b.crew || "none"}
                </p>
              </div>
              {canBook ? (
                <div className="flex flex-wrap items-end gap-2">
                  <mover.Form method="post" action="/app/schedule" className="flex items-end gap-2">
                    <input type="hidden" name="intent" value="move-build" />
                    <input type="hidden" name="buildId" value={b.id} />
                    <input type="hidden" name="sequence" value={b.sequence} />
                    <div>
                      <label htmlFor={`move-to-${b.id}`} className="field-label">
                        Move to…<span className="sr-only"> start day for {b.customerName}</span>
                      </label>
                      <input
                        key={`${b.id}-${b.sequence}`}
                        id={`move-to-${b.id}`}
                        name="start"
                        type="date"
                        min={today}
                        defaultValue={b.firstDay}
                        required
                        className="field-input"
                      />
                    </div>
                    <button type="submit" className="btn-quiet" disabled={isMoving}>
                      Move<span className="sr-only"> {possessive(b.customerName)} build</span>
                    </button>
                  </mover.Form>
                  <Link to={`/app/leads/${b.leadId}/build`} className="btn-quiet">
                    Change dates<span className="sr-only"> of {b.customerName}</span>
                  </Link>
                </div>
              ) : null}
            </li>
          ))}
        </ul>
      </section>
      <h2 className="text-lg font-extrabold">Design consults</h2>
      {days.length === 0 ? <p className="card p-6 text-char-600">No consults booked yet.</p> : null}
      {days.map(({ day, items }) => (
        <section key={day} className="overflow-hidden card" aria-labelledby={`day-${day}`}>
          <h3 id={`day-${day}`} className="border-b border-ash-200 bg-ash-100 px-4 py-2 font-extrabold">
            <time dateTime={day}>{dayLabel(day)}</time>
          </h3>
          <ul className="divide-y divide-ash-200">
            {items.map((item) => (
              <li key={item.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
                <div>
                  <p className="font-extrabold tabular-nums">
                    {item.from} – {item.to}{" "}
                    <Link
                      to={`/app/leads/${item.leadId}`}
                      className="font-bold text-ember-700 underline underline-offset-2 hover:no-underline"
                    >
                      {item.customerName}
                    </Link>
                  </p>
                  <p className="text-sm text-char-600">
                    {item.place} · {item.status === "confirmed" ? `paid ${item.fee}` : "payment in progress"}
                  </p>
                </div>
                {item.status === "confirmed" ? (
                  <ConfirmAction
                    label="Cancel and refund"
                    accessibleLabel={`Cancel and refund the consult with ${item.customerName}`}
                    question={`Cancel ${possessive(item.customerName)} consult, ${item.from} on ${dayLabel(day)}? The fee of ${item.fee} is refunded in full and ${item.customerName} is e-mailed.`}
                    confirmLabel="Yes, cancel and refund"
                    disabled={navigation.state === "submitting"}
                  >
                    <input type="hidden" name="bookingId" value={item.id} />
                  </ConfirmAction>
                ) : null}
              </li>
            ))}
          </ul>
        </section>
      ))}
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
