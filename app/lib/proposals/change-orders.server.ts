import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { emailOutbox, leadEvents, leads, proposals, type Company, type Lead, type Proposal } from "~/db/schema";
import { ProposalSentEmail } from "~/emails/proposal-emails";
import { readStoredPlan, type StoredPlan } from "~/lib/design/stored-plan";
import { changeOrderDeltaCents, jobTotals, type JobTotals } from "~/domain/proposal-money";
import { listCatalog } from "~/lib/catalog/catalog.server";
import { db } from "~/lib/platform/db.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { currentVersion, type DesignVersion } from "~/lib/leads/lead-workspace.server";
import { formatMoney } from "~/lib/format/money";
import {
  diffScope,
  parseProposalDocument,
  PROPOSAL_CAUTIONS,
  writeScope,
  type ProposalDocument,
} from "~/lib/proposals/proposal-document";
import { getProposalTerms } from "~/lib/proposals/proposal-terms.server";
import { expiryInstant, formatDay } from "~/lib/proposals/proposals.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { findSiteVisit } from "~/lib/leads/site-visit.server";
import { SPOIL_LABEL } from "~/lib/leads/site-visit-schema";
import { createToken } from "~/lib/auth/tokens.server";
import { formatZonedDate } from "~/lib/format/zoned-time";
import { isFinishedJob } from "~/lib/leads/lead-status";

export const FINISHED_JOB_MESSAGE =
  "This job is marked built: its balance was worked out from the papers signed before, so it takes no more change orders.";

/*
 * After signing, a staff revision of the design becomes a change order: the difference in scope and
 * price, its own short document, signed the same way as the proposal. The difference is added to
 * (or credited against) the balance. The job's totals are always the signed proposal plus the
 * signed change orders, summed from their rows, never kept as a running figure.
 */

/** The job's signed proposal (deposit paid), if any. */
export async function findSignedProposal(lead: Pick<Lead, "id" | "companyId">): Promise<Proposal | null> {
  const [row] = await db
    .select()
    .from(proposals)
    .where(
      and(
        eq(proposals.leadId, lead.id),
        eq(proposals.companyId, lead.companyId),
        eq(proposals.kind, "proposal"),
        eq(proposals.status, "signed"),
      ),
    )
    .orderBy(desc(proposals.signedAt))
    .limit(1);
  return row ?? null;
}

/** Signed change orders of a signed proposal, oldest first. */
export function listSignedChangeOrders(proposal: Pick<Proposal, "id">) {
  return db
    .select()
    .from(proposals)
    .where(and(eq(proposals.parentId, proposal.id), eq(proposals.kind, "change-order"), eq(proposals.status, "signed")))
    .orderBy(asc(proposals.signedAt));
}

/**
 * Why a change cannot be made: a credit larger than the job's whole contract as it stands would
 * leave a job worth less than nothing. Null when the change is allowed.
 */
export function creditBeyondContract(contractCents: number, deltaCents: number): string | null {
  if (contractCents + deltaCents >= 0) return null;
  return `${CREDIT_TOO_LARGE} ${formatMoney(contractCents)}, so the price difference can go no lower than −${formatMoney(contractCents)}.`;
}

/** How a refusal of too large a credit begins (the form shows it beside the price difference). */
export const CREDIT_TOO_LARGE = "A credit can be at most the job's current contract of";

/** The job's totals from the signed proposal and its signed change orders, cents. */
export async function jobTotalsFor(signed: Proposal): Promise<JobTotals> {
  const changes = await listSignedChangeOrders(signed);
  return jobTotals(
    { totalCents: signed.totalCents ?? 0, depositCents: signed.depositCents ?? 0 },
    changes.map((c) => c.priceCents),
  );
}

/** The scope the job stands at: the signed proposal's, or the latest signed change order's. */
async function signedScope(signed: Proposal): Promise<{ scope: string[]; plan: StoredPlan }> {
  const changes = await listSignedChangeOrders(signed);
  const latest = changes.at(-1) ?? signed;
  const document = parseProposalDocument(latest.documentJson);
  // A change order's scope is the whole job's scope after the change.
  return { scope: document.scope, plan: readStoredPlan(latest).plan };
}

export type ChangeOrderDraft = {
  signed: Proposal;
  totals: JobTotals;
  version: DesignVersion;
  added: string[];
  removed: string[];
  newScope: string[];
  /** The engine's price difference between the signed design and the revision, rounded to $10. */
  suggestedDeltaCents: number;
  validUntil: string;
};

