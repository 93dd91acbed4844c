import { z } from "zod";
import { BUILD_WINDOWS } from "~/db/enums";
import { toCleanLines, toSingleLine } from "~/lib/format/clean-text";
import { phoneNumberSchema } from "~/lib/format/phone-schema";

/**
 * The homeowner's request form (the design itself travels in the search params). Every text field
 * loses control characters here, before it is stored or put into an e-mail subject.
 */
export const leadFormSchema = z.object({
  customerName: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .min(2, "Enter your name (2 to 80 characters).")
    .max(80, "Enter your name (2 to 80 characters)."),
  email: z.email("Enter an e-mail address like you@example.com.").max(254, "E-mail must be at most 254 characters."),
  // Stored in E.164 ("+12175550142") and shown formatted.
  phone: phoneNumberSchema(
    "Enter your phone number with its area code, like (217) 555-0142; outside North America start with + and the country code.",
  ),
  street: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .min(3, "Enter the street address (3 to 120 characters).")
    .max(120, "Enter the street address (3 to 120 characters)."),
  town: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .min(2, "Enter the town (2 to 80 characters).")
    .max(80, "Enter the town (2 to 80 characters)."),
  buildWindow: z.enum(BUILD_WINDOWS, { error: "Choose when you hope to build." }),
  notes: z.string().overwrite(toCleanLines).trim().max(2000, "Notes must be at most 2,000 characters.").default(""),
  consent: z.literal("on", { error: "Tick the box so the contractor may contact you about this request." }),
  // Honeypot: hidden from people, filled in by form-filling bots.
  website: z.string().max(0, "This request could not be accepted.").optional(),
});

export type LeadFormInput = z.output<typeof leadFormSchema>;
