import { useEffect, useEffectEvent, useRef } from "react";
import { data, Form, Link, redirect, useFetcher, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/consult";
import { LocalTime, TimeZoneField } from "~/components/local-time";
import { PublicShell } from "~/components/public-shell";
import { FormAlert } from "~/components/ui/field";
import { abandonCheckout, findLiveBooking, holdSlot, listCompanySlots, SlotUnavailableError, startCheckout } from "~/lib/consults/booking.server";
import { findCompanyBySlug } from "~/lib/catalog/catalog.server";
import { CONSULT_HOLD_MINUTES } from "~/lib/consults/consult-slots";
import { zonedDay } from "~/lib/format/zoned-time";
import { appOrigin } from "~/lib/platform/email.server";
import { env } from "~/lib/platform/env.server";
import { findLeadByRef } from "~/lib/leads/leads.server";
import { formatMoney } from "~/lib/format/money";
import { clientAddress, createLimiter, spendLimit } from "~/lib/platform/rate-limit.server";
import { possessive } from "~/lib/format/wording";

export const meta: Route.MetaFunction = () => [{ title: "Book a design consult · Emberwright" }];

async function loadLead(params: { companySlug: string; ref: string }) {
  const company = await findCompanyBySlug(params.companySlug);
  const lead = company ? await findLeadByRef(company.id, params.ref) : null;
  if (!company || !lead) throw new Response("Not found", { status: 404 });
  return { company, lead };
}

// Reached by the unguessable request reference (from the confirmation page, the e-mail or /my).
// Document responses take their headers from here: pass an action's Retry-After through.
export const headers: Route.HeadersFunction = ({ actionHeaders, loaderHeaders }) => (actionHeaders.has("Retry-After") ? actionHeaders : loaderHeaders);

export async function loader({ request, params }: Route.LoaderArgs) {
  const { company, lead } = await loadLead(params);
  const url = new URL(request.url);
  const left = Number(url.searchParams.get("left"));
  // Back from the payment page without paying: the page posts `leave` to free the held time at once
  // (a loader never writes).
  const booking = await findLiveBooking(lead.id);
  const slots = booking?.status === "confirmed" ? [] : await listCompanySlots(company);
  const days = new Map<string, { startsAt: string }[]>();
  for (const slot of slots) {
    const day = zonedDay(new Date(slot.startsAt), company.timeZone);
    days.set(day, [...(days.get(day) ?? []), { startsAt: slot.startsAt }]);
  }
  return {
    company: { name: company.name, timeZone: company.timeZone, fee: formatMoney(company.consultFeeCents) },
    firstName: lead.customerName.split(" ")[0],
    booking: booking ? { status: booking.status, startsAt: booking.startsAt } : null,
    days: [...days.entries()].map(([day, list]) => ({ day, slots: list })),
    didLeave: left > 0,
    leftBookingId: Number.isSafeInteger(left) && left > 0 ? left : null,
  };
}

const bookSchema = z.object({
  startsAt: z.iso.datetime({ error: "Choose a time from the list." }),
  timeZone: z.string().max(64).optional(),
});

const leaveSchema = z.object({ bookingId: z.coerce.number({ error: "Booking must be a consult id." }).int({ error: "Booking must be a whole number." }).positive({ error: "Booking must be a positive id." }) });

/** Back from the payment page without paying: frees the held time once the page is shown. */
function useLeaveCheckout(bookingId: number | null) {
  const fetcher = useFetcher();
  const sent = useRef<number | null>(null);
  const leave = useEffectEvent((id: number) => void fetcher.submit({ intent: "leave", bookingId: String(id) }, { method: "post" }));
  useEffect(() => {
    if (bookingId === null || sent.current === bookingId) return;
    sent.current = bookingId;
    leave(bookingId);
  }, [bookingId]);
}

// Per company and address, like the request form.
const bookingLimiter = createLimiter("consult-booking:company+address", env.PUBLIC_FORM_LIMIT, 10 * 60);

export async function action({ request, params, context }: Route.ActionArgs) {
  const { company, lead } = await loadLead(params);
  const limit = await spendLimit(bookingLimiter, `${company.id}|${clientAddress(request, context)}`);
  if (!limit.ok) {
    return data({ error: "Too many tries from this address. Please wait a few minutes." }, { status: 429, headers: { "Retry-After": String(limit.retryAfterSeconds) } });
  }
  const form = Object.fromEntries(await request.formData());
  if (form.intent === "leave") {
    const left = leaveSchema.safeParse(form);
    if (!left.success) return data({ error: left.error.issues[0]!.message }, { status: 400 });
    await abandonCheckout(left.data.bookingId, lead.id);
    return data({ error: null });
  }
  const parsed = bookSchema.safeParse(form);
  if (!parsed.success) return data({ error: parsed.error.issues[0]!.message }, { status: 400 });
  const timeZone = parsed.data.timeZone && Intl.supportedValuesOf("timeZone").includes(parsed.data.timeZone) ? parsed.data.timeZone : null;

  let booking = await findLiveBooking(lead.id);
  if (booking?.status === "confirmed") return data({ error: "Your consult is already booked." }, { status: 409 });
  if (booking && booking.startsAt !== new Date(parsed.data.startsAt).toISOString()) {
    await abandonCheckout(booking.id, lead.id);
    booking = null;
  }
  try {
    booking ??= await holdSlot({ company, lead, startsAt: new Date(parsed.data.startsAt).toISOString(), customerTimeZone: timeZone });
  } catch (error) {
    if (error instanceof SlotUnavailableError) return data({ error: error.message }, { status: 409 });
    throw error;
  }
  try {
    const url = await startCheckout({ booking, company, lead, origin: appOrigin(request), basePath: `/c/${params.companySlug}/consult/${params.ref}` });
    return redirect(url, 303);
  } catch (error) {
    if (error instanceof SlotUnavailableError) return data({ error: error.message }, { status: 409 });
    // Nothing was charged; the hold stands, and a retry reuses the same checkout key.
    console.error("checkout could not start", (error as Error).message);
    return data(
      { error: `The payment service is not answering right now. Nothing was charged and your time is held for ${CONSULT_HOLD_MINUTES} minutes: try again in a moment.` },
      { status: 503 },
    );
  }
}

export default function ConsultRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { company, firstName, booking, days, didLeave } = loaderData;
  useLeaveCheckout(loaderData.leftBookingId);
  const navigation = useNavigation();
  const isPaying = navigation.state !== "idle" && navigation.formMethod === "POST";
  const dayLabel = (day: string) =>
    new Intl.DateTimeFormat("en-US", { weekday: "long", month: "long", day: "numeric", timeZone: "UTC" }).format(new Date(`${day}T12:00:00Z`));
  return (
    <PublicShell>
      <main className="mx-auto flex max-w-3xl flex-col gap-6 px-4 py-10 sm:px-6">
        <div>
          <p className="text-sm font-extrabold tracking-widest text-ember-600 uppercase">{company.name}</p>
          <h1 className="mt-1 text-3xl font-extrabold">Book a design consult</h1>
          <p className="mt-2 text-char-600">
            {company.name} sends someone to your home to measure the spot and settle the design with you, {firstName}. The fee of {company.fee} is
            paid now and credited toward the build.
          </p>
        </div>
        {actionData?.error ? <FormAlert>{actionData.error}</FormAlert> : null}
        {didLeave && !actionData ? (
          <p role="status" className="rounded-lg bg-ash-100 px-4 py-3 text-sm font-semibold text-char-700">
            You left the payment page, so nothing was charged and that time is free again.
          </p>
        ) : null}
        {booking?.status === "confirmed" ? (
          <section className="card p-6">
            <h2 className="text-xl font-extrabold">Your consult is booked</h2>
            <p className="mt-2 text-lg">
              <LocalTime iso={booking.startsAt} companyTimeZone={company.timeZone} />
            </p>
            <p className="mt-2 text-sm text-char-600">To cancel or change it, sign in and open your requests.</p>
            <Link to="/my" className="btn-quiet mt-4">My requests</Link>
          </section>
        ) : days.length === 0 ? (
          <p className="card p-6">No times are free in the coming weeks. {company.name} will contact you about your request.</p>
        ) : (
          <Form method="post" className="flex flex-col gap-5">
            <TimeZoneField />
            {booking?.status === "held" ? (
              <div className="card flex flex-wrap items-center justify-between gap-3 border-ember-300 bg-ember-50 p-4">
                <p>
                  <strong>Held for you:</strong> <LocalTime iso={booking.startsAt} companyTimeZone={company.timeZone} />
                </p>
                <button type="submit" name="startsAt" value={booking.startsAt} className="btn-primary" disabled={isPaying}>
                  Continue to payment
                </button>
              </div>
            ) : null}
            <p className="text-sm text-char-600">Times are in {possessive(company.name)} time zone ({company.timeZone.replace(/_/g, " ")}).</p>
            {days.map(({ day, slots }) => (
              <fieldset key={day} className="card p-4">
                <legend className="px-1 font-extrabold">{dayLabel(day)}</legend>
                <div className="mt-2 flex flex-wrap gap-2">
                  {slots.map((slot) => (
                    <button
                      key={slot.startsAt}
                      type="submit"
                      name="startsAt"
                      value={slot.startsAt}
                      disabled={isPaying}
                      className="btn-quiet tabular-nums"
                      aria-label={`Book ${new Intl.DateTimeFormat("en-US", { timeZone: company.timeZone, weekday: "long", month: "long", day: "numeric", hour: "numeric", minute: "2-digit" }).format(new Date(slot.startsAt))} and pay ${company.fee}`}
                    >
                      {new Intl.DateTimeFormat("en-US", { timeZone: company.timeZone, hour: "numeric", minute: "2-digit" }).format(new Date(slot.startsAt))}
                    </button>
                  ))}
                </div>
              </fieldset>
            ))}
            <p className="text-xs text-char-500">Choosing a time holds it for {CONSULT_HOLD_MINUTES} minutes while you pay on the secure payment page.</p>
          </Form>
        )}
      </main>
    </PublicShell>
  );
}
