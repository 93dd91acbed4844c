import { useMemo, useRef } from "react";
import { useHydrated } from "~/components/use-browser-value";
import { data, Form, redirect, type ShouldRevalidateFunctionArgs } from "react-router";
import type { Route } from "./+types/configurator";
import { DesignControls } from "~/components/configurator/design-controls";
import { PlanCautions, PlanPrice, PlanWarnings } from "~/components/configurator/plan-results";
import { PreviewStrip } from "~/components/configurator/preview-strip";
import type { SiteFieldNotes } from "~/components/configurator/design-controls";
import { DEFAULT_FACTORS } from "~/domain/factors";
import { useLivePlan } from "~/components/configurator/use-live-plan";
import { RequestForm } from "~/components/configurator/request-form";
import { PitPreview } from "~/components/pit-preview";
import { PublicShell } from "~/components/public-shell";
import { formatLength } from "~/domain/units";
import { planForDesign } from "~/lib/design/configurator.server";
import { loadCompanyCatalog, receiveLeadRequest } from "~/lib/leads/lead-request.server";
import { designToSearchParams, parseDesign, type CatalogChoice, type Design } from "~/lib/design/design";
import { describePreview, designToSceneInput, summarizeDesign, type PublicPlan } from "~/lib/design/design-plan";
import { publicPlan } from "~/lib/design/plan.server";
import { speakLengths, summaryInUnit } from "~/lib/format/length-text";
import { phoneDisplay } from "~/lib/format/phone";
import { LabelledLines } from "~/components/labelled-lines";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `Design your fire pit · ${loaderData.company.name}` : "Design your fire pit" },
  { name: "description", content: "Size a round masonry fire pit, see it in 3D and get a price range." },
];

// Document responses take their headers from here: pass an action's Retry-After through.
export const headers: Route.HeadersFunction = ({ actionHeaders, loaderHeaders }) =>
  actionHeaders.has("Retry-After") ? actionHeaders : loaderHeaders;

