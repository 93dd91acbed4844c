/*
 * From proposal to signed job: the money (integer cents, checked against exact fractions from
 * fraction.js), the electronic signature record (US ESIGN Act 15 U.S.C. §7001 and UETA: consent,
 * intent, a copy to keep) with the SHA-256 of the exact PDF accepted (FIPS 180-4, via node:crypto),
 * the deposit's payment events applied once with session, amount and currency checked, expiry,
 * withdrawal and change orders.
 */
import { createHash } from "node:crypto";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq, like } from "drizzle-orm";
import Fraction from "fraction.js";
import Stripe from "stripe";
import { afterAll, beforeAll, expect, test } from "vitest";
import { emailOutbox, leadEvents, leads, paymentEvents, proposals, siteVisits, type Proposal } from "~/db/schema";
import {
  basePriceCents,
  changeOrderDeltaCents,
  chooseAddOns,
  depositCents,
  jobTotals,
  proposalTotalCents,
} from "~/domain/proposal-money";
import { jobTotalsFor, sendChangeOrder } from "~/lib/proposals/change-orders.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { db } from "~/lib/platform/db.server";
import { createStripe } from "~/lib/platform/payments.server";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { expireProposals, processDepositRefunds, startDepositCheckout } from "~/lib/proposals/proposal-payments.server";
import { renderProposalPdf } from "~/lib/proposals/proposal-pdf.server";
import { acceptProposal } from "~/lib/proposals/proposal-signing.server";
import { sendProposal, withdrawProposal } from "~/lib/proposals/proposals.server";
import { changeStage } from "~/lib/leads/lead-workspace.server";
import { action as changeOrderAction } from "~/routes/app-lead-change-order";
import { action as composeAction } from "~/routes/app-lead-proposal";
import { parseComposeForm } from "~/lib/proposals/proposal-schema";
import { addCalendarDays } from "~/domain/build-schedule";
import { action as proposalAction, loader as proposalLoader } from "~/routes/proposal";
import { action as openedAction } from "~/routes/proposal-opened";
import { startPaymentsFake, type PaymentsFake } from "../../fakes/payments/server";
import { routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";
import { deliverSigned } from "./support/payments";
import { officeUser, sentProposal } from "./support/proposals";

let fake: PaymentsFake;
beforeAll(async () => {
  fake = await startPaymentsFake({
    port: 0,
    webhookUrl: null,
    stateFile: path.join(mkdtempSync(path.join(tmpdir(), "ew-dep-")), "state.json"),
    log: () => {},
  });
});
afterAll(() => fake.close());

const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");
const reload = async (id: number) => (await db.select().from(proposals).where(eq(proposals.id, id)))[0]!;
const stageOf = async (leadId: number) => (await db.select().from(leads).where(eq(leads.id, leadId)))[0]!.status;
const SIGNER = { name: "Ingrid Sola-Martens", ip: "203.0.113.7", userAgent: "Mozilla/5.0 (test)" };

// Exact decimal reference: x % of a total, rounded half up to the cent.
const percentOf = (totalCents: number, basisPoints: number) =>
  new Fraction(totalCents).mul(basisPoints).div(10_000).round(0).valueOf();

test("add-ons add to the base price in cents; an add-on that is not offered is refused", () => {
  const offered = [
    { key: "a1", label: "Firebrick lining", cents: 64_000 },
    { key: "a2", label: "Second course of caps", cents: 39_550 },
  ];
  const base = basePriceCents(485_000, [{ cents: 35_000 }]);
  expect(base).toBe(520_000);
  expect(proposalTotalCents(base, chooseAddOns(offered, []))).toBe(520_000);
  expect(proposalTotalCents(base, chooseAddOns(offered, ["a2"]))).toBe(559_550);
  expect(proposalTotalCents(base, chooseAddOns(offered, ["a2", "a1"]))).toBe(623_550);
  expect(() => chooseAddOns(offered, ["a9"])).toThrow(/a9/);
});

test("a percentage deposit is the exact fraction rounded half up to the cent (fraction.js as the reference); a fixed one never exceeds the total", () => {
  for (const [total, bp] of [
    [623_550, 3000],
    [1_234_567, 3000],
    [10_001, 250],
    [99_999, 3333],
    [1, 5000],
    [3, 5000],
  ] as const) {
    expect(depositCents({ kind: "percent", basisPoints: bp }, total)).toBe(percentOf(total, bp));
  }
  // 50 % of 3 cents is 1.5 cents: half up gives 2.
  expect(depositCents({ kind: "percent", basisPoints: 5000 }, 3)).toBe(2);
  expect(depositCents({ kind: "fixed", cents: 100_000 }, 623_550)).toBe(100_000);
  expect(depositCents({ kind: "fixed", cents: 100_000 }, 80_000)).toBe(80_000);
});

test("change orders: the job is always the signed total plus the signed differences; a credit lowers the balance", () => {
  expect(changeOrderDeltaCents(520_000, 567_500)).toBe(47_500);
  expect(jobTotals({ totalCents: 623_550, depositCents: 187_065 }, [])).toEqual({
    contractCents: 623_550,
    depositCents: 187_065,
    balanceCents: 436_485,
  });
  expect(jobTotals({ totalCents: 623_550, depositCents: 187_065 }, [47_500, -12_050])).toEqual({
    contractCents: 659_000,
    depositCents: 187_065,
    balanceCents: 471_935,
  });
  expect(jobTotals({ totalCents: 100_000, depositCents: 30_000 }, [-80_000]).balanceCents).toBe(-10_000);
});

test("sending a proposal freezes its document, moves the job to “proposal out”, queues the homeowner's e-mail and records the event", async () => {
  const { lead, proposal } = await sentProposal();
  expect(lead.status).toBe("proposal-out");
  const document = parseProposalDocument(proposal.documentJson);
  expect(document.scope[0]).toMatch(/^Lay out the pit and excavate, then compact a base of crushed stone/);
  expect(document.scope.some((l) => l.startsWith("Build 3 courses of"))).toBe(true);
  expect(document.cautions.join(" ")).toContain("obtains any permit the town requires");
  expect(proposal.priceCents).toBe(485_000);
  const [mail] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `proposal-sent/${proposal.token}`));
  expect(mail!.toAddress).toBe(lead.email);
  expect(mail!.text).toContain(`/p/${proposal.token}`);
  const events = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.kind, "proposal-sent")));
  expect(events[0]!.detail).toMatch(/^Proposal \d+-1 sent: \$4,850\.00 with 2 optional add-ons/);
});

