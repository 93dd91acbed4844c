import { useRef, useState, type KeyboardEvent, type PointerEvent } from "react";
import { Link } from "react-router";

/** One day of the grid, as the schedule's loader lays it out (company time). */
export type GridDay = {
  day: string;
  dayOfMonth: number;
  /** "Dec" on the first cell and on the 1st of a month, so each month is named once. */
  monthShort: string | null;
  longLabel: string;
  isWorking: boolean;
  isDayOff: boolean;
  isPast: boolean;
  isToday: boolean;
};
export type GridBuild = {
  id: number;
  leadId: number;
  sequence: number;
  customerName: string;
  dates: string[];
  crew: string;
  isOver: boolean;
};
export type GridConsult = { id: number; leadId: number; day: string; from: string; customerName: string };

const WEEKDAY_HEADS = [
  ["Mon", "Monday"],
  ["Tue", "Tuesday"],
  ["Wed", "Wednesday"],
  ["Thu", "Thursday"],
  ["Fri", "Friday"],
  ["Sat", "Saturday"],
  ["Sun", "Sunday"],
] as const;

/** A drag needs this many pixels of travel, so a tap or a click is never taken for one. */
const DRAG_THRESHOLD_PX = 6;

type Pending = { pointerId: number; startX: number; startY: number; build: GridBuild; isDragging: boolean };

/**
 * Weeks × weekdays with the company's builds and consults. An owner moves a build by dragging any of
 * its days onto another day: that day becomes its first day (pointer events, so mouse, pen and touch
 * alike). Clicking a build instead takes the keyboard route, its "Move to…" field below the grid.
 */
