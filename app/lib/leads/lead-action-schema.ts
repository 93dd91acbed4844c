import { z } from "zod";
import { fieldErrors } from "~/lib/format/form-fields";
import { LEAD_STATUSES } from "~/db/enums";

const userIdOrNone = (label: string) =>
  z
    .string({ error: `Choose ${label}.` })
    .trim()
    .regex(/^(|\d{1,9})$/, { error: `Choose ${label} from the list.` })
    .transform((v) => (v === "" ? null : Number(v)));

/** The lead page's forms, told apart by `intent`; each field's message names the field. */
export const leadActionSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({
      intent: z.literal("status"),
      status: z.enum(LEAD_STATUSES, { error: `Stage must be one of: ${LEAD_STATUSES.join(", ")}.` }),
      reason: z.string().trim().max(200, "Reason must be at most 200 characters.").default(""),
    }),
    z.object({
      intent: z.literal("note"),
      note: z
        .string()
        .trim()
        .min(1, "Write the note first (up to 2,000 characters).")
        .max(2000, "Notes must be at most 2,000 characters."),
    }),
    z.object({ intent: z.literal("assign"), assigneeId: userIdOrNone("an estimator") }),
    z.object({ intent: z.literal("crew"), crewUserId: userIdOrNone("a crew member") }),
    z.object({
      intent: z.literal("send-revision"),
      revisionId: z
        .string({ error: "Choose the revision to send." })
        .regex(/^\d{1,9}$/, { error: "Choose the revision to send." })
        .transform(Number),
    }),
    z.object({
      intent: z.literal("refund"),
      proposalId: z
        .string()
        .regex(/^\d{1,9}$/, { error: "Choose the proposal whose deposit to refund." })
        .transform(Number),
      reason: z
        .string()
        .trim()
        .min(3, "Say why the deposit is refunded (3 to 200 characters).")
        .max(200, "Say why the deposit is refunded (3 to 200 characters)."),
    }),
  ],
  { error: "Unknown action: the form must say what it does (status, note, assign, crew, send-revision or refund)." },
);

export type LeadAction = z.output<typeof leadActionSchema>;

/** Field name → first message. */
export const leadActionErrors = (error: z.ZodError): Record<string, string> => fieldErrors(error);
