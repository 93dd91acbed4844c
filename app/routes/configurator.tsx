import { useEffect, useState } from "react";
import { data, Form, redirect, type ShouldRevalidateFunctionArgs } from "react-router";
import type { Route } from "./+types/configurator";
import { DesignControls } from "~/components/configurator/design-controls";
import { PlanResults } from "~/components/configurator/plan-results";
import { useLivePlan } from "~/components/configurator/use-live-plan";
import { RequestForm } from "~/components/configurator/request-form";
import { PitPreview } from "~/components/pit-preview";
import { PublicShell } from "~/components/public-shell";
import { formatLength } from "~/domain/units";
import { findCompanyBySlug, listCatalog } from "~/lib/catalog/catalog.server";
import { planForDesign, recordPlan, toCatalogChoice } from "~/lib/design/configurator.server";
import { designToSearchParams, parseDesign } from "~/lib/design/design";
import { describePreview, designToSceneInput, summarizeDesign, type PublicPlan } from "~/lib/design/design-plan";
import { appOrigin } from "~/lib/platform/email.server";
import { env } from "~/lib/platform/env.server";
import { publicFactors, readCompanyFactors } from "~/lib/settings/factor-settings";
import { fieldErrors } from "~/lib/format/form-fields";
import { leadFormSchema } from "~/lib/leads/lead-schema";
import { createLead, PhotoQuotaExceeded, photoBytesToday } from "~/lib/leads/leads.server";
import type { PlanFieldError } from "~/lib/design/plan-schema";
import { publicPlan } from "~/lib/design/plan.server";
import { clientAddress, createLimiter, spendLimit } from "~/lib/platform/rate-limit.server";
import { checkReceivedPhotos, discardReceivedPhotos, MAX_COMPANY_PHOTO_BYTES_PER_DAY, MAX_FORM_BYTES, readLeadForm, storeReceivedPhotos } from "~/lib/platform/uploads.server";
import { speakLengths } from "~/lib/format/length-text";
import { formatPhone, phoneHref } from "~/lib/format/phone";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `Design your fire pit · ${loaderData.company.name}` : "Design your fire pit" },
  { name: "description", content: "Size a round masonry fire pit, see it in 3D and get a price range." },
];

async function loadCompanyCatalog(slug: string) {
  const company = await findCompanyBySlug(slug);
  if (!company) throw new Response("Not found", { status: 404 });
  const catalog = (await listCatalog(company.id, { activeOnly: true })).map(toCatalogChoice);
  return { company, catalog, factors: publicFactors(readCompanyFactors(company)) };
}

// Document responses take their headers from here: pass an action's Retry-After through.
export const headers: Route.HeadersFunction = ({ actionHeaders, loaderHeaders }) => (actionHeaders.has("Retry-After") ? actionHeaders : loaderHeaders);

export async function loader({ request, params }: Route.LoaderArgs) {
  const { company, catalog, factors } = await loadCompanyCatalog(params.companySlug);
  const design = parseDesign(new URL(request.url).searchParams, catalog);
  const result = design ? await planForDesign(company.slug, design, catalog, factors) : { plan: null, errors: [] };
  return {
    company: { slug: company.slug, name: company.name, town: company.town, phone: company.phone },
    catalog,
    factors,
    design,
    plan: result.plan ? (publicPlan(result.plan) as PublicPlan) : null,
    planErrors: result.errors,
  };
}

// Requests from one address to one company in 10 minutes; honest households send one or two. Keyed
// by company too, so a bot on one contractor's page cannot close every contractor's form.
const requestLimiter = createLimiter("lead-request:company+address", env.PUBLIC_FORM_LIMIT, 10 * 60);

