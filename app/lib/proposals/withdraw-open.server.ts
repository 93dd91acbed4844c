import { and, eq, inArray } from "drizzle-orm";
import { leadEvents, proposals, type Lead } from "~/db/schema";
import type { writeTransaction } from "~/lib/platform/db.server";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";

type Tx = Parameters<Parameters<typeof writeTransaction>[0]>[0];

/**
 * Inside a write that stops a job: takes its papers still out (sent or accepted, unsigned) off the
 * table, with a timeline line each saying why, so nothing is signed or paid for on a stopped job.
 * Returns their checkout sessions, to close once the write is saved.
 */
export async function withdrawOpenPapers(
  tx: Tx,
  args: {
    lead: Pick<Lead, "id" | "companyId">;
    actorUserId: number;
    at: string;
    /** Stored on each paper as its withdraw reason. */
    reason: string;
    /** The timeline's words after "<number> withdrawn: ". */
    because: string;
    /** Only change orders (a signed job's proposal is not "out"); every kind when absent. */
    changeOrdersOnly?: boolean;
  },
): Promise<(string | null)[]> {
  const { lead, at } = args;
  const withdrawn = await tx
    .update(proposals)
    .set({ status: "withdrawn", withdrawnAt: at, withdrawReason: args.reason, updatedAt: at })
    .where(
      and(
        eq(proposals.leadId, lead.id),
        inArray(proposals.status, ["sent", "accepted"]),
        args.changeOrdersOnly ? eq(proposals.kind, "change-order") : undefined,
      ),
    )
    .returning({ documentJson: proposals.documentJson, checkoutSessionId: proposals.checkoutSessionId });
  for (const row of withdrawn)
    await tx.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: args.actorUserId,
      kind: "proposal-withdrawn",
      detail: `${parseProposalDocument(row.documentJson).number} withdrawn: ${args.because}`,
      createdAt: at,
    });
  return withdrawn.map((row) => row.checkoutSessionId);
}
