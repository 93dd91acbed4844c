import { data, Form, Link, redirect } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/my";
import { LocalTime } from "~/components/local-time";
import { PublicShell } from "~/components/public-shell";
import { ConfirmAction } from "~/components/ui/confirm-action";
import { FormAlert } from "~/components/ui/field";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { PitPlanSvg } from "~/components/pit-plan-svg";
import { describePreview, planToSceneInput } from "~/lib/design/design-plan";
import { phoneDisplay } from "~/lib/format/phone";
import { cancelBooking, cancelRefusalStatus, HOMEOWNER_CANCEL_CUTOFF_HOURS } from "~/lib/consults/booking.server";
import { findHomeownerBooking, loadHomeownerRequestDetails } from "~/lib/leads/homeowner.server";
import { HOMEOWNER_STATUS_LABEL } from "~/lib/leads/lead-status";
import { listHomeownerLeads } from "~/lib/leads/leads.server";
import { formId } from "~/lib/format/form-fields";
import { formatMoney, formatMoneyWhole } from "~/lib/format/money";
import { requireUser } from "~/lib/auth/session.server";
import { readStoredPlan, type StoredPlanRecord } from "~/lib/design/stored-plan";
import { summaryInUnit } from "~/lib/format/length-text";
import { CARE_NOTES } from "~/lib/builds/care-notes";
import { CheckoutRefused } from "~/lib/platform/payments.server";
import { balanceLines, listBalancesFor, startBalanceCheckout } from "~/lib/builds/job-balance.server";
import { bookedDaysByLead, describeBuildDays } from "~/lib/builds/builds.server";
import { formatZonedDate } from "~/lib/format/zoned-time";
import { LabelledLines } from "~/components/labelled-lines";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "My fire-pit requests · Emberwright" }];

const HOMEOWNER_PROPOSAL_STATE = {
  sent: "ready to read and sign",
  accepted: "signed, deposit to pay",
  signed: "signed",
  withdrawn: "withdrawn",
  expired: "expired",
} as const;

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["homeowner"] });
  const rows = await listHomeownerLeads(user.id);
  // Only rows of this homeowner's own requests (the leads come from their account).
  const {
    photos,
    liveBookings,
    companies: companyRows,
    proposals: proposalRows,
    sentRevisions,
  } = await loadHomeownerRequestDetails(rows);
  const [balances, buildDays] = await Promise.all([
    listBalancesFor(rows.map((l) => l.id)),
    bookedDaysByLead(rows.map((l) => l.id)),
  ]);
  const now = Date.now();
  const paidParam = Number(new URL(request.url).searchParams.get("paid"));
  const movedId = Number(new URL(request.url).searchParams.get("moved"));
  const moved = liveBookings.find((b) => b.id === movedId && b.status === "confirmed");
  return {
    name: user.name,
    moved: moved
      ? { startsAt: moved.startsAt, timeZone: companyRows.find((c) => c.id === moved.companyId)!.timeZone }
      : null,
    requests: rows.map((lead) => {
      const original = readStoredPlan(lead);
      const company = companyRows.find((c) => c.id === lead.companyId)!;
      const range = (low: number | null, high: number | null) =>
        low !== null && high !== null ? `${formatMoneyWhole(low)} – ${formatMoneyWhole(high)}` : null;
      const booking = liveBookings.find((b) => b.leadId === lead.id && b.status === "confirmed");
      return {
        id: lead.id,
        companyName: company.name,
        companyTimeZone: company.timeZone,
        companyPhone: phoneDisplay(company.phone),
        // Newest first: every revision sent to them, then their own request as they sent it.
        designs: [
          ...sentRevisions
            .filter((r) => r.leadId === lead.id)
            .map((r, i) =>
              drawing(
                `revision-${r.id}`,
                i === 0 ? `Revised design from ${company.name}` : `Earlier revision from ${company.name}`,
                `sent ${dateOf(r.sentAt!)}`,
                readStoredPlan(r),
                range(r.priceLowCents, r.priceHighCents),
              ),
            ),
          drawing(
            `request-${lead.id}`,
            "Your design as you sent it",
            `sent ${dateOf(lead.createdAt)}`,
            original,
            range(lead.priceLowCents, lead.priceHighCents),
          ),
        ],
        consultPath: `/c/${company.slug}/consult/${lead.ref}`,
        status: HOMEOWNER_STATUS_LABEL[lead.status],
        buildDays:
          lead.status === "build-booked" && buildDays.get(lead.id)?.length
            ? describeBuildDays(buildDays.get(lead.id)!)
            : null,
        sentOn: new Date(lead.createdAt).toLocaleDateString("en-US", { dateStyle: "medium" }),
        photos: photos.filter((p) => p.leadId === lead.id && p.source !== "final"),
        finalPhotos: photos.filter((p) => p.leadId === lead.id && p.source === "final"),
        balance: balanceView(
          balances.find((b) => b.leadId === lead.id),
          company.timeZone,
          paidParam === lead.id,
        ),
        isBuilt: lead.status === "built" || lead.status === "paid-in-full",
        proposals: proposalRows
          .filter((p) => p.leadId === lead.id && p.status !== "withdrawn")
          .map((p) => ({
            href: `/p/${p.token}`,
            number: parseProposalDocument(p.documentJson).number,
            state: HOMEOWNER_PROPOSAL_STATE[p.status],
            isChange: p.kind === "change-order",
          })),
        consult: booking
          ? {
              bookingId: booking.id,
              fee: formatMoney(booking.amountCents),
              startsAt: booking.startsAt,
              canCancel: new Date(booking.startsAt).getTime() - now >= HOMEOWNER_CANCEL_CUTOFF_HOURS * 3_600_000,
              movePath: `/my/consult/${booking.id}`,
            }
          : null,
        // A consult is booked before the visit; later stages have had theirs.
        isOpen: lead.status === "request" || lead.status === "called-back",
      };
    }),
  };
}

