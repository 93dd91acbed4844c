import { data, Form, Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/my";
import { LocalTime } from "~/components/local-time";
import { PublicShell } from "~/components/public-shell";
import { ConfirmAction } from "~/components/ui/confirm-action";
import { FormAlert } from "~/components/ui/field";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { cancelBooking, cancelRefusalStatus, HOMEOWNER_CANCEL_CUTOFF_HOURS } from "~/lib/consults/booking.server";
import { findHomeownerBooking, loadHomeownerRequestDetails } from "~/lib/leads/homeowner.server";
import { HOMEOWNER_STATUS_LABEL } from "~/lib/leads/lead-status";
import { listHomeownerLeads } from "~/lib/leads/leads.server";
import { formId } from "~/lib/format/form-fields";
import { formatMoney, formatMoneyWhole } from "~/lib/format/money";
import { requireUser } from "~/lib/auth/session.server";
import { readStoredDesign } from "~/lib/design/stored-plan";
import { summaryInUnit } from "~/lib/format/length-text";

export const meta: Route.MetaFunction = () => [{ title: "My fire-pit requests · Emberwright" }];

const HOMEOWNER_PROPOSAL_STATE = { sent: "ready to read and sign", accepted: "signed, deposit to pay", signed: "signed", withdrawn: "withdrawn", expired: "expired" } as const;

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["homeowner"] });
  const rows = await listHomeownerLeads(user.id);
  // Only rows of this homeowner's own requests (the leads come from their account).
  const { photos, liveBookings, companies: companyRows, proposals: proposalRows } = await loadHomeownerRequestDetails(rows);
  const now = Date.now();
  return {
    name: user.name,
    requests: rows.map((lead) => {
      const design = readStoredDesign(lead.designJson);
      const company = companyRows.find((c) => c.id === lead.companyId)!;
      const booking = liveBookings.find((b) => b.leadId === lead.id && b.status === "confirmed");
      return {
        id: lead.id,
        companyName: company.name,
        companyTimeZone: company.timeZone,
        consultPath: `/c/${company.slug}/consult/${lead.ref}`,
        status: HOMEOWNER_STATUS_LABEL[lead.status],
        sentOn: new Date(lead.createdAt).toLocaleDateString("en-US", { dateStyle: "medium" }),
        // Stored in inches for the crew; said here in the unit the homeowner designed in.
        summary: summaryInUnit(design.summary, design.choices.unit),
        price:
          lead.priceLowCents !== null && lead.priceHighCents !== null
            ? `${formatMoneyWhole(lead.priceLowCents)} – ${formatMoneyWhole(lead.priceHighCents)}`
            : null,
        photos: photos.filter((p) => p.leadId === lead.id),
        proposals: proposalRows
          .filter((p) => p.leadId === lead.id && p.status !== "withdrawn")
          .map((p) => ({ href: `/p/${p.token}`, number: parseProposalDocument(p.documentJson).number, state: HOMEOWNER_PROPOSAL_STATE[p.status], isChange: p.kind === "change-order" })),
        consult: booking
          ? {
              bookingId: booking.id,
              fee: formatMoney(booking.amountCents),
              startsAt: booking.startsAt,
              canCancel: new Date(booking.startsAt).getTime() - now >= HOMEOWNER_CANCEL_CUTOFF_HOURS * 3_600_000,
            }
          : null,
        // A consult is booked before the visit; later stages have had theirs.
        isOpen: lead.status === "request" || lead.status === "called-back",
      };
    }),
  };
}

const cancelSchema = z.object({ bookingId: formId("Choose a consult to cancel.") });

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["homeowner"] });
  const parsed = cancelSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ error: parsed.error.issues[0]!.message }, { status: 400 });
  // Only a booking on one of this homeowner's own requests; anything else is "not found".
  const booking = await findHomeownerBooking(user.id, parsed.data.bookingId);
  if (!booking) return data({ error: "That consult was not found." }, { status: 404 });
  const cancelled = await cancelBooking({ bookingId: booking.id, companyId: booking.companyId, by: "homeowner", actorUserId: user.id });
  if (!cancelled.ok) return data({ error: cancelled.message }, { status: cancelRefusalStatus(cancelled) });
  return data({ error: null, cancelled: true });
}

export default function MyRequestsRoute({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <PublicShell
      right={
        <Form method="post" action="/logout">
          <button type="submit" className="btn-quiet">Sign out</button>
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
        {loaderData.requests.length === 0 ? <p className="card p-6">You have not sent a request yet.</p> : null}
        {loaderData.requests.map((req) => (
          <article key={req.id} className="card flex flex-col gap-4 p-6" aria-labelledby={`req-${req.id}`}>
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 id={`req-${req.id}`} className="text-xl font-extrabold">
                Request sent {req.sentOn} <span className="font-semibold text-char-600">to {req.companyName}</span>
              </h2>
              <span className="rounded-full bg-ember-50 px-3 py-1 text-sm font-bold text-ember-700">{req.status}</span>
            </div>
            <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
              {req.summary.map((line) => (
                <div key={line.label} className="flex gap-2">
                  <dt className="font-bold text-char-700">{line.label}:</dt>
                  <dd>{line.value}</dd>
                </div>
              ))}
            </dl>
            {req.price ? <p className="text-lg font-extrabold">Estimated {req.price}</p> : null}
            {req.consult ? (
              <div className="flex flex-wrap items-center justify-between gap-3 rounded-lg bg-moss-100 px-4 py-3 text-sm">
                <span>
                  <strong>Design consult:</strong> <LocalTime iso={req.consult.startsAt} companyTimeZone={req.companyTimeZone} />
                </span>
                {req.consult.canCancel ? (
                  <ConfirmAction
                    label="Cancel the consult"
                    question={`Cancel your design consult with ${req.companyName}? The fee of ${req.consult.fee} goes back to the card that paid it.`}
                    confirmLabel="Yes, cancel it"
                    keepLabel="Keep my consult"
                  >
                    <input type="hidden" name="bookingId" value={req.consult.bookingId} />
                  </ConfirmAction>
                ) : (
                  <span className="text-char-600">Less than a day to go: call {req.companyName} to change it.</span>
                )}
              </div>
            ) : req.isOpen ? (
              <Link to={req.consultPath} className="btn-quiet self-start">Book a design consult</Link>
            ) : null}
            {req.proposals.length ? (
              <ul className="flex flex-col gap-1 text-sm" aria-label="Proposals">
                {req.proposals.map((p) => (
                  <li key={p.href}>
                    <Link to={p.href} className="font-bold text-ember-700 underline">{p.number}</Link>: {p.state}
                  </li>
                ))}
              </ul>
            ) : null}
            {req.photos.length ? (
              <ul className="flex flex-wrap gap-3" aria-label="Your yard photos">
                {req.photos.map((photo) => (
                  <li key={photo.id}>
                    <img src={`/photos/${photo.id}`} alt={photo.originalName} className="h-24 w-32 rounded-lg object-cover" loading="lazy" />
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
