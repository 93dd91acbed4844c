import { and, desc, eq, inArray, sql } from "drizzle-orm";
import type Stripe from "stripe";
import {
  emailOutbox,
  leadEvents,
  leads,
  proposals,
  type Company,
  type Lead,
  type Proposal,
  type ProposalTerms,
  type SiteVisit,
} from "~/db/schema";
import { ProposalSentEmail } from "~/emails/proposal-emails";
import { basePriceCents, type AddOn, type DepositRule } from "~/domain/proposal-money";
import { checkSite, siteAllowances } from "~/domain/site-checks";
import { listCatalog } from "~/lib/catalog/catalog.server";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { expireCheckoutSessions } from "~/lib/platform/payments.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { settleStageStatements } from "~/lib/leads/job-stage.server";
import { isSignedStage, STATUS_LABEL } from "~/lib/leads/lead-status";
import { currentVersion, type DesignVersion } from "~/lib/leads/lead-workspace.server";
import { formatMoney } from "~/lib/format/money";
import {
  PROPOSAL_CAUTIONS,
  parseProposalDocument,
  writeScope,
  type ProposalDocument,
} from "~/lib/proposals/proposal-document";
import { getProposalTerms } from "~/lib/proposals/proposal-terms.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { isOfficeRole } from "~/lib/auth/staff.server";
import { findSiteVisit } from "~/lib/leads/site-visit.server";
import { SLOPE_LABEL, SOIL_LABEL, SPOIL_LABEL, UTILITY_LABEL } from "~/lib/leads/site-visit-schema";
import { createToken } from "~/lib/auth/tokens.server";
import { formatZonedDate, startOfZonedDay, nextDay } from "~/lib/format/zoned-time";

/*
 * Proposals: written by the office from the current design, sent by e-mail through the outbox, read
 * by the homeowner at an unguessable link. Each row freezes its document when sent; later changes
 * to the design, the catalog or the terms never alter a proposal already out.
 */

// Staff may send a proposal until the job is signed; a newer one replaces the one still out.
const OPEN_STATES = ["sent", "accepted"] as const;

export type ProposalDraft = {
  fixedPriceCents: number;
  addOns: AddOn[];
  deposit: DepositRule;
  validUntil: string;
  included: string;
  excluded: string;
  scope: string[];
  siteFacts: string[];
  allowances: { key: string; label: string; cents: number }[];
  version: DesignVersion;
};

function visitFacts(visit: SiteVisit | null, company: Company, terms: ProposalTerms): string[] {
  if (!visit) return [];
  const facts = [
    `Nearest structure ${visit.structureFt} ft from the centre of the pit; property line ${visit.propertyLineFt} ft; ${visit.branchesFt === null ? "no branches over the spot" : `branches ${visit.branchesFt} ft away`}.`,
    `Ground: ${SLOPE_LABEL[visit.slope].toLowerCase()}; soil: ${SOIL_LABEL[visit.soil].toLowerCase()}.`,
    `Way in: ${visit.accessWidthIn} in at the narrowest point. Utilities: ${UTILITY_LABEL[visit.utilityMarks].toLowerCase()}.`,
  ];
  return [
    ...facts,
    ...checkSite(visit, { setbackFt: company.setbackFt, narrowAccessIn: terms.narrowAccessIn }).map((c) => c.message),
  ];
}

/** A day `days` ahead in the company's zone, YYYY-MM-DD. */
function dayAhead(now: Date, days: number, timeZone: string): string {
  return formatIsoDay(new Date(now.getTime() + days * 86_400_000), timeZone);
}

// en-CA writes dates as YYYY-MM-DD.
function formatIsoDay(instant: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(
    instant,
  );
}

/** A calendar day (YYYY-MM-DD) in words: "Dec 31, 2026". */
export function formatDay(day: string): string {
  return new Intl.DateTimeFormat("en-US", { dateStyle: "medium", timeZone: "UTC" }).format(
    new Date(`${day}T12:00:00Z`),
  );
}

