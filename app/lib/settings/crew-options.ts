// The crew settings' defaults and choices, for the settings page (no zod: it ships to the browser).

/** What a new company starts with (the `companies` column defaults). */
export const CREW_DEFAULTS = { crewSize: 2, crewDayHours: 8, workWeekdays: [1, 2, 3, 4, 5] } as const;

/** Weekdays as the form lists them, Monday first; values are 0 Sunday … 6 Saturday. */
export const WEEKDAY_CHOICES = [
  { value: 1, label: "Monday", short: "Mon" },
  { value: 2, label: "Tuesday", short: "Tue" },
  { value: 3, label: "Wednesday", short: "Wed" },
  { value: 4, label: "Thursday", short: "Thu" },
  { value: 5, label: "Friday", short: "Fri" },
  { value: 6, label: "Saturday", short: "Sat" },
  { value: 0, label: "Sunday", short: "Sun" },
] as const;
