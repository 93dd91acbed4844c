import { data, Form, redirect, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/app-consult-hours";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { fieldErrors, formId } from "~/lib/format/form-fields";
import { ConfirmAction } from "~/components/ui/confirm-action";
import { FormAlert, SelectField, TextField } from "~/components/ui/field";
import { cancelBooking, cancelRefusalStatus } from "~/lib/consults/booking.server";
import { blockDay, listBlockedDays, unblockDay } from "~/lib/consults/consult-days.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { parseWeeklyHours, type WeeklyHours } from "~/lib/consults/consult-slots";
import { saveConsultHours } from "~/lib/settings/company-settings.server";
import { zonedDay } from "~/lib/format/zoned-time";
import { requireUser } from "~/lib/auth/session.server";
import { possessive } from "~/lib/format/wording";
import { readForm } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Consult hours · Emberwright" }];

const WEEKDAYS = [
  ["1", "Monday"],
  ["2", "Tuesday"],
  ["3", "Wednesday"],
  ["4", "Thursday"],
  ["5", "Friday"],
  ["6", "Saturday"],
  ["7", "Sunday"],
] as const;

const toClock = (minutes: number) =>
  `${String(Math.floor(minutes / 60)).padStart(2, "0")}:${String(minutes % 60).padStart(2, "0")}`;
const fromClock = (text: string) => {
  const m = /^(\d{2}):(\d{2})$/.exec(text);
  return m ? Number(m[1]) * 60 + Number(m[2]) : NaN;
};

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const company = await getCompany(user.companyId);
  const blocked = await listBlockedDays(user.companyId, company.timeZone);
  const hours = parseWeeklyHours(company.consultHoursJson);
  return {
    timeZone: company.timeZone,
    slotMinutes: company.consultSlotMinutes,
    horizonDays: company.consultHorizonDays,
    days: WEEKDAYS.map(([key, label]) => {
      const range = hours[key]?.[0];
      return { key, label, isOpen: Boolean(range), from: toClock(range?.[0] ?? 540), to: toClock(range?.[1] ?? 1020) };
    }),
    blocked,
    today: zonedDay(new Date(), company.timeZone),
  };
}

const unblockIdSchema = formId("Choose a blocked day to open again.");
const cancelIdSchema = formId("Choose a consult to cancel.");

const hoursSchema = z.object({
  slotMinutes: z
    .enum(["30", "45", "60", "90", "120"], { error: "Choose a slot length from the list." })
    .transform(Number),
  horizonDays: z.coerce
    .number({ error: "Enter how many days ahead people may book." })
    .int({ error: "Booking horizon must be a whole number of days from 1 to 90." })
    .min(1, { error: "Booking horizon must be a whole number of days from 1 to 90." })
    .max(90, { error: "Booking horizon must be a whole number of days from 1 to 90." }),
});

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const form = await readForm(request);
  const intent = form.get("intent");
  if (intent === "block") {
    const company = await getCompany(user.companyId);
    const result = await blockDay(user.companyId, company.timeZone, String(form.get("day") ?? ""));
    if (!result.ok) return data({ errors: { day: result.error } as Record<string, string> }, { status: 400 });
    return redirect("/app/consult-hours?saved=day");
  }
  if (intent === "unblock") {
    const id = unblockIdSchema.safeParse(form.get("id"));
    if (!id.success)
      return data({ errors: { day: id.error.issues[0]!.message } as Record<string, string> }, { status: 400 });
    await unblockDay(user.companyId, id.data);
    return redirect("/app/consult-hours?saved=1");
  }
  if (intent === "cancel-booking") {
    const bookingId = cancelIdSchema.safeParse(form.get("bookingId"));
    if (!bookingId.success)
      return data(
        { errors: { booking: bookingId.error.issues[0]!.message } as Record<string, string> },
        { status: 400 },
      );
    const cancelled = await cancelBooking({
      bookingId: bookingId.data,
      companyId: user.companyId,
      by: "staff",
      actorUserId: user.id,
    });
    if (!cancelled.ok)
      return data(
        { errors: { booking: cancelled.message } as Record<string, string> },
        { status: cancelRefusalStatus(cancelled) },
      );
    return redirect("/app/consult-hours?saved=cancelled");
  }
  const parsed = hoursSchema.safeParse({ slotMinutes: form.get("slotMinutes"), horizonDays: form.get("horizonDays") });
  const errors: Record<string, string> = parsed.success ? {} : fieldErrors(parsed.error);
  const hours: WeeklyHours = {};
  for (const [key, label] of WEEKDAYS) {
    if (form.get(`open-${key}`) !== "on") continue;
    const from = fromClock(String(form.get(`from-${key}`) ?? ""));
    const to = fromClock(String(form.get(`to-${key}`) ?? ""));
    if (!Number.isFinite(from) || !Number.isFinite(to) || from >= to) {
      errors[`to-${key}`] = `${label}: the end must be a time after the start.`;
      continue;
    }
    hours[key] = [[from, to]];
  }
  if (Object.keys(errors).length) return data({ errors }, { status: 400 });
  await saveConsultHours(user.companyId, {
    hours,
    slotMinutes: parsed.data!.slotMinutes,
    horizonDays: parsed.data!.horizonDays,
  });
  return redirect("/app/consult-hours?saved=1");
}

