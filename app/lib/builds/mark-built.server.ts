import { and, eq, inArray } from "drizzle-orm";
import { leadEvents, leads, type LeadStatus } from "~/db/schema";
import { STATUS_LABEL } from "~/lib/leads/lead-status";
import { writeTransaction } from "~/lib/platform/db.server";

// A job may be marked built from any signed step short of built itself.
const BUILDABLE: LeadStatus[] = ["signed", "stone-ordered", "build-booked"];

export type MarkBuiltResult = { ok: true; from: LeadStatus } | { ok: false; status: 404 | 409; message: string };

/**
 * The job is built: its stage moves to "built" and the timeline says who said so. Called by the
 * crew's job page and by the office; a second call for the same job answers 409 and changes nothing.
 */
export async function markJobBuilt(args: {
  companyId: number;
  leadId: number;
  actorUserId: number;
  at?: string;
}): Promise<MarkBuiltResult> {
  const at = args.at ?? new Date().toISOString();
  return writeTransaction(async (tx) => {
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
    return { ok: true, from: lead.status } as const;
  });
}
