import { data, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/app-schedule";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { ConfirmAction } from "~/components/ui/confirm-action";
import { FormAlert } from "~/components/ui/field";
import { formId } from "~/lib/format/form-fields";
import { cancelBooking, cancelRefusalStatus } from "~/lib/consults/booking.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { zonedDay } from "~/lib/format/zoned-time";
import { listUpcomingConsults } from "~/lib/consults/schedule.server";
import { describeBuildDays, listBuilds } from "~/lib/builds/builds.server";
import { addCalendarDays } from "~/domain/build-schedule";
import { formatMoney } from "~/lib/format/money";
import { requireUser } from "~/lib/auth/session.server";
import { possessive } from "~/lib/format/wording";

export const meta: Route.MetaFunction = () => [{ title: "Schedule · Emberwright" }];

const SCHEDULE_ROLES = ["owner", "estimator"] as const;

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
  const builds = (await listBuilds(user.companyId, today, addCalendarDays(today, 92))).map((b) => ({
    id: b.id,
    leadId: b.leadId,
    daysText: describeBuildDays(b.dates),
    dayCount: b.dates.length,
    customerName: b.customerName,
    place: b.place,
    crew: b.crew.map((c) => c.name).join(", "),
  }));
  return {
    timeZone: company.timeZone,
    days: [...days.entries()].map(([day, list]) => ({ day, items: list })),
    builds,
    canEditHours: user.role === "owner",
    canBook: user.role === "owner",
  };
}

const cancelSchema = z.object({ bookingId: formId("Choose a consult to cancel.") });

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: SCHEDULE_ROLES });
  const parsed = cancelSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ error: parsed.error.issues[0]!.message, done: false }, { status: 400 });
  const cancelled = await cancelBooking({
    bookingId: parsed.data.bookingId,
    companyId: user.companyId,
    by: "staff",
    actorUserId: user.id,
  });
  if (!cancelled.ok) return data({ error: cancelled.message, done: false }, { status: cancelRefusalStatus(cancelled) });
  return data({ error: null, done: true });
}

export default function ScheduleRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { days, timeZone, canEditHours, builds, canBook } = loaderData;
  const navigation = useNavigation();
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
                <Link to={`/app/leads/${b.leadId}/build`} className="btn-quiet">
                  Change dates<span className="sr-only"> of {b.customerName}</span>
                </Link>
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
