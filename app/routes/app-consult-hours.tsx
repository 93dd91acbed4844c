import { and, asc, eq } from "drizzle-orm";
import { data, Form, redirect, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/app-consult-hours";
import { fieldErrors, formId } from "~/lib/form-fields";
import { SelectField, TextField } from "~/components/ui/field";
import { companies, consultBlockedDays } from "~/db/schema";
import { getCompany } from "~/lib/catalog.server";
import { parseWeeklyHours, type WeeklyHours } from "~/lib/consult-slots";
import { db } from "~/lib/db.server";
import { requireUser } from "~/lib/session.server";

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

const toClock = (minutes: number) => `${String(Math.floor(minutes / 60)).padStart(2, "0")}:${String(minutes % 60).padStart(2, "0")}`;
const fromClock = (text: string) => {
  const m = /^(\d{2}):(\d{2})$/.exec(text);
  return m ? Number(m[1]) * 60 + Number(m[2]) : NaN;
};

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const company = await getCompany(user.companyId);
  const blocked = await db
    .select({ id: consultBlockedDays.id, day: consultBlockedDays.day })
    .from(consultBlockedDays)
    .where(eq(consultBlockedDays.companyId, user.companyId))
    .orderBy(asc(consultBlockedDays.day));
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
  };
}

const unblockIdSchema = formId("Choose a blocked day to open again.");

const hoursSchema = z.object({
  slotMinutes: z.enum(["30", "45", "60", "90", "120"], { error: "Choose a slot length from the list." }).transform(Number),
  horizonDays: z.coerce
    .number({ error: "Enter how many days ahead people may book." })
    .int({ error: "Booking horizon must be a whole number of days from 1 to 90." })
    .min(1, { error: "Booking horizon must be a whole number of days from 1 to 90." })
    .max(90, { error: "Booking horizon must be a whole number of days from 1 to 90." }),
});

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const form = await request.formData();
  const intent = form.get("intent");
  if (intent === "block") {
    const day = String(form.get("day") ?? "");
    if (!/^\d{4}-\d{2}-\d{2}$/.test(day) || Number.isNaN(Date.parse(`${day}T00:00:00Z`))) {
      return data({ errors: { day: "Choose a date to block." } as Record<string, string> }, { status: 400 });
    }
    await db.insert(consultBlockedDays).values({ companyId: user.companyId, day }).onConflictDoNothing();
    return redirect("/app/consult-hours?saved=1");
  }
  if (intent === "unblock") {
    const id = unblockIdSchema.safeParse(form.get("id"));
    if (!id.success) return data({ errors: { day: id.error.issues[0]!.message } as Record<string, string> }, { status: 400 });
    await db.delete(consultBlockedDays).where(and(eq(consultBlockedDays.companyId, user.companyId), eq(consultBlockedDays.id, id.data)));
    return redirect("/app/consult-hours?saved=1");
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
  await db
    .update(companies)
    .set({ consultHoursJson: JSON.stringify(hours), consultSlotMinutes: parsed.data!.slotMinutes, consultHorizonDays: parsed.data!.horizonDays })
    .where(eq(companies.id, user.companyId));
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
        <p className="text-char-600">When homeowners may book a paid design consult, in {loaderData.timeZone.replace(/_/g, " ")} time.</p>
      </div>
      {params.get("saved") && !actionData ? <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">Saved.</p> : null}
      <Form method="post" className="card flex flex-col gap-5 p-6" noValidate>
        <input type="hidden" name="intent" value="hours" />
        {Object.keys(errors).filter((k) => k !== "day").length ? (
          <p role="alert" className="rounded-lg bg-alert-100 px-4 py-3 text-sm font-semibold text-alert-700">Nothing was saved. Fix the fields marked below.</p>
        ) : null}
        <fieldset className="flex flex-col gap-3">
          <legend className="mb-2 font-extrabold">Weekly hours</legend>
          {loaderData.days.map((day) => (
            <div key={day.key} className="grid grid-cols-[7.5rem_1fr] items-center gap-3 sm:grid-cols-[9rem_1fr_1fr]">
              <label className="flex items-center gap-2 font-bold text-char-700">
                <input type="checkbox" name={`open-${day.key}`} defaultChecked={day.isOpen} className="h-4 w-4 accent-ember-500" />
                {day.label}
              </label>
              <div className="col-start-2 flex items-center gap-2 sm:col-span-2">
                <label className="sr-only" htmlFor={`from-${day.key}`}>{day.label} from</label>
                <input id={`from-${day.key}`} type="time" name={`from-${day.key}`} defaultValue={day.from} className="field-input mt-0" />
                <span aria-hidden="true">–</span>
                <label className="sr-only" htmlFor={`to-${day.key}`}>{day.label} until</label>
                <input id={`to-${day.key}`} type="time" name={`to-${day.key}`} defaultValue={day.to} className="field-input mt-0" aria-invalid={errors[`to-${day.key}`] ? true : undefined} />
              </div>
              {errors[`to-${day.key}`] ? <p className="field-error col-span-full">{errors[`to-${day.key}`]}</p> : null}
            </div>
          ))}
        </fieldset>
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField label="Consult length" name="slotMinutes" defaultValue={String(loaderData.slotMinutes)} error={errors.slotMinutes}>
            {["30", "45", "60", "90", "120"].map((m) => (
              <option key={m} value={m}>{m} minutes</option>
            ))}
          </SelectField>
          <TextField label="Bookable up to" name="horizonDays" suffix="days" inputMode="numeric" defaultValue={loaderData.horizonDays} error={errors.horizonDays} hint="How far ahead homeowners may book (1–90 days)." />
        </div>
        <div>
          <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>Save hours</button>
        </div>
      </Form>
      <section className="card flex flex-col gap-4 p-6" aria-labelledby="blocked-title">
        <h2 id="blocked-title" className="font-extrabold">Days off</h2>
        <Form method="post" className="flex flex-wrap items-end gap-3" noValidate>
          <input type="hidden" name="intent" value="block" />
          <TextField label="Block a day" name="day" type="date" error={errors.day} />
          <button type="submit" className="btn-quiet">Block it</button>
        </Form>
        {loaderData.blocked.length ? (
          <ul className="flex flex-wrap gap-2">
            {loaderData.blocked.map((b) => (
              <li key={b.id}>
                <Form method="post" className="inline-flex items-center gap-2 rounded-full bg-ash-100 py-1 pr-1 pl-3 text-sm font-bold">
                  <input type="hidden" name="intent" value="unblock" />
                  <input type="hidden" name="id" value={b.id} />
                  {b.day}
                  <button type="submit" className="rounded-full px-2 hover:bg-ash-200" aria-label={`Unblock ${b.day}`}>×</button>
                </Form>
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
