import { useState, type ReactNode } from "react";
import { Link, useSearchParams } from "react-router";

export type PickerDay = { day: string; slots: { startsAt: string }[] };

/** "Tuesday, December 8" for a local calendar day written YYYY-MM-DD. */
export const longDay = (day: string) =>
  new Intl.DateTimeFormat("en-US", { weekday: "long", month: "long", day: "numeric", timeZone: "UTC" }).format(
    new Date(`${day}T12:00:00Z`),
  );

const dayParts = (day: string) => {
  const date = new Date(`${day}T12:00:00Z`);
  const part = (options: Intl.DateTimeFormatOptions) =>
    new Intl.DateTimeFormat("en-US", { ...options, timeZone: "UTC" }).format(date);
  return { weekday: part({ weekday: "short" }), date: part({ day: "numeric" }), month: part({ month: "short" }) };
};

const WEEKDAYS = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];

/**
 * The days from the first with free times to the last, whole weeks from Monday: `null` before the
 * first day, and days with no free time kept (with no slots) so every day sits under its weekday.
 */
export function calendarCells(days: PickerDay[]): (PickerDay | null)[] {
  if (days.length === 0) return [];
  const byDay = new Map(days.map((d) => [d.day, d]));
  const first = new Date(`${days[0]!.day}T12:00:00Z`);
  const last = new Date(`${days.at(-1)!.day}T12:00:00Z`);
  const cells: (PickerDay | null)[] = Array.from({ length: (first.getUTCDay() + 6) % 7 }, () => null);
  for (let at = first; at <= last; at = new Date(at.getTime() + 86_400_000)) {
    const day = at.toISOString().slice(0, 10);
    cells.push(byDay.get(day) ?? { day, slots: [] });
  }
  return cells;
}

const clock = (iso: string, timeZone: string) =>
  new Intl.DateTimeFormat("en-US", { timeZone, hour: "numeric", minute: "2-digit" }).format(new Date(iso));
const localHour = (iso: string, timeZone: string) =>
  Number(new Intl.DateTimeFormat("en-US", { timeZone, hour: "numeric", hourCycle: "h23" }).format(new Date(iso)));

/** The day chosen in the address (`?day=`), or the first day with free times. */
export function useChosenDay(days: PickerDay[]): PickerDay | null {
  const [params] = useSearchParams();
  const asked = params.get("day");
  return days.find((d) => d.day === asked) ?? days[0] ?? null;
}

/**
 * Day first, then its times. The days are a compact grid of links (`?day=…`), so a phone sees every
 * day at once without scrolling past each day's times, and the choice works without scripts too;
 * the route skips reloading its data when only the day changes. The chosen day's times are radio
 * buttons split into morning and afternoon, and one button holds the chosen time.
 */