test("the signature record: who, when, address, browser, the add-ons, and the SHA-256 of the exact accepted PDF, which renders again byte for byte", async () => {
  const { lead, proposal } = await sentProposal();
  const document = parseProposalDocument(proposal.documentJson);
  const result = await acceptProposal({ proposal, lead, document, input: { ...SIGNER, chosenKeys: ["a1"] } });
  expect(result.ok).toBe(true);
  const row = await reload(proposal.id);
  expect(row).toMatchObject({
    status: "accepted",
    signerName: SIGNER.name,
    signerIp: SIGNER.ip,
    signerUserAgent: SIGNER.userAgent,
    chosenAddOnsJson: '["a1"]',
    totalCents: 549_000,
    depositCents: percentOf(549_000, 3000),
  });
  expect(row.signedAt).not.toBeNull();
  expect(row.acceptedPdfSha256).toBe(sha256(row.acceptedPdf!));
  // The same document and choices render the same bytes: the hash can be checked again later.
  const again = await renderProposalPdf(document, { chosenKeys: ["a1"], createdAt: proposal.sentAt });
  expect(sha256(again)).toBe(row.acceptedPdfSha256);
  // Other choices give another document, so another hash.
  expect(sha256(await renderProposalPdf(document, { chosenKeys: [], createdAt: proposal.sentAt }))).not.toBe(
    row.acceptedPdfSha256,
  );
  expect(row.signedPdf!.subarray(0, 5).toString()).toBe("%PDF-");
  expect(sha256(row.signedPdf!)).not.toBe(row.acceptedPdfSha256);
  // Both sides get the signed PDF, with the hash in the message.
  const mails = await db
    .select()
    .from(emailOutbox)
    .where(like(emailOutbox.idempotencyKey, `proposal-signed%/${proposal.id}`));
  expect(mails).toHaveLength(2);
  for (const mail of mails) {
    expect(mail.text).toContain(row.acceptedPdfSha256!);
    const [attachment] = JSON.parse(mail.attachmentsJson) as { content: string; contentType: string }[];
    expect(attachment!.contentType).toBe("application/pdf");
    expect(sha256(Buffer.from(attachment!.content, "base64"))).toBe(sha256(row.signedPdf!));
  }
  // A signed proposal never changes: a second signature is refused and the record stays as it was.
  const twice = await acceptProposal({
    proposal: row,
    lead,
    document,
    input: { ...SIGNER, name: "Someone Else", chosenKeys: [] },
  });
  expect(twice).toMatchObject({ ok: false, status: 409 });
  expect((await reload(proposal.id)).signerName).toBe(SIGNER.name);
  expect(await stageOf(lead.id)).toBe("proposal-out");
});