export default function ConsultHoursRoute({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const [params] = useSearchParams();
  const navigation = useNavigation();
  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-6">
      <div>
        <h1 className="text-2xl font-extrabold">Consult hours</h1>
        <p className="text-char-600">
          When homeowners may book a paid design consult, in {loaderData.timeZone.replace(/_/g, " ")} time.
        </p>
      </div>
      {params.get("saved") && !actionData ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {params.get("saved") === "cancelled"
            ? "Consult cancelled; the fee is being refunded and both sides are e-mailed."
            : params.get("saved") === "day"
              ? "Day blocked: nobody can book a consult on it."
              : "Saved."}
        </p>
      ) : null}
      <Form method="post" className="flex flex-col gap-5 card p-6" noValidate>
        <input type="hidden" name="intent" value="hours" />
        {Object.keys(errors).filter((k) => k !== "day" && k !== "booking").length ? (
          <FormAlert>Nothing was saved. Fix the fields marked below.</FormAlert>
        ) : null}
        <fieldset className="flex flex-col gap-3">
          <legend className="mb-2 font-extrabold">Weekly hours</legend>
          {loaderData.days.map((day) => (
            <div key={day.key} className="grid grid-cols-1 items-center gap-x-3 gap-y-1 sm:grid-cols-[9rem_1fr]">
              <label className="flex items-center gap-2 font-bold text-char-700">
                <input
                  type="checkbox"
                  name={`open-${day.key}`}
                  defaultChecked={day.isOpen}
                  className="h-4 w-4 accent-ember-500"
                />
                {day.label}
              </label>
              <div className="flex min-w-0 items-center gap-2">
                <label className="sr-only" htmlFor={`from-${day.key}`}>
                  {day.label} from
                </label>
                <input
                  id={`from-${day.key}`}
                  type="time"
                  name={`from-${day.key}`}
                  defaultValue={day.from}
                  className="field-input mt-0 min-w-0 flex-1"
                />
                <span aria-hidden="true">–</span>
                <label className="sr-only" htmlFor={`to-${day.key}`}>
                  {day.label} until
                </label>
                <input
                  id={`to-${day.key}`}
                  type="time"
                  name={`to-${day.key}`}
                  defaultValue={day.to}
                  className="field-input mt-0 min-w-0 flex-1"
                  aria-invalid={errors[`to-${day.key}`] ? true : undefined}
                />
              </div>
              {errors[`to-${day.key}`] ? <p className="col-span-full field-error">{errors[`to-${day.key}`]}</p> : null}
            </div>
          ))}
        </fieldset>
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField
            label="Consult length"
            name="slotMinutes"
            defaultValue={String(loaderData.slotMinutes)}
            error={errors.slotMinutes}
          >
            {["30", "45", "60", "90", "120"].map((m) => (
              <option key={m} value={m}>
                {m} minutes
              </option>
            ))}
          </SelectField>
          <TextField
            label="Bookable up to"
            name="horizonDays"
            suffix="days"
            inputMode="numeric"
            defaultValue={loaderData.horizonDays}
            error={errors.horizonDays}
            hint="How far ahead homeowners may book (1–90 days)."
          />
        </div>
        <div>
          <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
            Save hours
          </button>
        </div>
      </Form>
      <section className="flex flex-col gap-4 card p-6" aria-labelledby="blocked-title">
        <h2 id="blocked-title" className="font-extrabold">
          Days off
        </h2>
        {errors.booking ? (
          <FormAlert>{errors.booking}</FormAlert>
        ) : errors.day ? (
          <FormAlert>No day was blocked: see the message under the date.</FormAlert>
        ) : null}
        <Form method="post" className="flex flex-wrap items-end gap-3" noValidate>
          <input type="hidden" name="intent" value="block" />
          <TextField
            label="Block a day"
            name="day"
            type="date"
            min={loaderData.today}
            error={errors.day}
            hint="Nobody can book a consult on a blocked day. Consults already booked on it stay until you cancel them."
          />
          <button type="submit" className="btn-quiet">
            Block this day
          </button>
        </Form>
        {loaderData.blocked.length ? (
          <ul className="flex flex-col gap-3">
            {loaderData.blocked.map((b) => (
              <li key={b.id} className="rounded-lg border border-ash-200 bg-ash-50 p-3">
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <span className="font-bold">{b.label}</span>
                  <Form method="post">
                    <input type="hidden" name="intent" value="unblock" />
                    <input type="hidden" name="id" value={b.id} />
                    <button type="submit" className="btn-quiet" aria-label={`Open ${b.label} again`}>
                      Open again
                    </button>
                  </Form>
                </div>
                {b.bookings.length ? (
                  <div
                    role="note"
                    className="mt-3 flex flex-col gap-2 rounded-lg border border-alert-600/30 bg-alert-100 p-3 text-sm"
                  >
                    <p className="font-bold text-alert-700">
                      {b.bookings.length === 1
                        ? "A consult is still booked on this day."
                        : `${b.bookings.length} consults are still booked on this day.`}{" "}
                      Cancel and refund, or keep the visit.
                    </p>
                    <ul className="flex flex-col gap-2">
                      {b.bookings.map((booking) => (
                        <li key={booking.id} className="flex flex-wrap items-center justify-between gap-2">
                          <span>
                            {booking.time}, {booking.customerName}
                            {booking.status === "held" ? " (payment in progress)" : ""}
                          </span>
                          {booking.status === "confirmed" ? (
                            <ConfirmAction
                              label="Cancel and refund"
                              accessibleLabel={`Cancel and refund the consult with ${booking.customerName}`}
                              question={`Cancel ${possessive(booking.customerName)} consult at ${booking.time} on ${b.label}? ${booking.isPaid ? "The fee is refunded in full and " : ""}${booking.customerName} is e-mailed.`}
                              confirmLabel="Yes, cancel and refund"
                              disabled={navigation.state === "submitting"}
                            >
                              <input type="hidden" name="intent" value="cancel-booking" />
                              <input type="hidden" name="bookingId" value={booking.id} />
                            </ConfirmAction>
                          ) : null}
                        </li>
                      ))}
                    </ul>
                  </div>
                ) : null}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-char-600">No days blocked.</p>
        )}
      </section>
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