/** What the compose form starts from: the current design's plan and price, the visit and the company's terms. */
export async function draftProposal(lead: Lead, company: Company, now = new Date()): Promise<ProposalDraft> {
  const [version, visit, terms, catalog] = await Promise.all([
    currentVersion(lead),
    findSiteVisit(lead),
    getProposalTerms(company.id),
    listCatalog(company.id),
  ]);
  const name = (id: number | null | undefined) => (id ? (catalog.find((i) => i.id === id)?.name ?? null) : null);
  const choices = version.design.choices;
  const allowances = visit ? siteAllowances(visit, terms) : [];
  // The estimate's total to the nearest $10: a fixed price, not a range.
  const estimate = version.plan.price ? Math.round(version.plan.price.breakdown.totalCents / 1000) * 1000 : 0;
  return {
    fixedPriceCents: estimate,
    addOns: [],
    deposit:
      terms.depositKind === "percent"
        ? { kind: "percent", basisPoints: terms.depositBasisPoints }
        : { kind: "fixed", cents: terms.depositFixedCents },
    validUntil: dayAhead(now, terms.validDays, company.timeZone),
    included: terms.includedText,
    excluded: terms.excludedText,
    scope: writeScope(
      version.plan,
      {
        stone: name(choices.stoneId) ?? lead.stoneName,
        cap: name(choices.capId),
        ring: name(choices.ringId),
        paver: name(choices.paverId),
        border: name(choices.borderId),
      },
      visit ? SPOIL_LABEL[visit.spoil] : null,
    ),
    siteFacts: visitFacts(visit, company, terms),
    allowances,
    version,
  };
}

const splitLines = (text: string) =>
  text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean);

/** The moment a proposal dated `day` stops being valid: the end of that day in the company's zone. */
export function expiryInstant(day: string, timeZone: string): string {
  return startOfZonedDay(nextDay(day), timeZone);
}

export type SendInput = {
  fixedPriceCents: number;
  addOns: AddOn[];
  validUntil: string;
  included: string;
  excluded: string;
};

/** The letterhead from the company and its terms. */
function letterhead(company: Company, terms: ProposalTerms) {
  return {
    name: company.name,
    address: terms.streetAddress || company.town,
    phone: company.phone,
    email: company.email,
    licence: terms.licenceNumber,
  };
}

/**
 * Sends a proposal: freezes its document, writes it with a timeline event, the stage move and the
 * homeowner's e-mail in one batch. A proposal still out for this job is withdrawn by the new one.
 */