test("the sign form answers 400 naming the field without consent or a full name, and records nothing", async () => {
  const { proposal } = await sentProposal();
  const post = (fields: Record<string, string>) =>
    proposalAction(
      routeArgs(
        requestWithCookie(`/p/${proposal.token}`, undefined, { method: "POST", body: new URLSearchParams(fields) }),
        { token: proposal.token },
      ),
    ) as Promise<{ data: { errors: Record<string, string> }; init: { status: number } }>;
  const noConsent = await post({ intent: "sign", signerName: "Ingrid Sola-Martens", addOn: "a1" });
  expect(noConsent.init.status).toBe(400);
  expect(noConsent.data.errors).toEqual({ consent: "Tick the box to agree to sign electronically." });
  const oneWord = await post({ intent: "sign", signerName: "Ingrid", consent: "on" });
  expect(oneWord.data.errors.signerName).toBe("Type your full name, first and last, as your signature.");
  expect((await reload(proposal.id)).status).toBe("sent");
});

test("the homeowner opening the link is counted; the office previewing it is not; an unknown link is a 404", async () => {
  const { proposal, lead } = await sentProposal();
  const opened = (cookie?: string, token = proposal.token) =>
    openedAction(routeArgs(requestWithCookie(`/p/${token}/opened`, cookie, { method: "POST" }), { token }));
  // Reading the page writes nothing; the page posts the open once shown, and says whether it counts.
  const homeowner = (await proposalLoader(
    routeArgs(requestWithCookie(`/p/${proposal.token}`), { token: proposal.token }),
  )) as { countsAsOpen: boolean };
  expect(homeowner.countsAsOpen).toBe(true);
  expect((await reload(proposal.id)).openCount).toBe(0);
  expect((await opened()).status).toBe(204);
  const staff = await loginAs(lead.companyId, "estimator");
  const preview = (await proposalLoader(
    routeArgs(requestWithCookie(`/p/${proposal.token}`, staff), { token: proposal.token }),
  )) as { isStaffPreview: boolean; countsAsOpen: boolean };
  expect(preview.isStaffPreview).toBe(true);
  expect(preview.countsAsOpen).toBe(false);
  expect((await opened(staff)).status).toBe(204);
  const row = await reload(proposal.id);
  expect(row.openCount).toBe(1);
  expect(row.firstOpenedAt).not.toBeNull();
  await expect(
    proposalLoader(
      routeArgs(requestWithCookie("/p/not-a-real-token-000000000"), { token: "not-a-real-token-000000000" }),
    ),
  ).rejects.toMatchObject({ status: 404 });
  expect((await opened(undefined, "not-a-real-token-000000000")).status).toBe(404);
  // A withdrawn link is not counted either.
  await db.update(proposals).set({ status: "withdrawn" }).where(eq(proposals.id, proposal.id));
  await opened();
  expect((await reload(proposal.id)).openCount).toBe(1);
});

let seq = 0;

async function accepted(chosenKeys: string[] = []) {
  const sent = await sentProposal();
  const document = parseProposalDocument(sent.proposal.documentJson);
  const result = await acceptProposal({
    proposal: sent.proposal,
    lead: sent.lead,
    document,
    input: { ...SIGNER, chosenKeys },
  });
  if (!result.ok) throw new Error(result.message);
  seq += 1;
  const sessionId = `cs_deposit_${sent.proposal.id}_${seq}`;
  await db
    .update(proposals)
    .set({ checkoutSessionId: sessionId, checkoutAttempt: 1 })
    .where(eq(proposals.id, sent.proposal.id));
  return { ...sent, proposal: await reload(sent.proposal.id), sessionId };
}

function depositEvent(proposal: Proposal, type: string, object: Record<string, unknown>) {
  seq += 1;
  return {
    id: `evt_deposit_${Date.now()}_${seq}`,
    object: "event",
    type,
    created: Math.floor(Date.now() / 1000),
    data: {
      object: {
        metadata: { kind: "deposit", proposal_id: String(proposal.id), lead_id: String(proposal.leadId) },
        ...object,
      },
    },
  };
}

const completed = (proposal: Proposal, overrides: Record<string, unknown> = {}) =>
  depositEvent(proposal, "checkout.session.completed", {
    id: proposal.checkoutSessionId,
    object: "checkout.session",
    payment_status: "paid",
    status: "complete",
    amount_total: proposal.depositCents,
    currency: "usd",
    payment_intent: `pi_dep_${proposal.id}`,
    ...overrides,
  });

const deliver = deliverSigned;

test("the deposit's signed webhook signs the job once: proposal signed, job at “signed”, both sides e-mailed; a repeat changes nothing", async () => {
  const { proposal, lead } = await accepted(["a2"]);
  const event = completed(proposal);
  expect(await deliver(event)).toEqual({ status: 200, outcome: "applied" });
  const row = await reload(proposal.id);
  expect(row).toMatchObject({ status: "signed", paymentIntentId: `pi_dep_${proposal.id}` });
  expect(await stageOf(lead.id)).toBe("signed");
  expect(
    await db
      .select()
      .from(emailOutbox)
      .where(like(emailOutbox.idempotencyKey, `deposit-paid%/${proposal.id}`)),
  ).toHaveLength(2);
  expect(await deliver(event)).toEqual({ status: 200, outcome: "duplicate" });
  expect(
    await db
      .select()
      .from(leadEvents)
      .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.kind, "deposit-paid"))),
  ).toHaveLength(1);
  expect((await db.select().from(paymentEvents).where(eq(paymentEvents.id, event.id))).length).toBe(1);
});

