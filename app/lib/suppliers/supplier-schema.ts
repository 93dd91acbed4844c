import { isValidPhoneNumber, parsePhoneNumber } from "libphonenumber-js/max";
import { z } from "zod";
import { toSingleLine } from "~/lib/format/clean-text";
import { fieldErrors } from "~/lib/format/form-fields";
import { DEFAULT_PHONE_REGION } from "~/lib/format/phone";

/** A supplier as the owner types it: name, the address orders go to, and a phone (optional, kept in E.164). */
export const supplierSchema = z.object({
  name: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .min(2, "Name must be 2 to 80 characters.")
    .max(80, "Name must be 2 to 80 characters."),
  email: z.string().trim().pipe(z.email("E-mail must be an address like orders@yard.example, where orders go.")),
  phone: z
    .string()
    .default("")
    .overwrite(toSingleLine)
    .transform((v) => v.trim())
    .refine((v) => v.length <= 30, "Phone must be at most 30 characters.")
    .refine(
      (v) => v === "" || isValidPhoneNumber(v, DEFAULT_PHONE_REGION),
      "Phone must be a phone number with its area code, like (217) 555-0142, or left blank.",
    )
    .transform((v) => (v === "" ? "" : parsePhoneNumber(v, DEFAULT_PHONE_REGION).number)),
});

export type SupplierInput = z.output<typeof supplierSchema>;

export function parseSupplierForm(
  fields: Record<string, string>,
): { ok: true; value: SupplierInput } | { ok: false; errors: Record<string, string> } {
  const parsed = supplierSchema.safeParse(fields);
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, errors: fieldErrors(parsed.error) };
}