export async function action({ request, params, context }: Route.ActionArgs) {
  const { company, catalog, factors } = await loadCompanyCatalog(params.companySlug);
  const limit = await spendLimit(requestLimiter, `${company.id}|${clientAddress(request, context)}`);
  if (!limit.ok) {
    return data(
      { errors: { form: "Too many requests from this address. Please wait a few minutes and try again." }, values: {} },
      { status: 429, headers: { "Retry-After": String(limit.retryAfterSeconds) } },
    );
  }
  const length = Number(request.headers.get("Content-Length") ?? "NaN");
  if (!Number.isFinite(length) || length > MAX_FORM_BYTES) {
    return data({ errors: { photos: "The request is too large: attach at most 6 photos of 10 MB each." }, values: {} }, { status: 413 });
  }
  // Photos stream to temporary files as they arrive; the limits stop the reading itself.
  const reading = await readLeadForm(request);
  if (!reading.ok) return data({ errors: reading.errors, values: {} }, { status: reading.status });
  const { fields, photos: received } = reading;
  const parsed = leadFormSchema.safeParse(fields);
  const { website: _honeypot, ...values } = fields;
  const errors: Record<string, string> = parsed.success ? {} : fieldErrors(parsed.error);
  const design = parsed.success ? parseDesign(new URLSearchParams(fields.design ?? ""), catalog) : null;
  const result = design ? await planForDesign(company.slug, design, catalog, factors) : { plan: null, errors: [] as PlanFieldError[] };
  if (!parsed.success || !design || !result.plan) {
    // Only the quick checks here: nothing is decoded for a request that is refused anyway.
    const quick = await checkReceivedPhotos(received);
    await discardReceivedPhotos(received);
    if (!quick.ok) errors.photos = quick.message;
    if (!parsed.success || !quick.ok) return data({ errors, values }, { status: 400 });
    const message = result.errors[0]?.message ?? "This design cannot be built as it stands.";
    return data({ errors: { form: `Change the design first: ${message}` }, values }, { status: 422 });
  }
  const quotaRefusal = () => data({ errors: { photos: new PhotoQuotaExceeded().message }, values }, { status: 429, headers: { "Retry-After": "3600" } });
  if (received.length && (await photoBytesToday(undefined, company.id)) >= MAX_COMPANY_PHOTO_BYTES_PER_DAY) {
    await discardReceivedPhotos(received);
    return quotaRefusal();
  }
  const stored = await storeReceivedPhotos(received);
  if (!stored.ok) return data({ errors: { photos: stored.message }, values }, { status: 400 });
  const { plan } = result;
  // The stored record (lead page, cut sheet, PDF) stays in inches for the crew; the e-mails speak the homeowner's chosen unit.
  const summary = summarizeDesign(publicPlan(plan) as PublicPlan, design, catalog, "in");
  const summaryInChosenUnit = summarizeDesign(publicPlan(plan) as PublicPlan, design, catalog, design.unit);
  let lead: Awaited<ReturnType<typeof createLead>>;
  try {
    lead = await createLead({
      company,
      form: parsed.data,
      photos: stored.photos,
      origin: appOrigin(request),
      snapshot: {
        record: recordPlan({ design, summary, resolved: result.resolved, plan }),
        stoneName: catalog.find((i) => i.id === design.stoneId)?.name ?? "",
        bowlDiameterIn: plan.ring.bowlDiameterIn,
        priceLowCents: plan.price?.lowCents ?? null,
        priceHighCents: plan.price?.highCents ?? null,
        summary: summaryInChosenUnit,
      },
    });
  } catch (error) {
    // createLead deletes the stored photos itself when it fails; nothing of the request is kept.
    if (error instanceof PhotoQuotaExceeded) return quotaRefusal();
    throw error;
  }
  return redirect(`/c/${company.slug}/sent/${lead.ref}`);
}

