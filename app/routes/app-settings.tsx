import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-settings";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { fieldErrors } from "~/lib/format/form-fields";
import { TextField, FormAlert } from "~/components/ui/field";
import { getCompany } from "~/lib/catalog/catalog.server";
import { saveCompanySettings, saveCrewSettings } from "~/lib/settings/company-settings.server";
import { companySettingsSchema } from "~/lib/settings/company-schema";
import { crewSettingsSchema } from "~/lib/settings/crew-schema";
import { CREW_DEFAULTS, WEEKDAY_CHOICES } from "~/lib/settings/crew-options";
import { parseWorkWeekdays } from "~/lib/builds/builds.server";
import { requireUser } from "~/lib/auth/session.server";
import { formatPhone } from "~/lib/format/phone";
import QRCode from "qrcode";
import { appOrigin } from "~/lib/platform/email.server";
import { currentTimeZoneName, groupTimeZones } from "~/lib/settings/time-zones";
import { TimeZoneField } from "~/components/time-zone-field";
import { PublicLink } from "~/components/public-link";
import { readForm } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Company settings · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const company = await getCompany(user.companyId);
  // The full address comes from APP_ORIGIN (as in e-mails), so a printed code never points at an internal host.
  const publicUrl = `${appOrigin(request)}/c/${company.slug}`;
  // Error correction level M (about 15 % of the code may be lost: a scuffed sticker still reads; ISO/IEC 18004).
  const qrSvg = await QRCode.toString(publicUrl, {
    type: "svg",
    errorCorrectionLevel: "M",
    margin: 4,
    color: { dark: "#1c1917", light: "#ffffff" },
  });
  const crew = {
    crewSize: company.crewSize,
    crewDayHours: company.crewDayHours,
    workWeekdays: parseWorkWeekdays(company.workWeekdaysJson),
  };
  // The phone is formatted here so the page does not ship the numbering plans.
  const phoneText = formatPhone(company.phone);
  return { company, crew, phoneText, timeZones: groupTimeZones(new Date()), publicUrl, qrSvg };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const form = await readForm(request);
  const noErrors: Record<string, string> = {};
  if (form.get("intent") === "crew") {
    // The crew form posts on its own: a refusal here leaves the company's other settings as they were.
    const crew = crewSettingsSchema.safeParse({
      crewSize: form.get("crewSize") ?? undefined,
      crewDayHours: form.get("crewDayHours") ?? undefined,
      workWeekdays: form.getAll("workWeekdays"),
    });
    if (!crew.success) return data({ errors: noErrors, crewErrors: fieldErrors(crew.error) }, { status: 400 });
    await saveCrewSettings(user.companyId, crew.data);
    return redirect("/app/settings?saved=crew");
  }
  const parsed = companySettingsSchema.safeParse(Object.fromEntries(form));
  if (!parsed.success) {
    return data({ errors: fieldErrors(parsed.error), crewErrors: noErrors }, { status: 400 });
  }
  await saveCompanySettings(user.companyId, parsed.data);
  return redirect("/app/settings?saved=1");
}

