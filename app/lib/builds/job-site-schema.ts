import { z } from "zod";
import { MAX_HOURS, MIN_HOURS } from "~/lib/builds/job-site-limits";
import { toSingleLine } from "~/lib/format/clean-text";
import { formId } from "~/lib/format/form-fields";

/*
 * What the crew sends from a job on site: step ticks (queued on the phone when there is no signal),
 * hours per person per day, and material used beyond the order. Shared by the page and the server.
 */

export { MAX_HOURS, MIN_HOURS } from "~/lib/builds/job-site-limits";
/** How many queued tick changes one sync may carry. */
export const MAX_TICK_CHANGES = 200;

const isCalendarDay = (s: string) => {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(s)) return false;
  const date = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(date.getTime()) && date.toISOString().slice(0, 10) === s;
};

/**
 * A plain decimal as people type it ("7.5", "8,25", ".5"), or NaN: Number() alone would also take
 * "0x8", "1e3", "Infinity" and "" as numbers.
 */
function readDecimal(text: string): number {
  return /^(?:\d+(?:[.,]\d*)?|[.,]\d+)$/.test(text) ? Number(text.replace(",", ".")) : Number.NaN;
}

/** One change of one step, as the phone recorded it. */
export const tickChangeSchema = z.object(
  {
    clientId: z.uuid({ error: "Each change needs the phone's id for it (a UUID)." }),
    stepKey: z
      .string({ error: "Each change names its step." })
      .regex(/^[a-z0-9-]{1,40}$/, { error: "A step key is 1 to 40 lower-case letters, digits or dashes." }),
    done: z.boolean({ error: "Each change says whether the step is done (true or false)." }),
    changedAt: z.iso.datetime({ error: "Each change carries when the phone recorded it (ISO-8601 UTC)." }),
  },
  { error: "Each change is an object with clientId, stepKey, done and changedAt." },
);
export type TickChange = z.output<typeof tickChangeSchema>;

const SYNC_SHAPE = 'Send the changes as JSON: {"changes": [...]}.';

export const tickSyncSchema = z.object(
  {
    changes: z
      .array(tickChangeSchema, { error: '"changes" must be a list of tick changes.' })
      .min(1, { error: "Send at least one change." })
      .max(MAX_TICK_CHANGES, { error: `Send at most ${MAX_TICK_CHANGES} changes at a time.` }),
  },
  { error: SYNC_SHAPE },
);

/** Hours worked: who (one of the build's crew), which day, how many hours in quarter hours. */
export const hoursSchema = z.object({
  workerUserId: formId("Choose who worked, from the build's crew."),
  day: z
    .string({ error: "Enter the day worked." })
    .trim()
    .refine(isCalendarDay, { error: "Day must be a date, like 2026-12-04." }),
  hours: z
    .string({ error: "Enter the hours worked." })
    .trim()
    .min(1, "Enter the hours worked.")
    .transform((s, ctx) => {
      const n = readDecimal(s);
      if (!Number.isFinite(n) || n < MIN_HOURS || n > MAX_HOURS || Math.round(n * 4) !== n * 4) {
        ctx.addIssue({
          code: "custom",
          message: `Hours must be between ${MIN_HOURS} and ${MAX_HOURS}, in quarter hours (like 7.5 or 8.25).`,
        });
        return z.NEVER;
      }
      return n;
    }),
});
export type HoursInput = z.output<typeof hoursSchema>;

const CHOOSE_ITEM = "Choose an item from the list, or “Something else”.";
const optionalId = z
  .string()
  .trim()
  .optional()
  .transform((s) => s ?? "")
  .pipe(
    z.union(
      [
        z.literal("").transform(() => null),
        z
          .string()
          .regex(/^[1-9]\d{0,8}$/, { error: CHOOSE_ITEM })
          .transform(Number),
      ],
      { error: CHOOSE_ITEM },
    ),
  );

/**
 * Extra material: a catalog item (its price is the cost) or a description with the cost paid; the
 * quantity either way. Cost in dollars as typed, stored in cents.
 */
export const extraSchema = z
  .object({
    catalogItemId: optionalId,
    // One line: control, bidi and zero-width characters go before the length is counted.
    description: z
      .string()
      .optional()
      .transform((s) => toSingleLine(s ?? "").trim())
      .pipe(z.string().max(200, "Description must be at most 200 characters.")),
    quantity: z
      .string({ error: "Enter the quantity used." })
      .trim()
      .min(1, "Enter the quantity used.")
      .transform((s, ctx) => {
        // Kept to hundredths: checked after rounding, so 0.001 is not stored as 0.
        const n = Math.round(readDecimal(s) * 100) / 100;
        if (!Number.isFinite(n) || n <= 0 || n > 10_000) {
          ctx.addIssue({ code: "custom", message: "Quantity must be a number from 0.01 to 10,000." });
          return z.NEVER;
        }
        return n;
      }),
    cost: z
      .string()
      .trim()
      .optional()
      .transform((s) => s ?? ""),
  })
  .transform((value, ctx) => {
    let costCents: number | null = null;
    if (value.catalogItemId === null) {
      if (value.description.length < 2)
        ctx.addIssue({
          code: "custom",
          path: ["description"],
          message: "Say what was used (2 to 200 characters), or choose an item from the list.",
        });
      const n = readDecimal(value.cost.replace(/^\$/, "").replace(/,(?=\d{3}(?:\D|$))/g, ""));
      if (value.cost === "" || !Number.isFinite(n) || n < 0 || n > 100_000)
        ctx.addIssue({
          code: "custom",
          path: ["cost"],
          message: "Cost must be an amount in dollars between 0 and 100,000, like 38.50.",
        });
      else costCents = Math.round(n * 100);
    }
    return { ...value, costCents };
  });
export type ExtraInput = z.output<typeof extraSchema>;