/** The balance as the homeowner reads it: its parts, what is due, and whether it is paid. */
function balanceView(
  balance: Awaited<ReturnType<typeof listBalancesFor>>[number] | undefined,
  timeZone: string,
  justPaid: boolean,
) {
  if (!balance) return null;
  return {
    lines: balanceLines(balance),
    due: formatMoney(Math.max(0, balance.amountCents)),
    credit: balance.amountCents < 0 ? formatMoney(-balance.amountCents) : null,
    // The part of a credit going back to the deposit's card (null: the contractor pays it by hand).
    creditToCard:
      balance.amountCents < 0 && balance.refundAmountCents && balance.refundPaymentIntentId
        ? {
            amount: formatMoney(balance.refundAmountCents),
            isWhole: balance.refundAmountCents === -balance.amountCents,
            refundedOn: balance.refundedAt ? formatZonedDate(balance.refundedAt, timeZone) : null,
          }
        : null,
    paidOn: balance.paidAt && balance.amountCents > 0 ? formatZonedDate(balance.paidAt, timeZone) : null,
    canPay: !balance.paidAt && balance.amountCents > 0,
    // Back from the payment page before the payment service's notice arrived.
    isConfirming: justPaid && !balance.paidAt,
  };
}

const dateOf = (iso: string) => new Date(iso).toLocaleDateString("en-US", { dateStyle: "medium" });

/**
 * One design as the homeowner sees it: the plan drawing from its own stored record, its summary (in their unit) and
 * price.
 */
function drawing(key: string, title: string, when: string, record: StoredPlanRecord, price: string | null) {
  const unit = record.design.choices.unit;
  return {
    key,
    title,
    when,
    unit,
    // Stored in inches for the crew; said here in the unit the homeowner designed in.
    summary: summaryInUnit(record.design.summary, unit),
    price,
    sceneInput: planToSceneInput(record.plan, record.design.inputs.engine),
    caption: describePreview(record.plan, unit),
  };
}