export default function SettingsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { company, crew, phoneText, timeZones, publicUrl, qrSvg } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const crewErrors: Record<string, string> = actionData?.crewErrors ?? {};
  const [params] = useSearchParams();
  const navigation = useNavigation();
  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-6">
      <div>
        <h1 className="text-2xl font-extrabold">Company settings</h1>
        <p className="text-char-600">
          Deposit, letterhead and what proposals include:{" "}
          <Link to="/app/settings/proposals" className="font-bold text-ember-700 underline">
            proposal terms
          </Link>
          .
        </p>
      </div>
      {params.get("saved") && !actionData ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {params.get("saved") === "crew"
            ? "Crew and working week saved: new build bookings use them."
            : "Settings saved."}
        </p>
      ) : null}
      <PublicLink url={publicUrl} qrSvg={qrSvg} fileName={`${company.slug}-qr-code.svg`} />
      {/* Keyed on the saved values: after a save the fields show what was stored (e.g. the phone
          formatted); a refused save keeps what was typed. */}
      <Form key={JSON.stringify(company)} method="post" className="flex flex-col gap-6" noValidate>
        {Object.keys(errors).length ? <FormAlert>Nothing was saved. Fix the fields marked below.</FormAlert> : null}
        <section className="grid gap-4 card p-6 sm:grid-cols-2">
          <h2 className="text-lg font-extrabold sm:col-span-2">Company</h2>
          <TextField
            label="Company name"
            name="name"
            defaultValue={company.name}
            error={errors.name}
            className="sm:col-span-2"
          />
          <TextField
            label="E-mail for new requests"
            name="email"
            type="email"
            defaultValue={company.email}
            error={errors.email}
          />
          <TextField
            label="Phone"
            name="phone"
            type="tel"
            autoComplete="tel"
            defaultValue={phoneText}
            error={errors.phone}
            hint="Homeowners see it on your page and in e-mails. Include the area code."
          />
          <TextField label="Town" name="town" defaultValue={company.town} error={errors.town} />
          <TimeZoneField
            groups={timeZones}
            defaultValue={currentTimeZoneName(company.timeZone)}
            error={errors.timeZone}
          />
        </section>
        <section className="grid gap-4 card p-6 sm:grid-cols-2">
          <h2 className="text-lg font-extrabold sm:col-span-2">Consults</h2>
          <TextField
            label="Design consult fee"
            name="consultFee"
            suffix="$"
            inputMode="decimal"
            defaultValue={(company.consultFeeCents / 100).toFixed(2)}
            error={errors.consultFee}
            hint="Credited toward the build."
          />
        </section>
        <section className="flex flex-col gap-2 card p-6">
          <h2 className="text-lg font-extrabold">Pricing, production rates and safety</h2>
          <p className="text-sm text-char-600">
            Labour rate, overhead and profit (markup on cost or margin of price), delivery, permits and sales tax,
            production rates, spares, base, adhesive and the fire setback are estimating factors, each with its default
            beside it.
          </p>
          <Link to="/app/settings/factors" className="btn-quiet self-start">
            Estimating factors
          </Link>
        </section>
        <div>
          <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
            Save settings
          </button>
        </div>
      </Form>
      <Form
        key={`crew-${JSON.stringify(crew)}`}
        method="post"
        className="flex flex-col gap-4 card p-6"
        aria-labelledby="crew-heading"
        noValidate
      >
        <input type="hidden" name="intent" value="crew" />
        <div>
          <h2 id="crew-heading" className="text-lg font-extrabold">
            Build crew and working week
          </h2>
          <p className="text-sm text-char-600">
            A job's build days are its labour-hours ÷ (people × hours a day), rounded up, laid on the ticked weekdays
            and skipping days off. Booked builds keep their dates until moved.
          </p>
        </div>
        {Object.keys(crewErrors).length ? (
          <FormAlert>Nothing was saved. Fix the crew fields marked below.</FormAlert>
        ) : null}
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="Crew size"
            name="crewSize"
            inputMode="numeric"
            suffix="people"
            defaultValue={String(crew.crewSize)}
            error={crewErrors.crewSize}
            hint={`1 to 12 people. Default: ${CREW_DEFAULTS.crewSize}.`}
          />
          <TextField
            label="Crew day"
            name="crewDayHours"
            inputMode="decimal"
            suffix="hours"
            defaultValue={String(crew.crewDayHours)}
            error={crewErrors.crewDayHours}
            hint={`Hours on site, 4 to 12. Default: ${CREW_DEFAULTS.crewDayHours}.`}
          />
        </div>
        <fieldset aria-describedby={crewErrors.workWeekdays ? "work-weekdays-error" : "work-weekdays-hint"}>
          <legend className="field-label">Working weekdays</legend>
          <div className="mt-1 flex flex-wrap gap-2">
            {WEEKDAY_CHOICES.map((d) => (
              <label
                key={d.value}
                className="flex items-center gap-2 rounded-lg border border-ash-300 px-3 py-2 text-sm font-semibold"
              >
                <input
                  type="checkbox"
                  name="workWeekdays"
                  value={d.value}
                  defaultChecked={crew.workWeekdays.includes(d.value)}
                />
                {d.label}
              </label>
            ))}
          </div>
          <p id="work-weekdays-hint" className="field-hint">
            At least one. Default: Monday to Friday.
          </p>
          {crewErrors.workWeekdays ? (
            <p id="work-weekdays-error" className="field-error">
              {crewErrors.workWeekdays}
            </p>
          ) : null}
        </fieldset>
        <div>
          <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
            Save crew and week
          </button>
        </div>
      </Form>
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
