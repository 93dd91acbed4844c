import { useEffect, useEffectEvent, useRef } from "react";
import { data, Form, Link, redirect, useFetcher, useNavigation, type ShouldRevalidateFunctionArgs } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/consult";
import { LocalTime, TimeZoneField } from "~/components/local-time";
import { PublicShell } from "~/components/public-shell";
import { FormAlert } from "~/components/ui/field";
import { ConsultTimePicker, onlyDayChanged } from "~/components/consult-time-picker";
import { VisitBrief, VisitFacts } from "~/components/consult-visit";
import {
  abandonCheckout,
  designLine,
  findLiveBooking,
  holdSlot,
  listCompanySlots,
  SlotUnavailableError,
  startCheckout,
} from "~/lib/consults/booking.server";
import { findCompanyBySlug } from "~/lib/catalog/catalog.server";
import { CONSULT_HOLD_MINUTES, groupSlotsByDay } from "~/lib/consults/consult-slots";
import { appOrigin } from "~/lib/platform/email.server";
import { env } from "~/lib/platform/env.server";
import { findLeadByRef } from "~/lib/leads/leads.server";
import { formatMoney } from "~/lib/format/money";
import { clientAddress, createLimiter, spendLimit } from "~/lib/platform/rate-limit.server";
import { possessive } from "~/lib/format/wording";
import { phoneDisplay } from "~/lib/format/phone";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Book a design consult · Emberwright" }];

async function loadLead(params: { companySlug: string; ref: string }) {
  const company = await findCompanyBySlug(params.companySlug);
  const lead = company ? await findLeadByRef(company.id, params.ref) : null;
  if (!company || !lead) throw new Response("Not found", { status: 404 });
  return { company, lead };
}

// Reached by the unguessable request reference (from the confirmation page, the e-mail or /my).
// Document responses take their headers from here: pass an action's Retry-After through.
export const headers: Route.HeadersFunction = ({ actionHeaders, loaderHeaders }) =>
  actionHeaders.has("Retry-After") ? actionHeaders : loaderHeaders;

// Choosing a day only changes what is shown: the free times already came with the page.
export function shouldRevalidate({
  currentUrl,
  nextUrl,
  formMethod,
  defaultShouldRevalidate,
}: ShouldRevalidateFunctionArgs) {
  return onlyDayChanged({ currentUrl, nextUrl, formMethod }) ? false : defaultShouldRevalidate;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { company, lead } = await loadLead(params);
  const url = new URL(request.url);
  const left = Number(url.searchParams.get("left"));
  // Back from the payment page without paying: the page posts `leave` to free the held time at once
  // (a loader never writes).
  const booking = await findLiveBooking(lead.id);
  const slots = booking?.status === "confirmed" ? [] : await listCompanySlots(company);
  return {
    company: {
      name: company.name,
      timeZone: company.timeZone,
      fee: formatMoney(company.consultFeeCents),
      phone: phoneDisplay(company.phone),
      visitMinutes: company.consultSlotMinutes,
    },
    firstName: lead.customerName.split(" ")[0],
    address: `${lead.street}, ${lead.town}`,
    design: designLine(lead),
    booking: booking ? { status: booking.status, startsAt: booking.startsAt } : null,
    days: groupSlotsByDay(slots, company.timeZone).map(({ day, slots: list }) => ({
      day,
      slots: list.map((s) => ({ startsAt: s.startsAt })),
    })),
    didLeave: left > 0,
    leftBookingId: Number.isSafeInteger(left) && left > 0 ? left : null,
  };
}

const bookSchema = z.object({
  startsAt: z.iso.datetime({ error: "Choose a time from the list." }),
  timeZone: z.string().max(64).optional(),
});

const leaveSchema = z.object({
  bookingId: z.coerce
    .number({ error: "Booking must be a consult id." })
    .int({ error: "Booking must be a whole number." })
    .positive({ error: "Booking must be a positive id." }),
});

/**
 * Back from the payment page without paying: frees the held time once the page is shown. True once
 * the time is free and the page's times are read again (the post and its revalidation are done).
 */
function useLeaveCheckout(bookingId: number | null): boolean {
  const fetcher = useFetcher();
  const sent = useRef<number | null>(null);
  const leave = useEffectEvent(
    (id: number) => void fetcher.submit({ intent: "leave", bookingId: String(id) }, { method: "post" }),
  );
  useEffect(() => {
    if (bookingId === null || sent.current === bookingId) return;
    sent.current = bookingId;
    leave(bookingId);
  }, [bookingId]);
  return fetcher.state === "idle" && fetcher.data !== undefined;
}

// Per company and address, like the request form.
const bookingLimiter = createLimiter("consult-booking:company+address", env.PUBLIC_FORM_LIMIT, 10 * 60);