const cancelSchema = z.object({ bookingId: formId("Choose a consult to cancel.") });
const payBalanceSchema = z.object({ leadId: formId("Choose the job whose balance to pay.") });

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["homeowner"] });
  const form = await readTextFields(request);
  if (form.intent === "pay-balance") {
    const wanted = payBalanceSchema.safeParse(form);
    if (!wanted.success) return data({ error: wanted.error.issues[0]!.message }, { status: 400 });
    // Only one of this homeowner's own jobs; anything else is "not found".
    const lead = (await listHomeownerLeads(user.id)).find((l) => l.id === wanted.data.leadId);
    const [balance] = lead ? await listBalancesFor([lead.id]) : [];
    if (!lead || !balance) return data({ error: "There is no balance to pay on that job." }, { status: 404 });
    const { companies: companyRows } = await loadHomeownerRequestDetails([lead]);
    try {
      return redirect(await startBalanceCheckout({ balance, lead, company: companyRows[0]! }));
    } catch (error) {
      if (error instanceof CheckoutRefused) return data({ error: error.message }, { status: 409 });
      console.error("balance checkout could not start", (error as Error).message);
      return data(
        {
          error:
            "The payment service is not answering right now. Nothing was charged: try “Pay the balance” again in a moment.",
        },
        { status: 503 },
      );
    }
  }
  const parsed = cancelSchema.safeParse(form);
  if (!parsed.success) return data({ error: parsed.error.issues[0]!.message }, { status: 400 });
  // Only a booking on one of this homeowner's own requests; anything else is "not found".
  const booking = await findHomeownerBooking(user.id, parsed.data.bookingId);
  if (!booking) return data({ error: "That consult was not found." }, { status: 404 });
  const cancelled = await cancelBooking({
    bookingId: booking.id,
    companyId: booking.companyId,
    by: "homeowner",
    actorUserId: user.id,
  });
  if (!cancelled.ok) return data({ error: cancelled.message }, { status: cancelRefusalStatus(cancelled) });
  return data({ error: null, cancelled: true });
}

