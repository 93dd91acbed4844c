import { and, eq, inArray } from "drizzle-orm";
import { companies, leadEvents, leads, proposals, type LeadStatus } from "~/db/schema";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { STATUS_LABEL } from "~/lib/leads/lead-status";
import { writeTransaction, db } from "~/lib/platform/db.server";
import { openBalanceInTx, prepareCompletion } from "~/lib/builds/job-balance.server";

// A job may be marked built from any signed step short of built itself.
const BUILDABLE: LeadStatus[] = ["signed", "stone-ordered", "build-booked"];

export type MarkBuiltResult = { ok: true; from: LeadStatus } | { ok: false; status: 404 | 409; message: string };

export const OPEN_CHANGE_ORDER_REASON = "The job was marked built before it was signed; its balance is set.";

/** Thrown inside the transaction to undo its writes when the job's papers changed while it ran. */
class PapersChanged extends Error {}

/**
 * The job is built: its stage moves to "built", the timeline says who said so, and in the same
 * transaction the balance falls due (signed proposal with its add-ons + signed change orders −
 * deposit) and the homeowner's completion e-mail (photos, balance, pay link, care notes) is queued.
 * Called by the crew's job page and by the office; a second call for the same job answers 409 and
 * changes nothing.
 */
export async function markJobBuilt(args: {
  companyId: number;
  leadId: number;
  actorUserId: number;
  at?: string;
}): Promise<MarkBuiltResult> {
  const at = args.at ?? new Date().toISOString();
  // The balance is worked out and the e-mail rendered first; the transaction re-checks the figures.
  const [found] = await db
    .select({ lead: leads, company: companies })
    .from(leads)
    .innerJoin(companies, eq(companies.id, leads.companyId))
    .where(and(eq(leads.id, args.leadId), eq(leads.companyId, args.companyId)));
  if (!found) return { ok: false, status: 404, message: "We could not find that job." };
  const prepared = BUILDABLE.includes(found.lead.status) ? await prepareCompletion(found.lead, found.company) : null;
  try {
    return await writeTransaction(async (tx) => {
      const [lead] = await tx
        .select({ status: leads.status })
        .from(leads)
        .where(and(eq(leads.id, args.leadId), eq(leads.companyId, args.companyId)));
      if (!lead) return { ok: false, status: 404, message: "We could not find that job." } as const;
      const moved = await tx
        .update(leads)
        .set({ status: "built", updatedAt: at })
        .where(and(eq(leads.id, args.leadId), inArray(leads.status, BUILDABLE)))
        .returning({ id: leads.id });
      if (moved.length === 0)
        return {
          ok: false,
          status: 409,
          message: `This job is at "${STATUS_LABEL[lead.status]}": only a signed job not yet built can be marked built.`,
        } as const;
      await tx.insert(leadEvents).values({
        companyId: args.companyId,
        leadId: args.leadId,
        actorUserId: args.actorUserId,
        kind: "built",
        detail: `Marked built. ${STATUS_LABEL[lead.status]} → ${STATUS_LABEL.built}.`,
        createdAt: at,
      });
      if (prepared) {
        const opened = await openBalanceInTx(tx, {
          lead: { id: args.leadId, companyId: args.companyId },
          prepared,
          actorUserId: args.actorUserId,
          at,
        });
        if (opened === "changed") throw new PapersChanged();
      }
      // A change order still out can no longer be signed (the balance is set): withdraw it, so the
      // homeowner's page and the office's list stop offering it.
      const withdrawn = await tx
        .update(proposals)
        .set({ status: "withdrawn", withdrawnAt: at, withdrawReason: OPEN_CHANGE_ORDER_REASON, updatedAt: at })
        .where(and(eq(proposals.leadId, args.leadId), eq(proposals.kind, "change-order"), eq(proposals.status, "sent")))
        .returning({ documentJson: proposals.documentJson });
      if (withdrawn.length)
        await tx.insert(leadEvents).values({
          companyId: args.companyId,
          leadId: args.leadId,
          actorUserId: args.actorUserId,
          kind: "change-order-withdrawn",
          detail: `${withdrawn.map((w) => parseProposalDocument(w.documentJson).number).join(", ")} withdrawn unsigned: ${OPEN_CHANGE_ORDER_REASON}`,
          createdAt: at,
        });
      return { ok: true, from: lead.status } as const;
    });
  } catch (error) {
    if (error instanceof PapersChanged)
      return {
        ok: false,
        status: 409,
        message: "The job's proposal or change orders changed just now: look again, then mark it built.",
      };
    throw error;
  }
}