export async function sendProposal(args: {
  user: SessionUser;
  lead: Lead;
  company: Company;
  input: SendInput;
  origin: string;
  now?: Date;
  /** Where the replaced proposal's checkout is closed; the configured payment service when absent. */
  payments?: Pick<Stripe, "checkout">;
}): Promise<Proposal> {
  const { user, lead, company, input, origin } = args;
  const now = args.now ?? new Date();
  if (isSignedStage(lead.status)) throw new Error("A signed job takes change orders, not a new proposal.");
  const [draft, terms] = await Promise.all([draftProposal(lead, company, now), getProposalTerms(company.id)]);
  const at = now.toISOString();
  const { token } = createToken();
  const [{ n }] = (await db
    .select({ n: sql<number>`count(*)` })
    .from(proposals)
    .where(eq(proposals.leadId, lead.id))) as [{ n: number }];
  const document: ProposalDocument = {
    version: 1,
    kind: "proposal",
    title: `A fire pit at ${lead.street}`,
    number: `Proposal ${lead.id}-${n + 1}`,
    letterhead: letterhead(company, terms),
    customer: { name: lead.customerName, street: lead.street, town: lead.town, email: lead.email },
    preparedOn: formatZonedDate(at, company.timeZone),
    validUntil: formatDay(input.validUntil),
    design: draft.version.design.summary.map((l) => ({ label: l.label, value: l.value })),
    scope: draft.scope,
    siteFacts: draft.siteFacts,
    fixedPriceCents: input.fixedPriceCents,
    allowances: draft.allowances,
    addOns: input.addOns,
    deposit: draft.deposit,
    included: splitLines(input.included),
    excluded: splitLines(input.excluded),
    cautions: PROPOSAL_CAUTIONS,
    change: null,
  };
  const link = `${origin}/p/${token}`;
  const mail = await prepareOutboxRow({
    idempotencyKey: `proposal-sent/${token}`,
    companyId: company.id,
    to: lead.email,
    subject: `Your fire pit proposal from ${company.name}`,
    template: ProposalSentEmail({
      companyName: company.name,
      companyPhone: company.phone,
      customerName: lead.customerName,
      title: document.title,
      totalText: formatMoney(basePriceCents(document.fixedPriceCents, document.allowances)),
      validUntil: document.validUntil,
      link,
      isChangeOrder: false,
    }),
  });
  const open = await db
    .select({ id: proposals.id, checkoutSessionId: proposals.checkoutSessionId })
    .from(proposals)
    .where(and(eq(proposals.leadId, lead.id), inArray(proposals.status, [...OPEN_STATES])));
  // Sending a proposal picks a job marked not going ahead up again; one on hold stays on hold.
  const movesStage = lead.status !== "proposal-out" && lead.status !== "on-hold";
  const [inserted] = await db.batch([
    db
      .insert(proposals)
      .values({
        companyId: company.id,
        leadId: lead.id,
        kind: "proposal",
        token,
        revisionId: draft.version.revisionId,
        documentJson: JSON.stringify(document),
        designJson: JSON.stringify(draft.version.design),
        planJson: JSON.stringify(draft.version.plan),
        priceCents: basePriceCents(document.fixedPriceCents, document.allowances),
        expiresAt: expiryInstant(input.validUntil, company.timeZone),
        sentByUserId: user.id,
        sentAt: at,
        createdAt: at,
        updatedAt: at,
      })
      .returning(),
    // Only a proposal not yet paid for can be replaced; states never move backwards.
    db
      .update(proposals)
      .set({ status: "withdrawn", withdrawnAt: at, withdrawReason: "Replaced by a newer proposal.", updatedAt: at })
      .where(
        and(
          inArray(proposals.id, open.length ? open.map((o) => o.id) : [0]),
          inArray(proposals.status, [...OPEN_STATES]),
        ),
      ),
    db
      .update(leads)
      .set({
        ...(movesStage ? { status: "proposal-out" as const } : {}),
        ...(lead.status === "not-going-ahead" ? { stopReason: null, pausedStage: null } : {}),
        calledBackAt: lead.calledBackAt ?? at,
        updatedAt: at,
      })
      .where(and(eq(leads.id, lead.id), eq(leads.companyId, lead.companyId))),
    db.insert(leadEvents).values({
      companyId: company.id,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "proposal-sent",
      detail: `${document.number} sent: ${formatMoney(basePriceCents(document.fixedPriceCents, document.allowances))}${input.addOns.length ? ` with ${input.addOns.length} optional add-on${input.addOns.length === 1 ? "" : "s"}` : ""}, valid until ${document.validUntil}.${movesStage ? ` ${STATUS_LABEL[lead.status]} → ${STATUS_LABEL["proposal-out"]}.` : ""}`,
      createdAt: at,
    }),
    db.insert(emailOutbox).values(mail),
  ]);
  // The replaced proposal's payment page closes with it.
  await expireCheckoutSessions(
    open.map((o) => o.checkoutSessionId),
    args.payments,
  );
  return inserted[0]!;
}

/** A lead's proposals and change orders, newest first. */
export function listProposals(lead: Pick<Lead, "id" | "companyId">) {
  return db
    .select()
    .from(proposals)
    .where(and(eq(proposals.leadId, lead.id), eq(proposals.companyId, lead.companyId)))
    .orderBy(desc(proposals.createdAt), desc(proposals.id));
}