test.each([
  ["another amount", { amount_total: 100 }],
  ["another currency", { currency: "eur" }],
  ["another checkout session", { id: "cs_someone_else" }],
])("a completed deposit event with %s than stored is not applied", async (_label, overrides) => {
  const { proposal, lead } = await accepted();
  expect(await deliver(completed(proposal, overrides))).toEqual({ status: 200, outcome: "mismatch" });
  expect((await reload(proposal.id)).status).toBe("accepted");
  expect(await stageOf(lead.id)).toBe("proposal-out");
});

test("an expired checkout leaves the acceptance standing (states only move forward); a deposit paid after the proposal expired is refunded once", async () => {
  const { proposal, lead } = await accepted();
  expect(
    await deliver(
      depositEvent(proposal, "checkout.session.expired", {
        id: proposal.checkoutSessionId,
        object: "checkout.session",
        status: "expired",
      }),
    ),
  ).toEqual({ status: 200, outcome: "applied" });
  expect((await reload(proposal.id)).status).toBe("accepted");

  await db
    .update(proposals)
    .set({ expiresAt: new Date(Date.now() - 1000).toISOString() })
    .where(eq(proposals.id, proposal.id));
  expect(await expireProposals(new Date(), createStripe(fake.url))).toBeGreaterThanOrEqual(1);
  expect((await reload(proposal.id)).status).toBe("expired");
  expect(await stageOf(lead.id)).not.toBe("proposal-out");

  expect(await deliver(completed(proposal))).toEqual({ status: 200, outcome: "applied" });
  const owed = await reload(proposal.id);
  expect(owed.status).toBe("expired");
  expect(owed.refundOwedAt).not.toBeNull();
  expect(owed.refundReason).toBe("The deposit arrived after the proposal was expired.");
});

test("deposit checkout through the payment service: our own key, an open session reused, the refund sent once with its own key", async () => {
  const client = createStripe(fake.url);
  const sent = await sentProposal();
  const document = parseProposalDocument(sent.proposal.documentJson);
  const result = await acceptProposal({
    proposal: sent.proposal,
    lead: sent.lead,
    document,
    input: { ...SIGNER, chosenKeys: [] },
  });
  if (!result.ok) throw new Error(result.message);
  const first = await startDepositCheckout({
    proposal: result.proposal,
    lead: sent.lead,
    company: sent.company,
    origin: "http://localhost",
    client,
  });
  const second = await startDepositCheckout({
    proposal: await reload(sent.proposal.id),
    lead: sent.lead,
    company: sent.company,
    origin: "http://localhost",
    client,
  });
  expect(second).toBe(first);
  const stored = await reload(sent.proposal.id);
  const session = (await (
    await fetch(`${fake.url}/v1/checkout/sessions/${stored.checkoutSessionId}`, {
      headers: { Authorization: "Bearer sk_test_x" },
    })
  ).json()) as { amount_total: number; currency: string; metadata: Record<string, string> };
  expect(session).toMatchObject({
    amount_total: stored.depositCents,
    currency: "usd",
    metadata: { kind: "deposit", proposal_id: String(stored.id) },
  });
  const requests = JSON.stringify(await (await fetch(`${fake.url}/_fake/requests`)).json());
  expect(requests).toContain(`deposit-checkout:${stored.id}:1`);

  // Paid on the hosted page, then refunded by the owner's request: the worker sends it once.
  const paid = await fetch(`${fake.url}/_fake/sessions/${stored.checkoutSessionId}/pay`, {
    method: "POST",
    body: JSON.stringify({ card: "4242424242424242" }),
    headers: { "Content-Type": "application/json" },
  });
  expect(paid.status).toBe(200);
  const paidSession = (await (
    await fetch(`${fake.url}/v1/checkout/sessions/${stored.checkoutSessionId}`, {
      headers: { Authorization: "Bearer sk_test_x" },
    })
  ).json()) as { payment_intent: string };
  await db
    .update(proposals)
    .set({
      status: "signed",
      paymentIntentId: paidSession.payment_intent,
      refundOwedAt: new Date().toISOString(),
      refundReason: "Moved house.",
    })
    .where(eq(proposals.id, stored.id));
  expect(await processDepositRefunds(client)).toBeGreaterThanOrEqual(1);
  expect(await processDepositRefunds(client)).toBe(0);
  expect((await reload(stored.id)).refundId).toMatch(/^re_/);
  expect(JSON.stringify(await (await fetch(`${fake.url}/_fake/requests`)).json())).toContain(
    `refund:deposit:${stored.id}`,
  );
});