export default function MyRequestsRoute({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <PublicShell
      right={
        <Form method="post" action="/logout">
          <button type="submit" className="btn-quiet">
            Sign out
          </button>
        </Form>
      }
    >
      <main className="mx-auto flex max-w-4xl flex-col gap-6 px-4 py-10 sm:px-6">
        <div>
          <h1 className="text-3xl font-extrabold">Your fire-pit requests</h1>
          <p className="mt-1 text-char-600">Signed in as {loaderData.name}.</p>
        </div>
        {actionData?.error ? <FormAlert>{actionData.error}</FormAlert> : null}
        {actionData && "cancelled" in actionData ? (
          <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
            Your consult is cancelled. The fee is refunded to your card; you will get an e-mail.
          </p>
        ) : null}
        {loaderData.moved ? (
          <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
            Your consult is moved to{" "}
            <LocalTime iso={loaderData.moved.startsAt} companyTimeZone={loaderData.moved.timeZone} />. The fee you paid
            carries over; an e-mail with the new calendar file is on its way.
          </p>
        ) : null}
        {loaderData.requests.length === 0 ? <p className="card p-6">You have not sent a request yet.</p> : null}
        {loaderData.requests.map((req) => (
          <article key={req.id} className="flex flex-col gap-4 card p-6" aria-labelledby={`req-${req.id}`}>
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 id={`req-${req.id}`} className="text-xl font-extrabold">
                Request sent {req.sentOn} <span className="font-semibold text-char-600">to {req.companyName}</span>
              </h2>
              <span className="rounded-full bg-ember-50 px-3 py-1 text-sm font-bold text-ember-700">{req.status}</span>
            </div>
            {req.companyPhone ? (
              <p className="-mt-2 text-sm text-char-700">
                Questions about it? Call {req.companyName} at{" "}
                <a
                  href={req.companyPhone.href}
                  className="font-bold whitespace-nowrap text-ember-700 underline underline-offset-2"
                >
                  {req.companyPhone.text}
                </a>{" "}
                or reply to any of their e-mails.
              </p>
            ) : null}
            {req.buildDays ? (
              <p className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
                Your fire pit is booked to be built on {req.buildDays}.
              </p>
            ) : null}
            {/* What is due comes first: on a phone the designs below run long. */}
            {req.balance ? <BalanceSection leadId={req.id} balance={req.balance} /> : null}
            <section aria-label={`Designs for the request sent ${req.sentOn}`} className="grid gap-4 md:grid-cols-2">
              {req.designs.map((d, i) => (
                <figure
                  key={d.key}
                  id={d.key}
                  className={`flex min-w-0 flex-col overflow-hidden rounded-xl border ${i === 0 && req.designs.length > 1 ? "border-ember-300" : "border-ash-200"}`}
                >
                  <figcaption className="border-b border-ash-200 bg-ash-50 px-4 py-3">
                    <h3 className="font-extrabold">{d.title}</h3>
                    <p className="text-sm text-char-600">
                      {d.when}
                      {d.price ? (
                        <>
                          {" "}
                          · estimated <strong className="text-char-900">{d.price}</strong>
                        </>
                      ) : null}
                    </p>
                  </figcaption>
                  <div className="aspect-square max-h-80 w-full self-center bg-white p-2">
                    <PitPlanSvg input={d.sceneInput} unit={d.unit} className="h-full w-full" />
                  </div>
                  <p className="border-t border-ash-200 px-4 py-2 text-xs text-char-600">
                    Plan, to scale. {d.caption}.
                  </p>
                  <details className="border-t border-ash-200 px-4 py-3 text-sm">
                    <summary className="cursor-pointer font-bold text-char-700">Every choice in this design</summary>
                    <LabelledLines lines={d.summary} className="mt-2 grid gap-y-1" wrap />
                  </details>
                </figure>
              ))}
            </section>
            {req.consult ? (
              <div className="flex flex-wrap items-center justify-between gap-3 rounded-lg bg-moss-100 px-4 py-3 text-sm">
                <span>
                  <strong>Design consult:</strong>{" "}
                  <LocalTime iso={req.consult.startsAt} companyTimeZone={req.companyTimeZone} />
                </span>
                {req.consult.canCancel ? (
                  <div className="flex flex-wrap items-center gap-2">
                    <Link to={req.consult.movePath} className="btn-quiet">
                      Move to another time
                    </Link>
                    <ConfirmAction
                      label="Cancel the consult"
                      question={`Cancel your design consult with ${req.companyName}? The fee of ${req.consult.fee} goes back to the card that paid it.`}
                      confirmLabel="Yes, cancel it"
                      keepLabel="Keep my consult"
                    >
                      <input type="hidden" name="bookingId" value={req.consult.bookingId} />
                    </ConfirmAction>
                  </div>
                ) : (
                  <span className="text-char-600">
                    Less than a day to go: call {req.companyName}
                    {req.companyPhone ? ` at ${req.companyPhone.text}` : ""} to change it.
                  </span>
                )}
              </div>
            ) : req.isOpen ? (
              <Link to={req.consultPath} className="btn-quiet self-start">
                Book a design consult
              </Link>
            ) : null}
            {req.finalPhotos.length ? (
              <section aria-label="Your finished fire pit" className="flex flex-col gap-2">
                <h3 className="font-extrabold">Your finished fire pit</h3>
                <ul className="flex flex-wrap gap-3">
                  {req.finalPhotos.map((photo, i) => (
                    <li key={photo.id}>
                      <a href={`/photos/${photo.id}`} className="block rounded-lg focus-visible:outline-2">
                        <img
                          src={`/photos/${photo.id}`}
                          alt={`The finished pit, photo ${i + 1}`}
                          className="h-32 w-44 rounded-lg object-cover"
                          loading="lazy"
                        />
                      </a>
                    </li>
                  ))}
                </ul>
              </section>
            ) : null}
            {req.isBuilt ? (
              <details className="rounded-lg border border-ash-200 px-4 py-3 text-sm">
                <summary className="cursor-pointer font-bold text-char-700">Looking after your fire pit</summary>
                <ul className="mt-2 flex list-disc flex-col gap-1 pl-5">
                  {CARE_NOTES.map((note) => (
                    <li key={note}>{note}</li>
                  ))}
                </ul>
              </details>
            ) : null}
            {req.proposals.length ? (
              <ul className="flex flex-col gap-1 text-sm" aria-label="Proposals">
                {req.proposals.map((p) => (
                  <li key={p.href}>
                    <Link to={p.href} className="font-bold text-ember-700 underline">
                      {p.number}
                    </Link>
                    : {p.state}
                  </li>
                ))}
              </ul>
            ) : null}
            {req.photos.length ? (
              <ul className="flex flex-wrap gap-3" aria-label="Your yard photos">
                {req.photos.map((photo) => (
                  <li key={photo.id}>
                    <img
                      src={`/photos/${photo.id}`}
                      alt={photo.originalName}
                      className="h-24 w-32 rounded-lg object-cover"
                      loading="lazy"
                    />
                  </li>
                ))}
              </ul>
            ) : null}
          </article>
        ))}
      </main>
    </PublicShell>
  );
}