export function BuildCalendarGrid({
  weeks,
  builds,
  consults,
  canMove,
  movingBuildId,
  caption,
  onMove,
  onChoose,
}: {
  weeks: GridDay[][];
  builds: GridBuild[];
  consults: GridConsult[];
  canMove: boolean;
  movingBuildId: number | null;
  caption: string;
  onMove: (build: GridBuild, day: string) => void;
  onChoose: (build: GridBuild) => void;
}) {
  const pending = useRef<Pending | null>(null);
  const suppressClick = useRef(false);
  const [drag, setDrag] = useState<{ build: GridBuild; x: number; y: number; over: string | null } | null>(null);
  const labelOf = new Map(weeks.flat().map((d) => [d.day, d.longLabel]));

  const dayUnder = (x: number, y: number): string | null =>
    document.elementFromPoint(x, y)?.closest<HTMLElement>("[data-day]")?.dataset.day ?? null;

  const stop = () => {
    pending.current = null;
    setDrag(null);
  };

  const handlers = (build: GridBuild) => ({
    onPointerDown: (e: PointerEvent<HTMLElement>) => {
      if (e.button !== 0) return;
      e.currentTarget.setPointerCapture(e.pointerId);
      pending.current = { pointerId: e.pointerId, startX: e.clientX, startY: e.clientY, build, isDragging: false };
    },
    onPointerMove: (e: PointerEvent<HTMLElement>) => {
      const p = pending.current;
      if (!p || p.pointerId !== e.pointerId) return;
      if (!p.isDragging && Math.hypot(e.clientX - p.startX, e.clientY - p.startY) < DRAG_THRESHOLD_PX) return;
      p.isDragging = true;
      setDrag({ build, x: e.clientX, y: e.clientY, over: dayUnder(e.clientX, e.clientY) });
    },
    onPointerUp: (e: PointerEvent<HTMLElement>) => {
      const p = pending.current;
      stop();
      if (!p || p.pointerId !== e.pointerId || !p.isDragging) return;
      suppressClick.current = true;
      const day = dayUnder(e.clientX, e.clientY);
      if (day && day !== build.dates[0]) onMove(build, day);
    },
    onPointerCancel: stop,
    onLostPointerCapture: () => {
      if (pending.current && !pending.current.isDragging) pending.current = null;
    },
    onKeyDown: (e: KeyboardEvent<HTMLElement>) => {
      if (e.key === "Escape" && pending.current) stop();
    },
    onClick: () => {
      if (suppressClick.current) {
        suppressClick.current = false;
        return;
      }
      onChoose(build);
    },
  });

  return (
    <>
      <div
        className="relative overflow-x-auto overscroll-x-contain"
        role="region"
        aria-label="Calendar weeks (scrolls sideways on narrow screens)"
        tabIndex={0}
      >
        <table className="w-full min-w-[46rem] table-fixed border-collapse text-sm">
          <caption className="sr-only">{caption}</caption>
          <thead>
            <tr>
              {WEEKDAY_HEADS.map(([short, long]) => (
                <th
                  key={short}
                  scope="col"
                  className="border-b border-ash-200 bg-ash-100 px-2 py-1 text-left font-bold"
                >
                  <abbr title={long} className="no-underline">
                    {short}
                  </abbr>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {weeks.map((week) => (
              <tr key={week[0]!.day}>
                {week.map((d) => {
                  const dayBuilds = builds.filter((b) => b.dates.includes(d.day));
                  const dayConsults = consults.filter((c) => c.day === d.day);
                  const isTarget = drag?.over === d.day;
                  const shade = d.isDayOff || !d.isWorking ? "bg-ash-100 bg-stripes" : "bg-white";
                  return (
                    <td
                      key={d.day}
                      data-day={d.day}
                      data-working={d.isWorking && !d.isDayOff ? "true" : "false"}
                      className={`h-28 border border-ash-200 p-1 align-top ${shade} ${
                        isTarget ? "outline-3 -outline-offset-3 outline-ember-500" : ""
                      }`}
                    >
                      <div className="flex items-baseline justify-between gap-1">
                        <time
                          dateTime={d.day}
                          className={`font-bold tabular-nums ${d.isToday ? "rounded bg-action px-1 text-white" : d.isPast ? "text-char-500" : "text-char-800"}`}
                        >
                          {d.monthShort ? `${d.monthShort} ` : ""}
                          {d.dayOfMonth}
                          <span className="sr-only">{d.isToday ? ", today" : ""}</span>
                        </time>
                        {d.isDayOff ? (
                          <span className="text-xs font-semibold text-char-600">Day off</span>
                        ) : !d.isWorking ? (
                          <span className="text-xs text-char-600">No builds</span>
                        ) : null}
                      </div>
                      <ul className="mt-1 flex flex-col gap-1">
                        {dayBuilds.map((b) => {
                          const index = b.dates.indexOf(d.day);
                          const text =
                            index === 0 ? b.customerName : `${b.customerName} (day ${index + 1} of ${b.dates.length})`;
                          const isMoving = movingBuildId === b.id || drag?.build.id === b.id;
                          const chip = `block w-full truncate rounded-md border px-1.5 py-1 text-left text-xs font-bold ${
                            index === 0 ? "border-ember-400 bg-ember-100" : "border-ember-200 bg-ember-50"
                          } text-char-900 ${isMoving ? "opacity-60" : ""}`;
                          const title = `${b.customerName}: ${b.dates.length} day${b.dates.length === 1 ? "" : "s"}, crew ${b.crew || "none"}`;
                          return (
                            <li key={b.id}>
                              {canMove && !b.isOver ? (
                                <button
                                  type="button"
                                  className={`${chip} cursor-grab touch-none select-none hover:border-ember-600`}
                                  title={`${title}. Drag to another day to move it.`}
                                  data-build-id={b.id}
                                  aria-label={`${text}: move this build`}
                                  {...handlers(b)}
                                >
                                  {text}
                                </button>
                              ) : (
                                <Link to={`/app/leads/${b.leadId}`} className={`${chip} hover:underline`} title={title}>
                                  {text}
                                </Link>
                              )}
                            </li>
                          );
                        })}
                        {dayConsults.map((c) => (
                          <li key={`c-${c.id}`}>
                            <Link
                              to={`/app/leads/${c.leadId}`}
                              className="block truncate rounded-md bg-moss-100 px-1.5 py-0.5 text-xs font-semibold text-moss-700 hover:underline"
                              title={`Design consult, ${c.from}: ${c.customerName}`}
                            >
                              {c.from} consult: {c.customerName}
                            </Link>
                          </li>
                        ))}
                      </ul>
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {drag ? (
        <div
          aria-hidden="true"
          className="pointer-events-none fixed z-50 rounded-md border border-ember-500 bg-white px-2 py-1 text-xs font-bold text-char-900 shadow-lg"
          style={{ left: drag.x + 12, top: drag.y + 12 }}
        >
          {drag.build.customerName}
          {drag.over ? ` → starts ${labelOf.get(drag.over) ?? drag.over}` : ""}
        </div>
      ) : null}
    </>
  );
}
