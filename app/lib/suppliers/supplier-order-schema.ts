import { z } from "zod";
import { toSingleLine } from "~/lib/format/clean-text";
import { formId } from "~/lib/format/form-fields";

/** A move on one supplier order, as posted by its page. */
export const orderMoveSchema = z.object({
  intent: z.enum(["send", "confirm", "deliver", "discard"], { error: "Choose send, confirm, deliver or discard." }),
  // The supplier's reference or who confirmed; optional.
  note: z
    .string()
    .default("")
    .overwrite(toSingleLine)
    .transform((v) => v.trim())
    .pipe(z.string().max(120, "Confirmation note must be at most 120 characters.")),
});

/** Orders to combine, as posted by the list: two or more ids. */
export const combineSchema = z.object({
  orderIds: z.array(formId("Choose orders from the list.")).min(2, "Choose at least two draft orders to combine."),
});
