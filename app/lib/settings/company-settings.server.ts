import { eq } from "drizzle-orm";
import { companies } from "~/db/schema";
import { forgetOfferedCatalogs } from "~/lib/catalog/catalog.server";
import { db } from "~/lib/platform/db.server";
import type { CompanySettingsInput } from "~/lib/settings/company-schema";
import type { CrewSettingsInput } from "~/lib/settings/crew-schema";
import type { WeeklyHours } from "~/lib/consults/consult-slots";

/** Saves the owner's company settings form (the consult fee arrives in cents). */
export async function saveCompanySettings(companyId: number, input: CompanySettingsInput): Promise<void> {
  const { consultFee, ...rest } = input;
  await db
    .update(companies)
    .set({ ...rest, consultFeeCents: consultFee })
    .where(eq(companies.id, companyId));
  forgetOfferedCatalogs();
}

/** Saves the crew's size, day length and working weekdays in one write (bookings read them from here). */
export async function saveCrewSettings(companyId: number, input: CrewSettingsInput): Promise<void> {
  await db
    .update(companies)
    .set({
      crewSize: input.crewSize,
      crewDayHours: input.crewDayHours,
      workWeekdaysJson: JSON.stringify(input.workWeekdays),
    })
    .where(eq(companies.id, companyId));
}

/** Saves when consults may be booked: the weekly hours, the slot length and how far ahead. */
export async function saveConsultHours(
  companyId: number,
  input: { hours: WeeklyHours; slotMinutes: number; horizonDays: number },
): Promise<void> {
  await db
    .update(companies)
    .set({
      consultHoursJson: JSON.stringify(input.hours),
      consultSlotMinutes: input.slotMinutes,
      consultHorizonDays: input.horizonDays,
    })
    .where(eq(companies.id, companyId));
}
