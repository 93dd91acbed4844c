import { z } from "zod";
import { formNumber } from "~/lib/format/form-fields";

export { CREW_DEFAULTS, WEEKDAY_CHOICES } from "~/lib/settings/crew-options";

/*
 * The crew settings: how many people a build crew has, how long their day on site is, and which
 * weekdays they work. Bookings divide a job's labour-hours by people × hours to suggest its days,
 * and lay those days on the working weekdays only (app/domain/build-schedule.ts).
 */

const WEEKDAYS_MESSAGE = "Working weekdays: tick at least one day, Monday to Sunday.";

export const crewSettingsSchema = z.object({
  crewSize: formNumber("Crew size", 1, 12, "people").refine(Number.isInteger, {
    error: "Crew size must be a whole number of people, from 1 to 12.",
  }),
  // Quarter hours: a day is planned to the quarter hour at the finest (common practice, no source).
  crewDayHours: formNumber("Crew day", 4, 12, "hours").refine((h) => Number.isInteger(h * 4), {
    error: "Crew day must be in quarter hours, like 8, 8.5 or 9.25.",
  }),
  workWeekdays: z
    .array(z.string({ error: WEEKDAYS_MESSAGE }).regex(/^[0-6]$/, { error: WEEKDAYS_MESSAGE }), {
      error: WEEKDAYS_MESSAGE,
    })
    .min(1, { error: WEEKDAYS_MESSAGE })
    .max(7, { error: WEEKDAYS_MESSAGE })
    .transform((days) => [...new Set(days.map(Number))].sort((a, b) => a - b)),
});

export type CrewSettingsInput = z.output<typeof crewSettingsSchema>;