type BalanceView = NonNullable<Route.ComponentProps["loaderData"]["requests"][number]["balance"]>;

/** The balance on completion: how it was reached, and the button that opens the payment page. */
function BalanceSection({ leadId, balance }: { leadId: number; balance: BalanceView }) {
  return (
    <section
      id={`balance-${leadId}`}
      aria-labelledby={`balance-${leadId}-title`}
      className="flex flex-col gap-3 rounded-xl border border-ember-300 bg-ember-50 p-4"
    >
      <h3 id={`balance-${leadId}-title`} className="text-lg font-extrabold">
        Balance on completion
      </h3>
      <dl className="grid max-w-sm grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm">
        {balance.lines.map((line) => (
          <div key={line.label} className="contents">
            <dt>{line.label}</dt>
            <dd className="text-right tabular-nums">{line.amount}</dd>
          </div>
        ))}
        <div className="contents font-extrabold">
          <dt className="border-t border-ash-300 pt-1">{balance.paidOn ? "Balance" : "Balance due"}</dt>
          <dd className="border-t border-ash-300 pt-1 text-right tabular-nums" data-testid="balance-due">
            {balance.due}
          </dd>
        </div>
      </dl>
      {balance.paidOn ? (
        <p role="status" className="font-bold text-moss-700">
          Paid in full on {balance.paidOn}. Thank you.
        </p>
      ) : null}
      {balance.credit ? (
        <p className="text-sm">
          The change orders left a credit of {balance.credit} in your favour;{" "}
          {balance.creditToCard
            ? `${balance.creditToCard.isWhole ? "it" : balance.creditToCard.amount} ${
                balance.creditToCard.refundedOn
                  ? `was refunded to the card that paid the deposit on ${balance.creditToCard.refundedOn}`
                  : "is being refunded to the card that paid the deposit"
              }${balance.creditToCard.isWhole ? "." : ", and your contractor pays you the rest."}`
            : "your contractor pays it back to you."}
        </p>
      ) : null}
      {balance.isConfirming ? (
        <p role="status" className="text-sm font-semibold">
          Thank you: your payment is being confirmed and shows here in a moment.
        </p>
      ) : null}
      {balance.canPay ? (
        <Form method="post" className="flex flex-wrap items-center gap-3">
          <input type="hidden" name="intent" value="pay-balance" />
          <input type="hidden" name="leadId" value={leadId} />
          <button type="submit" className="btn-primary">
            Pay the balance of {balance.due}
          </button>
          <span className="text-sm text-char-600">By card, on a secure payment page.</span>
        </Form>
      ) : null}
    </section>
  );
}