export async function loader({ request, params }: Route.LoaderArgs) {
  const { company, catalog, factors } = await loadCompanyCatalog(params.companySlug);
  const design = parseDesign(new URL(request.url).searchParams, catalog);
  const result = design ? await planForDesign(company.slug, design, catalog, factors) : { plan: null, errors: [] };
  return {
    company: { slug: company.slug, name: company.name, town: company.town, phone: phoneDisplay(company.phone) },
    catalog,
    factors,
    design,
    plan: result.plan ? (publicPlan(result.plan) as PublicPlan) : null,
    planErrors: result.errors,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const outcome = await receiveLeadRequest({ request, companySlug: params.companySlug, context });
  if (outcome.ok) return redirect(outcome.location);
  return data({ errors: outcome.errors, values: outcome.values }, { status: outcome.status, headers: outcome.headers });
}

// The plan API answers the live updates itself, and a refused request form changes nothing the
// loader reads: re-running it would only reset the design to the address React Router last saw.
export function shouldRevalidate({ formAction, formMethod, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return formAction === "/api/plan" || formMethod === "POST" ? false : defaultShouldRevalidate;
}

export default function ConfiguratorRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { company, catalog, factors } = loaderData;
  const isHydrated = useHydrated();
  const priceRef = useRef<HTMLDivElement>(null);
  const { design, plan, planErrors, changeDesign, isUpdating } = useLivePlan({
    initial: loaderData,
    companySlug: company.slug,
    catalog,
    factors,
    // Keep the design in the address bar (bookmark, share, reload) without a navigation.
    onDesignChange: (next) =>
      window.history.replaceState(
        window.history.state,
        "",
        `${window.location.pathname}?${designToSearchParams(next).toString()}`,
      ),
  });

  // Kept across the re-render that follows hydration (and any that leaves the design as it was).
  const sceneInput = useMemo(
    () => (plan && design ? designToSceneInput(plan, design, catalog) : null),
    [plan, design, catalog],
  );

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
  // Each distance's consequence, said beside its field (the full list stays under "Safety first").
  const cautionFor = (code: string) => {
    const caution = plan?.cautions.find((c) => c.code === code);
    return caution ? speakLengths(caution.message, design.unit) : null;
  };
  const siteNotes: SiteFieldNotes = {
    setback: {
      requiredFt: factors.requiredSetbackFt ?? DEFAULT_FACTORS.requiredSetbackFt,
      note: cautionFor("setback-too-close"),
    },
    propertyLine: {
      requiredFt: factors.requiredPropertyLineFt ?? DEFAULT_FACTORS.requiredPropertyLineFt,
      note: cautionFor("property-line-too-close"),
    },
    branches: {
      requiredFt: factors.requiredBranchClearanceFt ?? DEFAULT_FACTORS.requiredBranchClearanceFt,
      note: cautionFor("branches-too-close"),
    },
  };

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
                <a href={company.phone.href} className="font-bold text-ember-700 underline underline-offset-2">
                  {company.phone.text}
                </a>
              </p>
            ) : null}
          </div>
          <div
            role="group"
            aria-label="Units"
            className="inline-flex rounded-lg border border-ash-300 bg-white p-0.5 text-sm font-bold"
          >
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

        {/* Wide screens: the preview, price and notes stay in view (sticky) beside the controls, the cautions and the
            request form as they scroll. Phones: preview and price come first, then the rest, with a slim strip keeping
            the price in sight. */}
        <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_28rem]">
          <div
            className="flex min-w-0 flex-col gap-4 lg:sticky lg:top-4 lg:max-h-[calc(100dvh-2rem)] lg:overflow-y-auto [&>*]:shrink-0"
            data-testid="preview-column"
          >
            {sceneInput && plan ? (
              <PitPreview
                id="preview"
                input={sceneInput}
                caption={describePreview(plan, design.unit)}
                unit={design.unit}
                formatLength={f}
                frameClassName="aspect-square sm:aspect-[4/3] lg:aspect-auto lg:h-[min(42dvh,30rem)]"
              />
            ) : null}
            {planErrors.length ? (
              <p role="alert" className="rounded-lg bg-alert-100 px-4 py-3 text-sm font-semibold text-alert-700">
                {planErrors.map((e) => speakLengths(e.message, design.unit)).join(" ")}
              </p>
            ) : null}
            {plan ? (
              <div ref={priceRef}>
                <PlanPrice plan={plan} unit={design.unit} isUpdating={isUpdating} />
              </div>
            ) : null}
            {plan ? <PlanWarnings plan={plan} unit={design.unit} /> : null}
          </div>
          {plan && isHydrated ? (
            <PreviewStrip watch={priceRef} plan={plan} sceneInput={sceneInput} unit={design.unit} previewId="preview" />
          ) : null}
          <div className="flex min-w-0 flex-col gap-6">
            <Form
              method="get"
              className="card p-5 render-when-near"
              aria-label="Design choices"
              onSubmit={(e) => isHydrated && e.preventDefault()}
            >
              <input type="hidden" name="unit" value={design.unit} />
              <DesignControls
                design={design}
                catalog={catalog}
                plannedUnitCount={plan?.ring.unitCount ?? null}
                outsideDiameterIn={plan?.ring.outsideDiameterIn ?? null}
                siteNotes={siteNotes}
                onChange={changeDesign}
              />
              {isHydrated ? null : (
                <button type="submit" className="mt-4 btn-primary w-full">
                  Update the design
                </button>
              )}
            </Form>

            {plan ? <PlanCautions plan={plan} unit={design.unit} /> : null}

            {plan ? <DesignSummary plan={plan} design={design} catalog={catalog} /> : null}

            <RequestForm
              designQuery={designQuery}
              state={actionData}
              companyName={company.name}
              companySlug={company.slug}
            />
          </div>
        </div>
      </main>
    </PublicShell>
  );
}

/** The design in short, a part of its own so React can pause between it and the rest while hydrating. */
function DesignSummary({ plan, design, catalog }: { plan: PublicPlan; design: Design; catalog: CatalogChoice[] }) {
  return (
    <section aria-label="What you will get" className="card p-5 text-sm render-when-near">
      <h2 className="text-lg font-extrabold">Your design in short</h2>
      <LabelledLines
        lines={summaryInUnit(summarizeDesign(plan, design, catalog, "in"), design.unit)}
        className="mt-2 grid gap-x-6 gap-y-1 sm:grid-cols-2 lg:grid-cols-1"
      />
    </section>
  );
}
