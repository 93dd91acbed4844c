import { z } from "zod";
import type { StoredPlan } from "~/lib/design/stored-plan";
import type { AddOn, DepositRule } from "~/domain/proposal-money";
import { formatInches } from "~/domain/units";
import { formatNumber } from "~/domain/number-text";

/*
 * A proposal as a document: everything the homeowner reads and signs, frozen when it is sent. The
 * page, the PDF and the e-mails all render this one object, so they can never disagree. Stored as
 * JSON with a version and parsed on every read.
 */

const lineSchema = z.object({ label: z.string(), value: z.string() });
const addOnSchema = z.object({ key: z.string(), label: z.string(), cents: z.number().int() });

export const proposalDocumentSchema = z.object({
  version: z.literal(1),
  kind: z.enum(["proposal", "change-order"]),
  title: z.string(),
  number: z.string(),
  letterhead: z.object({
    name: z.string(),
    address: z.string(),
    phone: z.string(),
    email: z.string(),
    licence: z.string(),
  }),
  customer: z.object({ name: z.string(), street: z.string(), town: z.string(), email: z.string() }),
  preparedOn: z.string(),
  validUntil: z.string(),
  design: z.array(lineSchema),
  scope: z.array(z.string()),
  siteFacts: z.array(z.string()),
  fixedPriceCents: z.number().int(),
  allowances: z.array(addOnSchema),
  addOns: z.array(addOnSchema),
  deposit: z.discriminatedUnion("kind", [
    z.object({ kind: z.literal("percent"), basisPoints: z.number().int() }),
    z.object({ kind: z.literal("fixed"), cents: z.number().int() }),
  ]),
  included: z.array(z.string()),
  excluded: z.array(z.string()),
  cautions: z.array(z.string()),
  // A change order: what it changes against the signed job.
  change: z
    .object({
      previousContractCents: z.number().int(),
      deltaCents: z.number().int(),
      added: z.array(z.string()),
      removed: z.array(z.string()),
    })
    .nullable(),
});

export type ProposalDocument = z.output<typeof proposalDocumentSchema>;

/** Reads a stored document; a document that does not parse is a bug, not bad input. */
export function parseProposalDocument(json: string): ProposalDocument {
  return proposalDocumentSchema.parse(JSON.parse(json));
}

/** The deposit rule as a homeowner reads it. */
export function describeDeposit(rule: DepositRule): string {
  return rule.kind === "percent"
    ? `${formatNumber(rule.basisPoints / 100, { maxFractionDigits: 2 })} % of the total`
    : "a fixed amount";
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/**
 * The work written out from the plan, one sentence a step, in the order the crew builds it:
 * base, courses, caps, liner, patio, clean-up. Lengths in inches as fractions.
 */
export function writeScope(
  plan: StoredPlan,
  names: { stone: string; cap: string | null; ring: string | null; paver: string | null; border: string | null },
  spoil: string | null,
): string[] {
  const f = formatInches;
  const aggregate = plan.materials.find((m) => m.key === "aggregate");
  const lines = [
    `Lay out the pit and excavate, then compact a base of crushed stone ${f(plan.base.radiusIn * 2)} across${aggregate ? ` (about ${aggregate.quantity} tons)` : ""}.`,
    `Build ${plural(plan.ring.courses, "course")} of ${names.stone}, ${plan.ring.unitsPerCourse} units a course, in running bond: a ${f(plan.ring.bowlDiameterIn)} bowl, ${f(plan.ring.outsideDiameterIn)} outside, ${f(plan.ring.wallHeightIn)} high${plan.caps ? " with the caps" : ""}.`,
  ];
  if (plan.ring.closure) lines.push("Cut a closure unit in each course so the ring closes at the size drawn.");
  if (plan.caps) {
    lines.push(
      `Cut and set ${plan.caps.count} ${names.cap ?? "cap"} caps, glued, overhanging ${f(plan.caps.innerOverhangIn)} toward the fire.`,
    );
  }
  if (plan.liner?.kind === "steel-ring")
    lines.push(
      `Set the ${names.ring ?? "steel ring"} insert (${f(plan.liner.outsideDiameterIn)}) with gravel between it and the wall.`,
    );
  if (plan.liner?.kind === "firebrick")
    lines.push(`Line the bowl with ${plan.liner.totalBricks} firebricks on edge, ${plural(plan.liner.rows, "row")}.`);
  if (plan.patio) {
    lines.push(
      `Lay a round patio ${f(plan.patio.outsideRadiusIn * 2)} across of ${names.paver ?? "pavers"} on a compacted base and bedding sand, with a ${names.border ?? "border"} edge, joints swept with sand.`,
    );
  }
  lines.push(`Clean up the work area${spoil ? `; dug soil: ${spoil.toLowerCase()}` : ""}.`);
  return lines;
}

/** Lines in `next` that `previous` lacks, and the other way round: a change order's scope difference. */
export function diffScope(previous: string[], next: string[]): { added: string[]; removed: string[] } {
  return { added: next.filter((l) => !previous.includes(l)), removed: previous.filter((l) => !next.includes(l)) };
}

/** The code cautions every proposal carries (sources named; local rules decide). */
export const PROPOSAL_CAUTIONS = [
  "Permits: the homeowner or the contractor, as agreed above, obtains any permit the town requires before work starts; local codes and the fire authority have the last word on where and how a fire pit may be built.",
  "Call 811 a few days before digging so buried gas, power and water lines are marked.",
  "Open burning rules: the International Fire Code §307.4.2 sets 25 ft from structures and combustibles for recreational fires, and §307.5 asks for an adult in attendance and a way to put the fire out; towns vary.",
  "Gas burners, lines and electrical work are for licensed trades only.",
];

export type { AddOn, DepositRule };

/** A proposal's state in the office's words. */
export const PROPOSAL_STATE_LABEL = {
  sent: "out for signature",
  accepted: "signed, waiting for the deposit",
  signed: "signed",
  withdrawn: "withdrawn",
  expired: "expired unsigned",
} as const;