test("withdrawing a proposal closes its link and puts the job back to the step still true (a recorded visit: yard measured)", async () => {
  const { proposal, lead, user } = await sentProposal();
  await db.insert(siteVisits).values({
    companyId: lead.companyId,
    leadId: lead.id,
    structureFt: 30,
    propertyLineFt: 30,
    slope: "level",
    soil: "loam",
    accessWidthIn: 48,
    utilityMarks: "marked-clear",
    spoil: "haul-away",
  });
  expect(await withdrawProposal(user, lead, proposal.id, "Price to be revised after the second visit.")).toBeNull();
  expect((await reload(proposal.id)).status).toBe("withdrawn");
  expect(await stageOf(lead.id)).toBe("measured");
  expect(await withdrawProposal(user, lead, proposal.id, "Again.")).toMatch(/already withdrawn/);
  const view = (await proposalLoader(
    routeArgs(requestWithCookie(`/p/${proposal.token}`), { token: proposal.token }),
  )) as { state: string };
  expect(view.state).toBe("withdrawn");
});

test("a change order after signing: its own document with the difference, signed the same way, and the job's totals follow", async () => {
  const { proposal, lead, company } = await accepted(["a1"]);
  await deliver(completed(proposal));
  const signed = await reload(proposal.id);
  const before = await jobTotalsFor(signed);
  expect(before).toEqual({
    contractCents: 549_000,
    depositCents: signed.depositCents,
    balanceCents: 549_000 - signed.depositCents!,
  });

  const user = await officeUser(lead.companyId);
  const fresh = (await db.select().from(leads).where(eq(leads.id, lead.id)))[0]!;
  const change = await sendChangeOrder({
    user,
    lead: fresh,
    company: await getCompany(company.id),
    deltaCents: 47_500,
    validUntil: "2099-06-30",
    origin: "http://localhost",
  });
  if (typeof change === "string") throw new Error(change);
  const document = parseProposalDocument(change.documentJson);
  expect(document.kind).toBe("change-order");
  expect(document.change).toMatchObject({ previousContractCents: 549_000, deltaCents: 47_500 });
  const result = await acceptProposal({
    proposal: change,
    lead: fresh,
    document,
    input: { ...SIGNER, chosenKeys: [] },
  });
  expect(result.ok).toBe(true);
  const signedChange = await reload(change.id);
  expect(signedChange).toMatchObject({ status: "signed", totalCents: 596_500, depositCents: 0 });
  expect(signedChange.acceptedPdfSha256).toBe(sha256(signedChange.acceptedPdf!));
  expect(await jobTotalsFor(signed)).toEqual({
    contractCents: 596_500,
    depositCents: signed.depositCents,
    balanceCents: 596_500 - signed.depositCents!,
  });
  expect(await stageOf(lead.id)).toBe("signed");
});

test("a homeowner named in Chinese and Greek gets their name on the proposal PDF as written, and the same choices still render the same bytes", async () => {
  // The built-in PDF fonts encode only WinAnsi (PDF 32000-1:2008 Annex D); text is read back with
  // pdf-parse through the PDF's ToUnicode maps, so a garbled name fails the comparison.
  const { proposal } = await sentProposal();
  const document = parseProposalDocument(proposal.documentJson);
  const named = { ...document, customer: { ...document.customer, name: "王小明 Παπαδόπουλος", town: "Αθήνα" } };
  const pdf = await renderProposalPdf(named, { chosenKeys: [], createdAt: proposal.sentAt });
  const { PDFParse } = await import("pdf-parse");
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  const text = (await parser.getText()).text.replace(/\s+/g, " ");
  await parser.destroy();
  expect(text).toContain("王小明 Παπαδόπουλος");
  expect(sha256(await renderProposalPdf(named, { chosenKeys: [], createdAt: proposal.sentAt }))).toBe(sha256(pdf));
});

/** A proposal accepted on the payments fake, with its real checkout session open. */
async function acceptedWithCheckout() {
  const client = createStripe(fake.url);
  const sent = await sentProposal();
  const result = await acceptProposal({
    proposal: sent.proposal,
    lead: sent.lead,
    document: parseProposalDocument(sent.proposal.documentJson),
    input: { ...SIGNER, chosenKeys: [] },
  });
  if (!result.ok) throw new Error(result.message);
  const [lead] = await db.select().from(leads).where(eq(leads.id, sent.lead.id));
  await startDepositCheckout({
    proposal: result.proposal,
    lead: lead!,
    company: sent.company,
    origin: "http://localhost",
    client,
  });
  const proposal = await reload(sent.proposal.id);
  expect(proposal.checkoutSessionId).toMatch(/^cs_/);
  return { ...sent, lead: lead!, proposal, client };
}

