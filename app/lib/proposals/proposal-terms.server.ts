import { eq } from "drizzle-orm";
import { proposalTerms, type ProposalTerms } from "~/db/schema";
import { db } from "~/lib/platform/db.server";

// What a proposal includes and leaves out until the owner writes their own (common practice, no source).
export const DEFAULT_INCLUDED = [
  "Layout and excavation of the pit's footprint",
  "Compacted crushed-stone base",
  "Wall units, caps, liner and masonry adhesive as listed",
  "Clean-up and removal of packaging",
].join("\n");
export const DEFAULT_EXCLUDED = [
  "Permits and inspection fees the town requires (the homeowner or the contractor obtains them, as agreed)",
  "Gas lines, burners and electrical work (licensed trades only)",
  "Moving buried utilities, irrigation lines or tree roots found while digging",
  "Lawn repair beyond the work area",
].join("\n");

/** A company's proposal terms, or the defaults when the owner has not saved any. */
export async function getProposalTerms(companyId: number): Promise<ProposalTerms> {
  const [row] = await db.select().from(proposalTerms).where(eq(proposalTerms.companyId, companyId)).limit(1);
  return (
    row ?? {
      companyId,
      depositKind: "percent",
      depositBasisPoints: 3000,
      depositFixedCents: 0,
      validDays: 30,
      includedText: DEFAULT_INCLUDED,
      excludedText: DEFAULT_EXCLUDED,
      streetAddress: "",
      licenceNumber: "",
      narrowAccessIn: 36,
      narrowAccessAllowanceCents: 0,
      steepSlopeAllowanceCents: 0,
      updatedAt: new Date(0).toISOString(),
    }
  );
}

/** Saves the owner's terms (one row per company). */
export async function saveProposalTerms(
  companyId: number,
  values: Omit<ProposalTerms, "companyId" | "updatedAt">,
): Promise<void> {
  const at = new Date().toISOString();
  await db
    .insert(proposalTerms)
    .values({ ...values, companyId, updatedAt: at })
    .onConflictDoUpdate({ target: proposalTerms.companyId, set: { ...values, updatedAt: at } });
}
