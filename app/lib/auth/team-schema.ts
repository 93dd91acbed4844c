import { z } from "zod";
import { toSingleLine } from "~/lib/format/clean-text";
import { formId } from "~/lib/format/form-fields";
import { STAFF_ROLES } from "~/db/enums";

const role = z.enum(STAFF_ROLES, { error: "Role must be owner, estimator or crew." });
const userId = formId("Choose a team member.");

/** The team page's forms, told apart by `intent`. */
export const teamActionSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({
      intent: z.literal("invite"),
      name: z
        .string()
        .overwrite(toSingleLine)
        .trim()
        .min(2, "Name must be 2 to 80 characters.")
        .max(80, "Name must be 2 to 80 characters."),
      email: z
        .string()
        .trim()
        .toLowerCase()
        .pipe(
          z
            .email("Enter an e-mail address like someone@example.com.")
            .max(254, "E-mail must be at most 254 characters."),
        ),
      role,
    }),
    z.object({ intent: z.literal("role"), userId, role }),
    z.object({ intent: z.literal("deactivate"), userId }),
    z.object({ intent: z.literal("reactivate"), userId }),
  ],
  { error: "Unknown action: the form must say what it does (invite, role, deactivate or reactivate)." },
);

export type TeamAction = z.output<typeof teamActionSchema>;