/** A proposal by its link, with its lead and company; null when the token is unknown. */
export async function findProposalByToken(token: string) {
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) return null;
  const [row] = await db.select().from(proposals).where(eq(proposals.token, token)).limit(1);
  if (!row) return null;
  const [lead] = await db.select().from(leads).where(eq(leads.id, row.leadId)).limit(1);
  return lead ? { proposal: row, lead, document: parseProposalDocument(row.documentJson) } : null;
}

export type LinkState = "open" | "accepted" | "signed" | "expired" | "withdrawn";

/** What the link shows: open to sign, waiting for the deposit, signed, or closed (and why). */
export function linkStateOf(proposal: Pick<Proposal, "status" | "expiresAt">, now: Date): LinkState {
  if ((proposal.status === "sent" || proposal.status === "accepted") && now.toISOString() >= proposal.expiresAt)
    return "expired";
  return proposal.status === "sent" ? "open" : proposal.status;
}

/** Whether this visit counts as the homeowner opening the link: not staff of the company, not a closed link. */
export function countsAsOpen(
  proposal: Pick<Proposal, "status" | "expiresAt" | "companyId">,
  viewer: Pick<SessionUser, "role" | "companyId"> | null,
  now: Date,
): boolean {
  const isStaffPreview = viewer !== null && isOfficeRole(viewer.role) && viewer.companyId === proposal.companyId;
  const state = linkStateOf(proposal, now);
  return !isStaffPreview && state !== "withdrawn" && state !== "expired";
}

/** Counts the homeowner opening the link (staff previews do not count). */
export async function recordOpened(proposalId: number, now = new Date()): Promise<void> {
  const at = now.toISOString();
  await db
    .update(proposals)
    .set({
      openCount: sql`${proposals.openCount} + 1`,
      firstOpenedAt: sql`coalesce(${proposals.firstOpenedAt}, ${at})`,
      lastOpenedAt: at,
    })
    .where(eq(proposals.id, proposalId));
}

/**
 * Withdraws a proposal not yet signed (an accepted one whose deposit is unpaid included); the job's
 * stage falls back to what is still true of it. Answers an error message when it cannot.
 */
export async function withdrawProposal(
  user: SessionUser,
  lead: Lead,
  proposalId: number,
  reason: string,
  payments?: Pick<Stripe, "checkout">,
): Promise<string | null> {
  const [row] = await db
    .select()
    .from(proposals)
    .where(and(eq(proposals.id, proposalId), eq(proposals.leadId, lead.id), eq(proposals.companyId, lead.companyId)))
    .limit(1);
  if (!row) return "That proposal is not one of this job's.";
  if (row.status !== "sent" && row.status !== "accepted")
    return `That proposal is already ${row.status}: only one still out can be withdrawn.`;
  const at = new Date().toISOString();
  const document = parseProposalDocument(row.documentJson);
  const changed = await writeTransaction(async (tx) => {
    const moved = await tx
      .update(proposals)
      .set({ status: "withdrawn", withdrawnAt: at, withdrawReason: reason, updatedAt: at })
      .where(and(eq(proposals.id, row.id), inArray(proposals.status, [...OPEN_STATES])))
      .returning({ id: proposals.id });
    if (moved.length === 0) return false;
    await tx.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: user.id,
      kind: "proposal-withdrawn",
      detail: `${document.number} withdrawn: ${reason}`,
      createdAt: at,
    });
    if (row.kind === "proposal")
      for (const statement of settleStageStatements({ leadId: lead.id, from: ["proposal-out"], at, tx }))
        await statement;
    return true;
  });
  if (!changed) return "That proposal changed meanwhile: reload the page.";
  await expireCheckoutSessions([row.checkoutSessionId], payments);
  return null;
}
