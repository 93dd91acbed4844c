import { Link } from "react-router";
import type { Route } from "./+types/request-sent";
import { PublicShell } from "~/components/public-shell";
import { findCompanyBySlug } from "~/lib/catalog/catalog.server";
import { findLeadByRef } from "~/lib/leads/leads.server";
import { formatMoney, formatMoneyWhole } from "~/lib/format/money";
import { readStoredDesign } from "~/lib/design/stored-plan";
import { summaryInUnit } from "~/lib/format/length-text";

export const meta: Route.MetaFunction = () => [{ title: "Request sent · Emberwright" }];

// Reached through the unguessable ref in the redirect after sending; shows no contact details.
export async function loader({ params }: Route.LoaderArgs) {
  const company = await findCompanyBySlug(params.companySlug);
  const lead = company ? await findLeadByRef(company.id, params.ref) : null;
  if (!company || !lead) throw new Response("Not found", { status: 404 });
  const design = readStoredDesign(lead.designJson);
  // Nothing here depends on whether the address has an account: the page would tell anyone who
  // typed an address whether it is registered. The e-mail carries the right next step.
  return {
    companyName: company.name,
    companySlug: company.slug,
    ref: lead.ref,
    consultFee: formatMoney(company.consultFeeCents),
    firstName: lead.customerName.split(" ")[0],
    // Stored in inches for the crew; said here in the unit the homeowner designed in.
    summary: summaryInUnit(design.summary, design.choices.unit),
    price:
      lead.priceLowCents !== null && lead.priceHighCents !== null
        ? `${formatMoneyWhole(lead.priceLowCents)} – ${formatMoneyWhole(lead.priceHighCents)}`
        : null,
  };
}

export default function RequestSentRoute({ loaderData }: Route.ComponentProps) {
  const { companyName, firstName, summary, price, companySlug, ref, consultFee } = loaderData;
  return (
    <PublicShell>
      <main className="mx-auto flex max-w-3xl flex-col gap-6 px-4 py-10 sm:px-6">
        <div>
          <p className="text-sm font-extrabold tracking-widest text-moss-600 uppercase">Request sent</p>
          <h1 className="mt-1 text-3xl font-extrabold">
            Thank you, {firstName}. {companyName} has your design.
          </h1>
        </div>
        <section className="card p-6" aria-labelledby="sent-design">
          <h2 id="sent-design" className="text-lg font-extrabold">
            Your design
          </h2>
          <dl className="mt-2 grid gap-y-1 text-sm">
            {summary.map((line) => (
              <div key={line.label} className="flex gap-2">
                <dt className="font-bold text-char-700">{line.label}:</dt>
                <dd>{line.value}</dd>
              </div>
            ))}
          </dl>
          {price ? <p className="mt-3 text-xl font-extrabold">Estimated {price}</p> : null}
        </section>
        <section
          className="flex flex-col gap-3 card border-ember-200 bg-ember-50 p-6 sm:flex-row sm:items-center sm:justify-between"
          aria-labelledby="consult-offer"
        >
          <div>
            <h2 id="consult-offer" className="text-lg font-extrabold">
              Want it settled sooner?
            </h2>
            <p className="text-char-700">
              Book a design consult at your home: {consultFee}, credited toward the build.
            </p>
          </div>
          <Link to={`/c/${companySlug}/consult/${ref}`} className="btn-primary shrink-0">
            Book a design consult
          </Link>
        </section>
        <section className="card p-6" aria-labelledby="next-steps">
          <h2 id="next-steps" className="text-lg font-extrabold">
            What happens next
          </h2>
          <ol className="mt-2 flex list-decimal flex-col gap-2 pl-5 text-char-700">
            <li>
              We sent you an e-mail with your design. Its link adds this request to your account (and lets you set a
              password if you have none yet), so you can follow it at any time.
            </li>
            <li>{companyName} looks at your design and your yard photos, usually within two working days.</li>
            <li>They get in touch to visit, or to confirm a firm price.</li>
          </ol>
          <p className="mt-4 text-sm text-char-600">
            Before anyone digs: call 811 so buried lines are marked, and check your town's rules on outdoor fires.
          </p>
        </section>
        <Link to={`/c/${companySlug}`} className="btn-quiet self-start">
          Design another
        </Link>
      </main>
    </PublicShell>
  );
}