const sessionStatus = async (client: Stripe, id: string) => (await client.checkout.sessions.retrieve(id)).status;

test("a job marked not going ahead withdraws the proposal still out and closes its checkout; no deposit can be started on it", async () => {
  const { proposal, lead, client, company } = await acceptedWithCheckout();
  const owner = await officeUser(lead.companyId, "owner");
  expect(await changeStage(owner, lead, "not-going-ahead", "Went with another contractor", client)).toEqual({
    ok: true,
  });
  const row = await reload(proposal.id);
  expect([row.status, row.withdrawReason]).toEqual([
    "withdrawn",
    "The job is not going ahead: Went with another contractor",
  ]);
  expect(await sessionStatus(client, proposal.checkoutSessionId!)).toBe("expired");
  const kinds = (await db.select().from(leadEvents).where(eq(leadEvents.leadId, lead.id))).map((e) => e.kind);
  expect(kinds.filter((k) => k === "proposal-withdrawn")).toHaveLength(1);
  // The homeowner's page can no longer start a payment.
  const [stopped] = await db.select().from(leads).where(eq(leads.id, lead.id));
  await expect(
    startDepositCheckout({ proposal: { ...row, status: "accepted" }, lead: stopped!, company, origin: "", client }),
  ).rejects.toThrow(/not going ahead/);
  // A second move from the stage the job was at changes nothing and writes no timeline entry.
  const events = kinds.length;
  expect(await changeStage(owner, lead, "not-going-ahead", "Again", client)).toMatchObject({ ok: false, status: 409 });
  expect(await db.select().from(leadEvents).where(eq(leadEvents.leadId, lead.id))).toHaveLength(events);
});

test("a deposit paid on a job stopped meanwhile is owed back: the proposal is withdrawn, the job stays stopped, the refund goes out once", async () => {
  const { proposal, lead, client } = await acceptedWithCheckout();
  // Stopped without the checkout closing (an older stop, or a payment already under way).
  await db
    .update(leads)
    .set({ status: "not-going-ahead", stopReason: "Moved away", pausedStage: "proposal-out" })
    .where(eq(leads.id, lead.id));
  const paid = await fetch(`${fake.url}/_fake/sessions/${proposal.checkoutSessionId}/pay`, {
    method: "POST",
    body: JSON.stringify({ card: "4242424242424242" }),
    headers: { "Content-Type": "application/json" },
  });
  expect(paid.status).toBe(200);
  const events = (await (await fetch(`${fake.url}/_fake/events?type=checkout.session.completed`)).json()) as {
    data: { data: { object: { id: string; payment_intent: string } } }[];
  };
  const notice = events.data.find((e) => e.data.object.id === proposal.checkoutSessionId)!;
  expect(await deliver(notice)).toEqual({ status: 200, outcome: "applied" });
  const owed = await reload(proposal.id);
  expect([owed.status, owed.paymentIntentId, owed.refundReason]).toEqual([
    "withdrawn",
    notice.data.object.payment_intent,
    "The deposit arrived after the job was marked not going ahead.",
  ]);
  expect(owed.refundOwedAt).not.toBeNull();
  expect(await stageOf(lead.id)).toBe("not-going-ahead");
  expect(
    await db
      .select()
      .from(emailOutbox)
      .where(like(emailOutbox.idempotencyKey, `deposit-paid%/${proposal.id}`)),
  ).toHaveLength(0);
  await processDepositRefunds(client);
  await processDepositRefunds(client);
  const refunds = (await (await fetch(`${fake.url}/_fake/refunds`)).json()) as {
    data: { amount: number; payment_intent: string }[];
  };
  expect(refunds.data.filter((r) => r.payment_intent === owed.paymentIntentId).map((r) => r.amount)).toEqual([
    owed.depositCents,
  ]);
});

test("withdrawing or replacing a proposal closes its open checkout", async () => {
  const first = await acceptedWithCheckout();
  expect(
    await withdrawProposal(first.user, first.lead, first.proposal.id, "Price to be revised.", first.client),
  ).toBeNull();
  expect(await sessionStatus(first.client, first.proposal.checkoutSessionId!)).toBe("expired");

  const second = await acceptedWithCheckout();
  await sendProposal({
    user: second.user,
    lead: second.lead,
    company: second.company,
    input: { fixedPriceCents: 510_000, addOns: [], validUntil: "2099-12-31", included: "Base", excluded: "Permits" },
    origin: "http://localhost",
    payments: second.client,
  });
  expect((await reload(second.proposal.id)).status).toBe("withdrawn");
  expect(await sessionStatus(second.client, second.proposal.checkoutSessionId!)).toBe("expired");
});