// The plan API answers the live updates itself, and a refused request form changes nothing the
// loader reads: re-running it would only reset the design to the address React Router last saw.
export function shouldRevalidate({ formAction, formMethod, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return formAction === "/api/plan" || formMethod === "POST" ? false : defaultShouldRevalidate;
}

export default function ConfiguratorRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { company, catalog, factors } = loaderData;
  const [isHydrated, setIsHydrated] = useState(false);
  useEffect(() => setIsHydrated(true), []);
  const { design, plan, planErrors, changeDesign, isUpdating } = useLivePlan({
    initial: loaderData,
    companySlug: company.slug,
    catalog,
    factors,
    // Keep the design in the address bar (bookmark, share, reload) without a navigation.
    onDesignChange: (next) =>
      window.history.replaceState(window.history.state, "", `${window.location.pathname}?${designToSearchParams(next).toString()}`),
  });

  if (!design) {
    return (
      <PublicShell>
        <main className="mx-auto max-w-3xl px-4 py-16">
          <h1 className="text-3xl font-extrabold">{company.name}</h1>
          <p className="mt-3 text-char-600">This contractor is not taking fire-pit requests online yet.</p>
        </main>
      </PublicShell>
    );
  }

  const designQuery = designToSearchParams(design).toString();
  const f = (inches: number) => formatLength(inches, design.unit);
  const sceneInput = plan ? designToSceneInput(plan, design, catalog) : null;

  return (
    <PublicShell>
      <main className="mx-auto flex max-w-7xl flex-col gap-8 px-4 py-6 sm:px-6 sm:py-8">
        <div className="flex flex-wrap items-end justify-between gap-4">
          <div>
            <p className="text-sm font-extrabold tracking-widest text-ember-600 uppercase">{company.name}</p>
            <h1 className="text-3xl font-extrabold sm:text-4xl">Design your fire pit</h1>
            {company.phone ? (
              <p className="mt-1 text-sm text-char-700">
                Questions first? Call {company.name}:{" "}
                <a href={phoneHref(company.phone)} className="font-bold text-ember-700 underline underline-offset-2">
                  {formatPhone(company.phone)}
                </a>
              </p>
            ) : null}
          </div>
          <div role="group" aria-label="Units" className="inline-flex rounded-lg border border-ash-300 bg-white p-0.5 text-sm font-bold">
            {(["in", "mm"] as const).map((u) => (
              <button
                key={u}
                type="button"
                aria-pressed={design.unit === u}
                onClick={() => changeDesign({ unit: u })}
                className={`rounded-md px-3 py-1.5 ${design.unit === u ? "bg-char-800 text-ash-50" : "text-char-700 hover:bg-ash-100"}`}
              >
                {u === "in" ? "Inches" : "Millimetres"}
              </button>
            ))}
          </div>
        </div>

        <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_24rem]">
          <div className="flex min-w-0 flex-col gap-6">
            {sceneInput && plan ? (
              <PitPreview input={sceneInput} caption={describePreview(plan, design.unit)} unit={design.unit} formatLength={f} />
            ) : null}
            {planErrors.length ? (
              <p role="alert" className="rounded-lg bg-alert-100 px-4 py-3 text-sm font-semibold text-alert-700">
                {planErrors.map((e) => speakLengths(e.message, design.unit)).join(" ")}
              </p>
            ) : null}
            {plan ? <PlanResults plan={plan} unit={design.unit} isUpdating={isUpdating} /> : null}
          </div>
          <Form method="get" className="card p-5 lg:sticky lg:top-4" aria-label="Design choices" onSubmit={(e) => isHydrated && e.preventDefault()}>
            <input type="hidden" name="unit" value={design.unit} />
            <DesignControls
              design={design}
              catalog={catalog}
              plannedUnitCount={plan?.ring.unitCount ?? null}
              onChange={changeDesign}
            />
            {isHydrated ? null : (
              <button type="submit" className="btn-primary mt-4 w-full">
                Update the design
              </button>
            )}
          </Form>
        </div>

        {plan ? (
          <section aria-label="What you will get" className="card p-5 text-sm">
            <h2 className="text-lg font-extrabold">Your design in short</h2>
            <dl className="mt-2 grid gap-x-6 gap-y-1 sm:grid-cols-2">
              {summarizeDesign(plan, design, catalog, design.unit).map((line) => (
                <div key={line.label} className="flex gap-2">
                  <dt className="font-bold text-char-700">{line.label}:</dt>
                  <dd>{line.value}</dd>
                </div>
              ))}
            </dl>
          </section>
        ) : null}

        <RequestForm designQuery={designQuery} state={actionData} companyName={company.name} />
      </main>
    </PublicShell>
  );
}