export function ConsultTimePicker(props: {
  days: PickerDay[];
  timeZone: string;
  visitMinutes: number;
  isBusy: boolean;
  submitLabel: (chosen: string | null) => string;
  footnote?: ReactNode;
}) {
  const { days, timeZone, visitMinutes, isBusy } = props;
  const chosenDay = useChosenDay(days);
  const [chosenTime, setChosenTime] = useState<string | null>(null);
  const [params] = useSearchParams();
  if (!chosenDay) return null;
  const time = chosenDay.slots.some((s) => s.startsAt === chosenTime) ? chosenTime : null;
  const dayHref = (day: string) => {
    const next = new URLSearchParams(params);
    next.delete("left");
    next.set("day", day);
    return `?${next.toString()}`;
  };
  const morning = chosenDay.slots.filter((s) => localHour(s.startsAt, timeZone) < 12);
  const afternoon = chosenDay.slots.filter((s) => localHour(s.startsAt, timeZone) >= 12);
  const endOf = (iso: string) => new Date(new Date(iso).getTime() + visitMinutes * 60_000).toISOString();

  return (
    <div className="flex flex-col gap-6">
      <section aria-labelledby="pick-day" className="flex flex-col gap-3">
        <h2 id="pick-day" className="flex items-baseline gap-2 text-lg font-extrabold">
          <span
            aria-hidden="true"
            className="grid size-7 shrink-0 place-items-center rounded-full bg-char-800 text-sm text-white"
          >
            1
          </span>
          Pick a day
        </h2>
        <p className="-mt-1 text-sm text-char-600">
          {longDay(days[0]!.day)} to {longDay(days.at(-1)!.day)}; days with no free time are greyed out.
        </p>
        <div
          aria-hidden="true"
          className="grid grid-cols-7 gap-1 text-center text-xs font-bold text-char-600 uppercase sm:gap-2"
        >
          {WEEKDAYS.map((w) => (
            <span key={w}>{w}</span>
          ))}
        </div>
        {/* Whole weeks, Monday first, so each day sits under its weekday; days with no time are shown, not links. */}
        <ul className="-mt-1 grid grid-cols-7 gap-1 sm:gap-2" aria-label="Days with free times">
          {calendarCells(days).map((cell, index) => {
            if (cell === null) return <li key={`blank-${index}`} aria-hidden="true" />;
            const parts = dayParts(cell.day);
            const showMonth = parts.date === "1" || cell.day === days[0]!.day;
            const label = (
              <span className="text-base font-extrabold tabular-nums sm:text-lg">
                <span className="sr-only">{parts.weekday}, </span>
                <span className={showMonth ? "mr-0.5 text-[11px] font-bold" : "sr-only"}>{parts.month} </span>
                {parts.date}
              </span>
            );
            if (cell.slots.length === 0)
              return (
                <li key={cell.day}>
                  <span className="flex flex-col items-center rounded-xl border-2 border-transparent bg-ash-100 px-0.5 py-1.5 leading-tight text-char-600">
                    {label}
                    <span className="text-[11px] font-semibold">
                      <span aria-hidden="true">–</span>
                      <span className="sr-only">: no free time</span>
                    </span>
                  </span>
                </li>
              );
            const isChosen = cell.day === chosenDay.day;
            return (
              <li key={cell.day}>
                <Link
                  to={dayHref(cell.day)}
                  replace
                  preventScrollReset
                  aria-current={isChosen ? "date" : undefined}
                  className={`flex flex-col items-center rounded-xl border-2 px-0.5 py-1.5 leading-tight transition-colors ${
                    isChosen
                      ? "border-char-800 bg-char-800 text-white"
                      : "border-ash-200 bg-white text-char-800 hover:border-ember-500"
                  }`}
                >
                  {/* Read as "Thu, Dec 3: 6 free times"; the month is shown on the first day and each 1st. */}
                  {label}
                  <span className="sr-only">: </span>
                  <span className={`text-[11px] font-semibold ${isChosen ? "text-ash-100" : "text-moss-700"}`}>
                    {cell.slots.length}
                    <span aria-hidden="true" className="hidden min-[400px]:inline">
                      {" "}
                      free
                    </span>
                    <span className="sr-only"> free {cell.slots.length === 1 ? "time" : "times"}</span>
                  </span>
                </Link>
              </li>
            );
          })}
        </ul>
      </section>

      <fieldset className="flex min-w-0 flex-col gap-3" disabled={isBusy}>
        <legend className="flex items-baseline gap-2 text-lg font-extrabold">
          <span
            aria-hidden="true"
            className="grid size-7 shrink-0 place-items-center rounded-full bg-char-800 text-sm text-white"
          >
            2
          </span>
          Pick a time on {longDay(chosenDay.day)}
        </legend>
        {[
          ["Morning", morning],
          ["Afternoon", afternoon],
        ].map(([label, list]) =>
          (list as PickerDay["slots"]).length ? (
            <div key={label as string} className="flex flex-col gap-2">
              <p className="text-sm font-bold text-char-600">{label as string}</p>
              <div className="flex flex-wrap gap-2">
                {(list as PickerDay["slots"]).map((slot) => (
                  <label
                    key={slot.startsAt}
                    className="cursor-pointer rounded-lg border-2 border-ash-300 bg-white px-3 py-2 text-sm font-bold text-char-800 tabular-nums hover:border-ember-500 has-checked:border-ember-600 has-checked:bg-ember-50 has-checked:text-ember-700 has-focus-visible:outline-3 has-focus-visible:outline-offset-2 has-focus-visible:outline-ember-500"
                  >
                    <input
                      type="radio"
                      name="startsAt"
                      value={slot.startsAt}
                      required
                      className="sr-only"
                      onChange={() => setChosenTime(slot.startsAt)}
                    />
                    {clock(slot.startsAt, timeZone)} – {clock(endOf(slot.startsAt), timeZone)}
                  </label>
                ))}
              </div>
            </div>
          ) : null,
        )}
      </fieldset>

      <div className="flex flex-col gap-3 rounded-xl border border-ash-200 bg-ash-50 p-4 sm:flex-row sm:items-center sm:justify-between">
        <p className="flex items-baseline gap-2 text-sm" aria-live="polite">
          <span
            aria-hidden="true"
            className="grid size-7 shrink-0 place-items-center self-center rounded-full bg-char-800 text-sm font-extrabold text-white"
          >
            3
          </span>
          {time ? (
            <span>
              <strong>{longDay(chosenDay.day)}</strong>, {clock(time, timeZone)} – {clock(endOf(time), timeZone)}
            </span>
          ) : (
            <span className="text-char-600">Choose a time above.</span>
          )}
        </p>
        <button type="submit" className="btn-primary" disabled={isBusy}>
          {props.submitLabel(time)}
        </button>
      </div>
      {props.footnote}
    </div>
  );
}

/** The route's data only changes with the booking, never with the day shown: switching days skips the reload. */
export function onlyDayChanged({
  currentUrl,
  nextUrl,
  formMethod,
}: {
  currentUrl: URL;
  nextUrl: URL;
  formMethod?: string;
}): boolean {
  if (formMethod && formMethod.toUpperCase() !== "GET") return false;
  if (currentUrl.pathname !== nextUrl.pathname) return false;
  const strip = (url: URL) => {
    const p = new URLSearchParams(url.searchParams);
    p.delete("day");
    p.sort();
    return p.toString();
  };
  return strip(currentUrl) === strip(nextUrl);
}
