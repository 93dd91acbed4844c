import { isValidPhoneNumber, parsePhoneNumber } from "libphonenumber-js/max";
import { z } from "zod";
import { toSingleLine } from "~/lib/format/clean-text";
import { DEFAULT_PHONE_REGION } from "~/lib/format/phone";

/*
 * A phone number typed by a person, checked against the full numbering plans (libphonenumber-js
 * "max" metadata, a port of Google's libphonenumber) and kept in E.164 (ITU-T E.164). Numbers typed
 * without a country code are read as North American. Server-side only: the "max" metadata is large.
 */
export function phoneNumberSchema(message: string) {
  return z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .max(30, message)
    .refine((v) => isValidPhoneNumber(v, DEFAULT_PHONE_REGION), message)
    .transform((v) => parsePhoneNumber(v, DEFAULT_PHONE_REGION).number as string);
}
