import { createHash } from "node:crypto";
import { and, eq, inArray, notExists, sql } from "drizzle-orm";
import {
  companies,
  emailOutbox,
  leadEvents,
  leads,
  proposals,
  type Company,
  type Lead,
  type Proposal,
} from "~/db/schema";
import { ProposalSignedEmail } from "~/emails/proposal-emails";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { isFinishedJob, STATUS_LABEL } from "~/lib/leads/lead-status";
import { formatMoney } from "~/lib/format/money";
import type { ProposalDocument } from "~/lib/proposals/proposal-document";
import { proposalFigures, renderProposalPdf, type SignatureFacts } from "~/lib/proposals/proposal-pdf.server";
import { formatZonedDateTime } from "~/lib/format/zoned-time";
import { creditBeyondContract, jobTotalsFor } from "~/lib/proposals/change-orders.server";

/*
 * Electronic signature (US ESIGN Act, 15 U.S.C. §7001, and UETA): the homeowner consents to sign
 * electronically, shows intent by typing their full name, and gets a copy they can keep. We record
 * who, when, the address and browser, the add-ons chosen, and the SHA-256 of the exact PDF accepted;
 * the signed PDF adds a signature block with those facts. A signed document never changes: the
 * bytes are stored, and the update only ever applies to a proposal still "sent".
 */

export function sha256Hex(bytes: Uint8Array): string {
  return createHash("sha256").update(bytes).digest("hex");
}

export type AcceptInput = { name: string; chosenKeys: string[]; ip: string; userAgent: string; now?: Date };
export type AcceptResult = { ok: true; proposal: Proposal } | { ok: false; status: number; message: string };

/** Whether a proposal can still be accepted now (sent and not past its date). */
export function isOpenForSignature(proposal: Pick<Proposal, "status" | "expiresAt">, now: Date): boolean {
  return proposal.status === "sent" && now.toISOString() < proposal.expiresAt;
}

/**
 * Records the homeowner's acceptance: renders the accepted PDF, hashes it, renders the signed PDF
 * with the signature block, and in one batch stores both, moves the proposal on, writes the timeline
 * event and e-mails the signed PDF to both sides. A proposal with a deposit waits for it ("accepted");
 * a change order, or a proposal with no deposit, is signed at once.
 */
