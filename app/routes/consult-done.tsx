import { useEffect } from "react";
import { Link, useRevalidator } from "react-router";
import type { Route } from "./+types/consult-done";
import { LocalTime } from "~/components/local-time";
import { PublicShell } from "~/components/public-shell";
import { findCompanyBySlug } from "~/lib/catalog/catalog.server";
import { findBookingByCheckout } from "~/lib/consults/booking.server";
import { findLeadByRef } from "~/lib/leads/leads.server";

export const meta: Route.MetaFunction = () => [{ title: "Design consult · Emberwright" }];

// The success redirect only shows state: the signed webhook is what confirms a booking.
export async function loader({ request, params }: Route.LoaderArgs) {
  const company = await findCompanyBySlug(params.companySlug);
  const lead = company ? await findLeadByRef(company.id, params.ref) : null;
  const sessionId = new URL(request.url).searchParams.get("session_id") ?? "";
  const booking = company && lead ? await findBookingByCheckout(lead.id, sessionId) : null;
  if (!company || !lead || !booking) throw new Response("Not found", { status: 404 });
  const state =
    booking.status === "confirmed"
      ? "confirmed"
      : booking.isPaid && booking.status === "cancelled"
        ? "refunded"
        : booking.status === "held"
          ? "waiting"
          : "not-paid";
  return {
    state,
    startsAt: booking.startsAt,
    companyName: company.name,
    timeZone: company.timeZone,
    consultPath: `/c/${params.companySlug}/consult/${params.ref}`,
  };
}

export default function ConsultDoneRoute({ loaderData }: Route.ComponentProps) {
  const { state, startsAt, companyName, timeZone, consultPath } = loaderData;
  const revalidator = useRevalidator();
  useEffect(() => {
    if (state !== "waiting") return;
    const id = setInterval(() => revalidator.revalidate(), 1500);
    return () => clearInterval(id);
  }, [state, revalidator]);
  return (
    <PublicShell>
      <main className="mx-auto flex max-w-2xl flex-col gap-6 px-4 py-12 sm:px-6">
        {state === "confirmed" ? (
          <section className="card p-6" aria-live="polite">
            <p className="text-sm font-extrabold tracking-widest text-moss-600 uppercase">Paid and booked</p>
            <h1 className="mt-1 text-3xl font-extrabold">Your design consult is booked</h1>
            <p className="mt-3 text-lg font-bold">
              <LocalTime iso={startsAt} companyTimeZone={timeZone} />
            </p>
            <p className="mt-2 text-char-600">
              A confirmation with a calendar file is on its way to your inbox. {companyName} will see you then.
            </p>
            <Link to="/my" className="mt-4 btn-quiet">
              My requests
            </Link>
          </section>
        ) : state === "waiting" ? (
          <section className="card p-6" aria-live="polite">
            <h1 className="text-2xl font-extrabold">Confirming your payment…</h1>
            <p className="mt-2 text-char-600">
              This takes a few seconds. You can close this page: we e-mail you as soon as it is confirmed.
            </p>
          </section>
        ) : state === "refunded" ? (
          <section className="card p-6" aria-live="polite">
            <h1 className="text-2xl font-extrabold">That time was taken</h1>
            <p className="mt-2 text-char-600">
              Someone else booked it while your payment went through. Your payment is refunded in full.
            </p>
            <Link to={consultPath} className="mt-4 btn-primary">
              Choose another time
            </Link>
          </section>
        ) : (
          <section className="card p-6" aria-live="polite">
            <h1 className="text-2xl font-extrabold">No payment was taken</h1>
            <Link to={consultPath} className="mt-4 btn-primary">
              Choose a time
            </Link>
          </section>
        )}
      </main>
    </PublicShell>
  );
}