export async function action({ request, params, context }: Route.ActionArgs) {
  const { company, lead } = await loadLead(params);
  const limit = await spendLimit(bookingLimiter, `${company.id}|${clientAddress(request, context)}`);
  if (!limit.ok) {
    return data(
      { error: "Too many tries from this address. Please wait a few minutes." },
      { status: 429, headers: { "Retry-After": String(limit.retryAfterSeconds) } },
    );
  }
  const form = await readTextFields(request);
  if (form.intent === "leave") {
    const left = leaveSchema.safeParse(form);
    if (!left.success) return data({ error: left.error.issues[0]!.message }, { status: 400 });
    await abandonCheckout(left.data.bookingId, lead.id);
    return data({ error: null });
  }
  const parsed = bookSchema.safeParse(form);
  if (!parsed.success) return data({ error: parsed.error.issues[0]!.message }, { status: 400 });
  const timeZone =
    parsed.data.timeZone && Intl.supportedValuesOf("timeZone").includes(parsed.data.timeZone)
      ? parsed.data.timeZone
      : null;

  let booking = await findLiveBooking(lead.id);
  if (booking?.status === "confirmed") return data({ error: "Your consult is already booked." }, { status: 409 });
  if (booking && booking.startsAt !== new Date(parsed.data.startsAt).toISOString()) {
    await abandonCheckout(booking.id, lead.id);
    booking = null;
  }
  try {
    booking ??= await holdSlot({
      company,
      lead,
      startsAt: new Date(parsed.data.startsAt).toISOString(),
      customerTimeZone: timeZone,
    });
  } catch (error) {
    if (error instanceof SlotUnavailableError) return data({ error: error.message }, { status: 409 });
    throw error;
  }
  try {
    const url = await startCheckout({
      booking,
      company,
      lead,
      origin: appOrigin(request),
      basePath: `/c/${params.companySlug}/consult/${params.ref}`,
    });
    return redirect(url, 303);
  } catch (error) {
    if (error instanceof SlotUnavailableError) return data({ error: error.message }, { status: 409 });
    // Nothing was charged; the hold stands, and a retry reuses the same checkout key.
    console.error("checkout could not start", (error as Error).message);
    return data(
      {
        error: `The payment service is not answering right now. Nothing was charged and your time is held for ${CONSULT_HOLD_MINUTES} minutes: try again in a moment.`,
      },
      { status: 503 },
    );
  }
}

export default function ConsultRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { company, firstName, booking, days, didLeave, address, design } = loaderData;
  // Said only once it is true: the held time is free and the times below include it again.
  const isFreed = useLeaveCheckout(loaderData.leftBookingId);
  const navigation = useNavigation();
  const isPaying = navigation.state !== "idle" && navigation.formMethod === "POST";
  return (
    <PublicShell>
      <main className="mx-auto flex max-w-6xl flex-col gap-6 px-4 py-8 sm:px-6 sm:py-10">
        <div className="max-w-3xl">
          <p className="text-sm font-extrabold tracking-widest text-ember-700 uppercase">{company.name}</p>
          <h1 className="mt-1 text-3xl font-extrabold">Book a design consult</h1>
          <p className="mt-2 text-char-600">
            Someone from {company.name} comes to your home, {firstName}, walks the spot with you, measures it and
            settles the design and price before anything is built.
          </p>
        </div>
        <VisitFacts minutes={company.visitMinutes} address={address} fee={company.fee} design={design} />
        {actionData?.error ? <FormAlert>{actionData.error}</FormAlert> : null}
        {didLeave && isFreed && !actionData ? (
          <p role="status" className="rounded-lg bg-ash-100 px-4 py-3 text-sm font-semibold text-char-700">
            You left the payment page, so nothing was charged and that time is free again.
          </p>
        ) : null}
        <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
          {booking?.status === "confirmed" ? (
            <section className="card p-6" aria-labelledby="booked-title">
              <h2 id="booked-title" className="text-xl font-extrabold">
                Your consult is booked
              </h2>
              <p className="mt-2 text-lg">
                <LocalTime iso={booking.startsAt} companyTimeZone={company.timeZone} />
              </p>
              <p className="mt-2 text-sm text-char-600">
                To move it to another time (no second payment) or cancel it, sign in and open your requests, up to a day
                ahead.
              </p>
              <Link to="/my" className="mt-4 btn-quiet">
                My requests
              </Link>
            </section>
          ) : days.length === 0 ? (
            <p className="card p-6">
              No times are free in the coming weeks. {company.name} will contact you about your request.
            </p>
          ) : (
            <Form
              method="post"
              className="flex min-w-0 flex-col gap-5 card p-4 sm:p-6"
              aria-label="Choose a time for the consult"
            >
              <TimeZoneField />
              {booking?.status === "held" ? (
                <div className="flex flex-wrap items-center justify-between gap-3 rounded-xl border border-ember-300 bg-ember-50 p-4">
                  <p>
                    <strong>Held for you:</strong>{" "}
                    <LocalTime iso={booking.startsAt} companyTimeZone={company.timeZone} />
                  </p>
                  <button
                    type="submit"
                    name="startsAt"
                    value={booking.startsAt}
                    formNoValidate
                    className="btn-primary"
                    disabled={isPaying}
                  >
                    Continue to payment
                  </button>
                </div>
              ) : null}
              <p className="text-sm text-char-600">
                Times are in {possessive(company.name)} time zone ({company.timeZone.replace(/_/g, " ")}).
              </p>
              <ConsultTimePicker
                days={days}
                timeZone={company.timeZone}
                visitMinutes={company.visitMinutes}
                isBusy={isPaying}
                submitLabel={() => `Hold this time and pay ${company.fee}`}
                footnote={
                  <p className="text-xs text-char-600">
                    Holding a time keeps it yours for {CONSULT_HOLD_MINUTES} minutes while you pay on the secure payment
                    page.
                  </p>
                }
              />
            </Form>
          )}
          <VisitBrief companyName={company.name} phone={company.phone} minutes={company.visitMinutes} />
        </div>
      </main>
    </PublicShell>
  );
}
