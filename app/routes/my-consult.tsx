import { data, Form, Link, redirect, useNavigation, type ShouldRevalidateFunctionArgs } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/my-consult";
import { ConsultTimePicker, onlyDayChanged } from "~/components/consult-time-picker";
import { VisitBrief, VisitFacts } from "~/components/consult-visit";
import { LocalTime } from "~/components/local-time";
import { PublicShell } from "~/components/public-shell";
import { FormAlert } from "~/components/ui/field";
import { designLine, loadHomeownerConsult, listCompanySlots, rescheduleBooking } from "~/lib/consults/booking.server";
import { groupSlotsByDay, HOMEOWNER_CHANGE_CUTOFF_HOURS } from "~/lib/consults/consult-slots";
import { formatMoney } from "~/lib/format/money";
import { phoneDisplay } from "~/lib/format/phone";
import { requireUser } from "~/lib/auth/session.server";
import { possessive } from "~/lib/format/wording";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Move your design consult · Emberwright" }];

const idSchema = z.coerce.number().int().positive();

async function loadOwnBooking(request: Request, params: { bookingId: string }) {
  const user = await requireUser(request, { roles: ["homeowner"] });
  const id = idSchema.safeParse(params.bookingId);
  // Only a booking on one of this homeowner's own requests; anyone else's is "not found".
  const found = id.success ? await loadHomeownerConsult(user.id, id.data) : null;
  if (!found) throw new Response("Not found", { status: 404 });
  return { user, ...found };
}

export function shouldRevalidate({
  currentUrl,
  nextUrl,
  formMethod,
  defaultShouldRevalidate,
}: ShouldRevalidateFunctionArgs) {
  return onlyDayChanged({ currentUrl, nextUrl, formMethod }) ? false : defaultShouldRevalidate;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { booking, company, lead } = await loadOwnBooking(request, params);
  const isBooked = booking.status === "confirmed";
  const canMove =
    isBooked && new Date(booking.startsAt).getTime() - Date.now() >= HOMEOWNER_CHANGE_CUTOFF_HOURS * 3_600_000;
  const slots = canMove ? await listCompanySlots(company) : [];
  return {
    company: {
      name: company.name,
      timeZone: company.timeZone,
      phone: phoneDisplay(company.phone),
      visitMinutes: company.consultSlotMinutes,
    },
    booking: { startsAt: booking.startsAt, fee: formatMoney(booking.amountCents), isBooked, canMove },
    address: `${lead.street}, ${lead.town}`,
    design: designLine(lead),
    days: groupSlotsByDay(slots, company.timeZone).map(({ day, slots: list }) => ({
      day,
      slots: list.map((s) => ({ startsAt: s.startsAt })),
    })),
  };
}

const moveSchema = z.object({ startsAt: z.iso.datetime({ offset: true, error: "Choose a new time from the list." }) });

export async function action({ request, params }: Route.ActionArgs) {
  const { user, booking } = await loadOwnBooking(request, params);
  const parsed = moveSchema.safeParse(await readTextFields(request));
  if (!parsed.success) return data({ error: parsed.error.issues[0]!.message }, { status: 400 });
  const moved = await rescheduleBooking({
    bookingId: booking.id,
    companyId: booking.companyId,
    startsAt: parsed.data.startsAt,
    by: "homeowner",
    actorUserId: user.id,
  });
  if (!moved.ok) return data({ error: moved.message }, { status: moved.status });
  return redirect(`/my?moved=${booking.id}`, 303);
}

export default function MoveConsultRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { company, booking, days, address, design } = loaderData;
  const navigation = useNavigation();
  const isBusy = navigation.state !== "idle" && navigation.formMethod === "POST";
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
      <main className="mx-auto flex max-w-6xl flex-col gap-6 px-4 py-8 sm:px-6 sm:py-10">
        <div className="max-w-3xl">
          <Link to="/my" className="text-sm font-bold text-ember-700 underline underline-offset-2">
            ← Your requests
          </Link>
          <h1 className="mt-2 text-3xl font-extrabold">Move your design consult</h1>
          <p className="mt-2 text-char-600">
            Now booked for{" "}
            <strong>
              <LocalTime iso={booking.startsAt} companyTimeZone={company.timeZone} />
            </strong>
            . The fee of {booking.fee} you paid carries over to the new time: nothing more is charged.
          </p>
        </div>
        <VisitFacts minutes={company.visitMinutes} address={address} fee={booking.fee} design={design} />
        {actionData?.error ? <FormAlert>{actionData.error}</FormAlert> : null}
        <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
          {!booking.isBooked ? (
            <p className="card p-6">This consult is no longer booked, so there is no time to move.</p>
          ) : !booking.canMove ? (
            <p className="card p-6">
              Less than a day to go: please call {company.name}
              {company.phone ? ` at ${company.phone.text}` : ""} to change it.
            </p>
          ) : days.length === 0 ? (
            <p className="card p-6">No other times are free in the coming weeks. Call {company.name} to find one.</p>
          ) : (
            <Form
              method="post"
              className="flex min-w-0 flex-col gap-5 card p-4 sm:p-6"
              aria-label="Choose the new time"
            >
              <p className="text-sm text-char-600">
                Times are in {possessive(company.name)} time zone ({company.timeZone.replace(/_/g, " ")}).
              </p>
              <ConsultTimePicker
                days={days}
                timeZone={company.timeZone}
                visitMinutes={company.visitMinutes}
                isBusy={isBusy}
                submitLabel={() => "Move my consult to this time"}
                footnote={
                  <p className="text-xs text-char-600">
                    You and {company.name} each get an e-mail with the new time; the calendar file replaces the old
                    event.
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