/** What a change order would say for the latest revision; null when the job has no signed proposal. */
export async function draftChangeOrder(
  lead: Lead,
  company: Company,
  now = new Date(),
): Promise<ChangeOrderDraft | null> {
  const signed = await findSignedProposal(lead);
  if (!signed) return null;
  const [version, visit, catalog, totals, terms, current] = await Promise.all([
    currentVersion(lead),
    findSiteVisit(lead),
    listCatalog(company.id),
    jobTotalsFor(signed),
    getProposalTerms(company.id),
    signedScope(signed),
  ]);
  const name = (id: number | null | undefined) => (id ? (catalog.find((i) => i.id === id)?.name ?? null) : null);
  const choices = version.design.choices;
  const newScope = writeScope(
    version.plan,
    {
      stone: name(choices.stoneId) ?? lead.stoneName,
      cap: name(choices.capId),
      ring: name(choices.ringId),
      paver: name(choices.paverId),
      border: name(choices.borderId),
    },
    visit ? SPOIL_LABEL[visit.spoil] : null,
  );
  const { added, removed } = diffScope(current.scope, newScope);
  const before = current.plan.price?.breakdown.totalCents ?? 0;
  const after = version.plan.price?.breakdown.totalCents ?? before;
  const validUntil = new Intl.DateTimeFormat("en-CA", { timeZone: company.timeZone }).format(
    new Date(now.getTime() + Math.min(terms.validDays, 14) * 86_400_000),
  );
  return {
    signed,
    totals,
    version,
    added,
    removed,
    newScope,
    suggestedDeltaCents: Math.round(changeOrderDeltaCents(before, after) / 1000) * 1000,
    validUntil,
  };
}

/**
 * Sends a change order for the latest revision with the difference the office sets (cents, negative
 * for a credit). A change order still out for the job is withdrawn by the new one.
 */
export async function sendChangeOrder(args: {
  user: SessionUser;
  lead: Lead;
  company: Company;
  deltaCents: number;
  validUntil: string;
  origin: string;
  now?: Date;
}): Promise<Proposal | string> {
  const { user, lead, company, origin } = args;
  const now = args.now ?? new Date();
  if (isFinishedJob(lead)) return FINISHED_JOB_MESSAGE;
  const draft = await draftChangeOrder(lead, company, now);
  if (!draft) return "This job has no signed proposal to change.";
  if (draft.added.length === 0 && draft.removed.length === 0 && args.deltaCents === 0)
    return "Nothing changes: revise the design or set a price difference first.";
  const credit = creditBeyondContract(draft.totals.contractCents, args.deltaCents);
  if (credit) return credit;
  const at = now.toISOString();
  const parent = parseProposalDocument(draft.signed.documentJson);
  const count = (
    await db
      .select({ id: proposals.id })
      .from(proposals)
      .where(and(eq(proposals.parentId, draft.signed.id), eq(proposals.kind, "change-order")))
  ).length;
  const { token } = createToken();
  const document: ProposalDocument = {
    ...parent,
    kind: "change-order",
    title: `Change to the fire pit at ${lead.street}`,
    number: `Change order ${lead.id}-${count + 1}`,
    preparedOn: formatZonedDate(at, company.timeZone),
    validUntil: formatDay(args.validUntil),
    design: draft.version.design.summary.map((l) => ({ label: l.label, value: l.value })),
    scope: draft.newScope,
    addOns: [],
    allowances: [],
    fixedPriceCents: args.deltaCents,
    cautions: PROPOSAL_CAUTIONS,
    change: {
      previousContractCents: draft.totals.contractCents,
      deltaCents: args.deltaCents,
      added: draft.added,
      removed: draft.removed,
    },
  };
  const link = `${origin}/p/${token}`;
  const mail = await prepareOutboxRow({
    idempotencyKey: `change-order-sent/${token}`,
    companyId: company.id,
    to: lead.email,
    subject: `A change order from ${company.name} to sign`,
    template: ProposalSentEmail({
      companyName: company.name,
      companyPhone: company.phone,
      customerName: lead.customerName,
      title: document.title,
      totalText: formatMoney(args.deltaCents),
      validUntil: document.validUntil,
      link,
      isChangeOrder: true,
    }),
  });
  const open = await db
    .select({ id: proposals.id })
    .from(proposals)
    .where(and(eq(proposals.parentId, draft.signed.id), eq(proposals.status, "sent")));
  const [inserted] = await db.batch([
    db
      .insert(proposals)
      .values({
        companyId: company.id,
        leadId: lead.id,
        kind: "change-order",
        parentId: draft.signed.id,
        token,
        revisionId: draft.version.revisionId,
        documentJson: JSON.stringify(document),
        designJson: JSON.stringify(draft.version.design),
        planJson: JSON.stringify(draft.version.plan),
        priceCents: args.deltaCents,
        expiresAt: expiryInstant(args.validUntil, company.timeZone),
        sentByUserId: user.id,
        sentAt: at,
        createdAt: at,
        updatedAt: at,
      })
      .returning(),
    db
      .update(proposals)
      .set({ status: "withdrawn", withdrawnAt: at, withdrawReason: "Replaced by a newer change order.", updatedAt: at })
      .where(and(inArray(proposals.id, open.length ? open.map((o) => o.id) : [0]), eq(proposals.status, "sent"))),
    db.update(leads).set({ updatedAt: at }).where(eq(leads.id, lead.id)),
    db.insert(leadEvents).values({
      companyId: company.id,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "change-order-sent",
      detail: `${document.number} sent: ${args.deltaCents >= 0 ? "adds" : "credits"} ${formatMoney(Math.abs(args.deltaCents))}, valid until ${document.validUntil}.`,
      createdAt: at,
    }),
    db.insert(emailOutbox).values(mail),
  ]);
  return inserted[0]!;
}