test("a credit may take the job down to nothing, not below: refused when sent, and refused at signing when another credit was signed first", async () => {
  // Signed $4,850 + a1 $640 = $5,490 (worked by hand in the change-order test above).
  const { proposal, lead, company } = await accepted(["a1"]);
  await deliver(completed(proposal));
  const user = await officeUser(lead.companyId);
  const fresh = (await db.select().from(leads).where(eq(leads.id, lead.id)))[0]!;
  const send = (deltaCents: number) =>
    sendChangeOrder({ user, lead: fresh, company, deltaCents, validUntil: "2099-06-30", origin: "http://localhost" });
  expect(await send(-549_001)).toBe(
    "A credit can be at most the job's current contract of $5,490.00, so the price difference can go no lower than −$5,490.00.",
  );
  expect(await db.select().from(proposals).where(eq(proposals.parentId, proposal.id))).toEqual([]);
  // A $3,000 credit fits the $5,490 contract; signed, it leaves $2,490, and a second $3,000 credit is
  // then refused when sent.
  const first = await send(-300_000);
  if (typeof first === "string") throw new Error(first);
  const sign = (change: Proposal) =>
    acceptProposal({
      proposal: change,
      lead: fresh,
      document: parseProposalDocument(change.documentJson),
      input: { ...SIGNER, chosenKeys: [] },
    });
  expect(await sign(first)).toMatchObject({ ok: true });
  expect(await jobTotalsFor(await reload(proposal.id))).toMatchObject({ contractCents: 249_000 });
  expect(await send(-300_000)).toMatch(/^A credit can be at most the job's current contract of \$2,490\.00/);
  // A $2,000 credit sent now fits; if another change were signed meanwhile (another $1,000 credit,
  // leaving $1,490), it no longer does and is refused at signing.
  const second = await send(-200_000);
  if (typeof second === "string") throw new Error(second);
  await db.insert(proposals).values({
    ...(await reload(first.id)),
    id: undefined,
    token: `credit-meanwhile-${first.id}`,
    priceCents: -100_000,
  });
  expect(await sign(second)).toMatchObject({ ok: false, status: 409, message: /more than the job's total/ });
  expect((await reload(second.id)).status).toBe("sent");
  expect(await jobTotalsFor(await reload(proposal.id))).toMatchObject({ contractCents: 149_000 });
});

test("the change-order form: a credit beyond the contract names the price difference; amounts with stray commas and offers open past a year are refused", async () => {
  const { proposal, lead } = await accepted(["a1"]);
  await deliver(completed(proposal));
  const cookie = await loginAs(lead.companyId, "owner");
  const { company } = await sentProposal();
  const today = new Intl.DateTimeFormat("en-CA", { timeZone: company.timeZone }).format(new Date());
  const post = async (fields: Record<string, string>) => {
    const body = new URLSearchParams(fields);
    const answer = (await changeOrderAction(
      routeArgs(
        requestWithCookie(`/app/leads/${lead.id}/change-order`, cookie, {
          method: "POST",
          body,
          headers: { "Content-Type": "application/x-www-form-urlencoded" },
        }),
        { leadId: String(lead.id) },
      ),
    )) as { init: { status: number } | null; data: { errors: Record<string, string> } };
    return { status: answer.init?.status, errors: answer.data.errors };
  };
  const validUntil = addCalendarDays(today, 30);
  expect(await post({ delta: "-100,000", validUntil })).toEqual({
    status: 400,
    errors: {
      delta:
        "A credit can be at most the job's current contract of $5,490.00, so the price difference can go no lower than −$5,490.00.",
    },
  });
  for (const delta of [",", "1,2,3", "12,34"])
    expect((await post({ delta, validUntil })).errors.delta, delta).toMatch(/^Price difference must be an amount/);
  // A year ahead is the last day allowed; a day more, or the year 9999, names the field (no 500).
  expect((await post({ delta: "1", validUntil: addCalendarDays(today, 366) })).errors).toEqual({
    validUntil: `Valid until must be within a year, by ${addCalendarDays(today, 365)}.`,
  });
  expect((await post({ delta: "1", validUntil: "9999-12-31" })).status).toBe(400);
  expect(await db.select().from(proposals).where(eq(proposals.parentId, proposal.id))).toEqual([]);
});

test("the proposal form refuses an offer open past a year, naming the field", () => {
  const today = "2026-12-03";
  const fields = { fixedPrice: "4850", included: "Base", excluded: "Permits" };
  expect(parseComposeForm({ ...fields, validUntil: "2027-12-03" }, today)).toMatchObject({ ok: true });
  expect(parseComposeForm({ ...fields, validUntil: "2027-12-04" }, today)).toEqual({
    ok: false,
    errors: { validUntil: "Valid until must be within a year, by 2027-12-03." },
  });
  expect(parseComposeForm({ ...fields, validUntil: "9999-12-31" }, today)).toMatchObject({
    ok: false,
    errors: { validUntil: /within a year/ },
  });
  expect(parseComposeForm({ ...fields, validUntil: "2026-12-03" }, today)).toMatchObject({
    errors: { validUntil: "Valid until must be after today." },
  });
});

test("hidden characters do not count: a signature of a reversed name and a zero-width space is stored as a reader sees it, and a one-word name padded with them is refused", async () => {
  // Unicode Standard Annex #9 (bidirectional overrides reorder what a reader sees) and the
  // zero-width space U+200B, which shows nothing.
  const { proposal } = await sentProposal();
  const post = (fields: Record<string, string>) =>
    proposalAction(
      routeArgs(
        requestWithCookie(`/p/${proposal.token}`, undefined, { method: "POST", body: new URLSearchParams(fields) }),
        { token: proposal.token },
      ),
    ) as Promise<{ data: { errors: Record<string, string> }; init: { status: number } } | Response>;
  const padded = (await post({ intent: "sign", signerName: "Ingrid\u200b \u200b", consent: "on" })) as {
    data: { errors: Record<string, string> };
    init: { status: number };
  };
  expect([padded.init.status, padded.data.errors.signerName]).toEqual([
    400,
    "Type your full name, first and last, as your signature.",
  ]);
  await post({ intent: "sign", signerName: "\u202eIngrid\u202c Sola\u0007-Mar\u200btens\u2066", consent: "on" });
  expect((await reload(proposal.id)).signerName).toBe("Ingrid Sola-Martens");
});

test("the proposal form reads text as a reader sees it: a 'not included' of one zero-width space is empty, control characters are dropped from the rest", async () => {
  const { lead, company } = await sentProposal();
  const cookie = await loginAs(lead.companyId, "owner");
  const today = new Intl.DateTimeFormat("en-CA", { timeZone: company.timeZone }).format(new Date());
  const post = async (fields: Record<string, string>) =>
    (await composeAction(
      routeArgs(
        requestWithCookie(`/app/leads/${lead.id}/proposal`, cookie, {
          method: "POST",
          body: new URLSearchParams({
            intent: "send",
            fixedPrice: "4850",
            validUntil: addCalendarDays(today, 30),
            ...fields,
          }),
          headers: { "Content-Type": "application/x-www-form-urlencoded" },
        }),
        { leadId: String(lead.id) },
      ),
    )) as { init: { status: number }; data: { errors: Record<string, string> } } | Response;
  const refused = (await post({
    included: "Base",
    excluded: "\u200b",
    addOnLabel1: "\u200b\u200b\u200b",
    addOnPrice1: "5",
  })) as { init: { status: number }; data: { errors: Record<string, string> } };
  expect(refused.init.status).toBe(400);
  expect(refused.data.errors).toEqual({
    excluded: "Write what is not included (one line each).",
    addOnLabel1: "Add-on 1 needs a name of 3 to 120 characters.",
  });
  const sent = await post({ included: "Base\u001b[31m and \u202ewalls", excluded: "Permits" });
  expect((sent as Response).status).toBe(302);
  const [newest] = await db
    .select()
    .from(proposals)
    .where(and(eq(proposals.leadId, lead.id), eq(proposals.status, "sent")));
  expect(parseProposalDocument(newest!.documentJson).included).toEqual(["Base[31m and walls"]);
});

test("a proposal sent on a job marked not going ahead picks it up again; one left out on a stopped job cannot be signed", async () => {
  const { lead, user, company } = await sentProposal();
  await db
    .update(leads)
    .set({ status: "not-going-ahead", stopReason: "Went quiet", pausedStage: "proposal-out" })
    .where(eq(leads.id, lead.id));
  const stopped = (await db.select().from(leads).where(eq(leads.id, lead.id)))[0]!;
  const again = await sendProposal({
    user,
    lead: stopped,
    company,
    input: { fixedPriceCents: 470_000, addOns: [], validUntil: "2099-12-31", included: "Base", excluded: "Permits" },
    origin: "http://localhost",
  });
  expect((await db.select().from(leads).where(eq(leads.id, lead.id)))[0]).toMatchObject({
    status: "proposal-out",
    stopReason: null,
    pausedStage: null,
  });
  // Stopped again with this proposal still out (an older stop): signing it is refused and records nothing.
  await db.update(leads).set({ status: "not-going-ahead" }).where(eq(leads.id, lead.id));
  const refused = await acceptProposal({
    proposal: again,
    lead: stopped,
    document: parseProposalDocument(again.documentJson),
    input: { ...SIGNER, chosenKeys: [] },
  });
  expect(refused).toMatchObject({ ok: false, status: 409, message: /not going ahead/ });
  expect((await reload(again.id)).status).toBe("sent");
});