export async function acceptProposal(args: {
  proposal: Proposal;
  lead: Lead;
  document: ProposalDocument;
  input: AcceptInput;
}): Promise<AcceptResult> {
  const { proposal, lead, document, input } = args;
  const now = input.now ?? new Date();
  if (!isOpenForSignature(proposal, now)) {
    return {
      ok: false,
      status: 409,
      message:
        proposal.status === "sent"
          ? "This proposal has expired: ask the contractor for a new one."
          : `This ${document.kind === "change-order" ? "change order" : "proposal"} can no longer be signed.`,
    };
  }
  const isChange = document.kind === "change-order";
  // A change order cannot move a balance already fixed: refused once the job is marked built.
  const [current] = await db
    .select({ status: leads.status, pausedStage: leads.pausedStage })
    .from(leads)
    .where(eq(leads.id, lead.id));
  if (current?.status === "not-going-ahead")
    return {
      ok: false,
      status: 409,
      message: "The contractor has marked this job as not going ahead, so it can no longer be signed: ask them.",
    };
  if (isChange && current && isFinishedJob(current))
    return {
      ok: false,
      status: 409,
      message:
        "The job is built and its balance is set, so this change order can no longer be signed: ask the contractor.",
    };
  // Two credits sent on the same contract may each fit alone and not together: the one signed second
  // is refused when it would take the job below nothing.
  if (isChange && document.change!.deltaCents < 0 && proposal.parentId !== null) {
    const [parent] = await db.select().from(proposals).where(eq(proposals.id, proposal.parentId));
    if (parent && creditBeyondContract((await jobTotalsFor(parent)).contractCents, document.change!.deltaCents))
      return {
        ok: false,
        status: 409,
        message:
          "This credit is more than the job's total now that other changes are signed, so it can no longer be signed: ask the contractor.",
      };
  }
  let figures: ReturnType<typeof proposalFigures>;
  try {
    figures = proposalFigures(document, input.chosenKeys);
  } catch {
    return { ok: false, status: 400, message: "Choose add-ons from the list on this page." };
  }
  const [company] = (await db.select().from(companies).where(eq(companies.id, proposal.companyId)).limit(1)) as [
    Company,
  ];
  const at = now.toISOString();
  const chosenKeys = figures.chosen.map((a) => a.key);
  const acceptedPdf = await renderProposalPdf(document, { chosenKeys, createdAt: proposal.sentAt });
  const acceptedSha256 = sha256Hex(acceptedPdf);
  const signature: SignatureFacts = {
    name: input.name,
    signedAtLabel: formatZonedDateTime(at, company.timeZone),
    signedAtIso: at,
    ip: input.ip,
    userAgent: input.userAgent,
    acceptedSha256,
  };
  const signedPdf = await renderProposalPdf(document, { chosenKeys, createdAt: proposal.sentAt, signature });

  const totalCents = isChange ? document.change!.previousContractCents + document.change!.deltaCents : figures.total;
  const deposit = isChange ? 0 : figures.deposit;
  const signsNow = deposit === 0;
  const attachment = {
    filename: `${document.number.toLowerCase().replace(/[^a-z0-9]+/g, "-")}-signed.pdf`,
    content: signedPdf.toString("base64"),
    contentType: "application/pdf",
  };
  const common = {
    companyName: company.name,
    customerName: lead.customerName,
    title: document.title,
    number: document.number,
    totalText: formatMoney(isChange ? document.change!.deltaCents : totalCents),
    depositText: signsNow ? null : formatMoney(deposit),
    signedAt: signature.signedAtLabel,
    sha256: acceptedSha256,
    link: "",
  };
  const mails = await Promise.all([
    prepareOutboxRow({
      idempotencyKey: `proposal-signed/${proposal.id}`,
      companyId: company.id,
      to: lead.email,
      subject: `Signed: ${document.number} with ${company.name}`,
      template: ProposalSignedEmail({ ...common, recipientName: lead.customerName, forCompany: false }),
      attachments: [attachment],
    }),
    prepareOutboxRow({
      idempotencyKey: `proposal-signed-company/${proposal.id}`,
      companyId: company.id,
      to: company.email,
      subject: `${lead.customerName} signed ${document.number}`,
      template: ProposalSignedEmail({ ...common, recipientName: company.name, forCompany: true }),
      attachments: [attachment],
    }),
  ]);

  // One write transaction: a signature that loses (signed a moment ago, the job built meanwhile, a
  // credit past the contract) writes nothing at all, no timeline line and no e-mail.
  const updated = await writeTransaction(async (tx) => {
    const rows = await tx
      .update(proposals)
      .set({
        status: signsNow ? "signed" : "accepted",
        signerName: input.name,
        signedAt: at,
        signerIp: input.ip,
        signerUserAgent: input.userAgent,
        chosenAddOnsJson: JSON.stringify(chosenKeys),
        totalCents,
        depositCents: deposit,
        acceptedPdfSha256: acceptedSha256,
        acceptedPdf,
        signedPdf,
        ...(signsNow && !isChange ? { depositPaidAt: at } : {}),
        updatedAt: at,
      })
      .where(
        and(
          eq(proposals.id, proposal.id),
          eq(proposals.status, "sent"),
          // Checked again in the write itself: the job may be marked built while the PDFs render.
          isChange
            ? notExists(
                db
                  .select({ id: leads.id })
                  .from(leads)
                  .where(and(eq(leads.id, lead.id), inArray(leads.status, ["built", "paid-in-full"]))),
              )
            : undefined,
          // A credit signed at the same moment as another is checked against the papers as written.
          isChange && document.change!.deltaCents < 0 && proposal.parentId !== null
            ? sql`(select coalesce(p.total_cents, 0) from proposals p where p.id = ${proposal.parentId})
                + coalesce((select sum(c.price_cents) from proposals c
                    where c.parent_id = ${proposal.parentId} and c.kind = 'change-order' and c.status = 'signed'), 0)
                + ${document.change!.deltaCents} >= 0`
            : undefined,
        ),
      )
      .returning();
    if (rows.length === 0) return rows;
    await tx.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      kind: isChange ? "change-order-signed" : "proposal-accepted",
      detail: isChange
        ? `${document.number} signed by ${input.name}: ${formatMoney(document.change!.deltaCents)}; the job is now ${formatMoney(totalCents)}.`
        : `${document.number} signed by ${input.name} for ${formatMoney(totalCents)}${chosenKeys.length ? ` with ${figures.chosen.map((a) => a.label).join(", ")}` : ""}; ${signsNow ? "no deposit asked." : `deposit of ${formatMoney(deposit)} to pay.`}`,
      createdAt: at,
    });
    await tx.insert(emailOutbox).values(mails).onConflictDoNothing();
    // A proposal signed with no deposit signs the job at once.
    await tx
      .update(leads)
      .set({ status: "signed", updatedAt: at })
      .where(
        and(
          eq(leads.id, lead.id),
          signsNow && !isChange ? inArray(leads.status, ["proposal-out", "on-hold"]) : eq(leads.id, -1),
        ),
      );
    return rows;
  });
  if (updated.length === 0)
    return { ok: false, status: 409, message: "This proposal was signed or changed a moment ago: reload the page." };
  return { ok: true, proposal: updated[0]! };
}

/** The stage words for a proposal's timeline detail. */
export const SIGNED_STAGE_LABEL = STATUS_LABEL.signed;
