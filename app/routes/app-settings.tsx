import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-settings";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { fieldErrors } from "~/lib/format/form-fields";
import { TextField, FormAlert } from "~/components/ui/field";
import { getCompany } from "~/lib/catalog/catalog.server";
import { saveCompanySettings } from "~/lib/settings/company-settings.server";
import { companySettingsSchema } from "~/lib/settings/company-schema";
import { requireUser } from "~/lib/auth/session.server";
import { formatPhone } from "~/lib/format/phone";
import QRCode from "qrcode";
import { appOrigin } from "~/lib/platform/email.server";
import { currentTimeZoneName, groupTimeZones } from "~/lib/settings/time-zones";
import { TimeZoneField } from "~/components/time-zone-field";
import { PublicLink } from "~/components/public-link";

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
  return { company, timeZones: groupTimeZones(new Date()), publicUrl, qrSvg };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const form = Object.fromEntries(await request.formData());
  const parsed = companySettingsSchema.safeParse(form);
  if (!parsed.success) {
    return data({ errors: fieldErrors(parsed.error) }, { status: 400 });
  }
  await saveCompanySettings(user.companyId, parsed.data);
  return redirect("/app/settings?saved=1");
}

export default function SettingsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { company, timeZones, publicUrl, qrSvg } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
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
          Settings saved.
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
            defaultValue={formatPhone(company.phone)}
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
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
