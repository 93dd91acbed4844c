import { isValidPhoneNumber, parsePhoneNumber } from "libphonenumber-js/max";
import { z } from "zod";
import { toSingleLine } from "~/lib/format/clean-text";
import { DEFAULT_PHONE_REGION } from "~/lib/format/phone";
import { formNumber } from "~/lib/format/form-fields";
import { currentTimeZoneName, isOfferedTimeZone } from "~/lib/settings/time-zones";

/** The owner's company settings form; money entered in dollars, stored in cents. */
export const companySettingsSchema = z.object({
  name: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .min(2, "Company name must be 2 to 80 characters.")
    .max(80, "Company name must be 2 to 80 characters."),
  email: z.email("Enter an e-mail address like office@example.com."),
  // Checked against the full numbering plans (libphonenumber-js "max" metadata) and kept in E.164.
  phone: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .max(30, "Phone must be at most 30 characters.")
    .refine(
      (v) => v === "" || isValidPhoneNumber(v, DEFAULT_PHONE_REGION),
      "Phone must be a phone number with its area code, like (217) 555-0142, or +44 20 7946 0958 outside North America.",
    )
    .transform((v) => (v === "" ? "" : parsePhoneNumber(v, DEFAULT_PHONE_REGION).number)),
  town: z.string().overwrite(toSingleLine).trim().max(80, "Town must be at most 80 characters."),
  // A renamed zone posted under its old name (an old form, a script) is stored under its current name.
  timeZone: z
    .string({ error: "Choose a time zone from the list." })
    .transform(currentTimeZoneName)
    .refine(isOfferedTimeZone, "Choose a time zone from the list."),
  consultFee: formNumber("Consult fee", 0, 2000, "dollars").transform((v) => Math.round(v * 100)),
});
// Labour rate, overhead, profit, range spread and setback are estimating factors: see factor-settings.ts.

export type CompanySettingsInput = z.output<typeof companySettingsSchema>;
