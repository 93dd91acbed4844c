import { data, Form, Link, redirect, useNavigation, type ShouldRevalidateFunctionArgs } from "react-router";
import type { Route } from "./+types/app-lead-design";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { DesignControls } from "~/components/configurator/design-controls";
import { useLivePlan } from "~/components/configurator/use-live-plan";
import { PitPreview } from "~/components/pit-preview";
import { FormAlert } from "~/components/ui/field";
import { formatLength, type LengthUnit } from "~/domain/units";
import { getCompany, listCatalog } from "~/lib/catalog/catalog.server";
import { planForDesign, recordPlan, toCatalogChoice } from "~/lib/design/configurator.server";
import { designToSearchParams, parseDesign } from "~/lib/design/design";
import { describePreview, designToSceneInput, summarizeDesign, type PublicPlan } from "~/lib/design/design-plan";
import { checkDesignParams } from "~/lib/design/design-schema";
import { publicFactors, readCompanyFactors } from "~/lib/settings/factor-settings";
import { currentVersion, saveRevision } from "~/lib/leads/lead-workspace.server";
import type { PlanFieldError } from "~/lib/design/plan-schema";
import { formatMoneyWhole } from "~/lib/format/money";
import { publicPlan } from "~/lib/design/plan.server";
import { requireUser } from "~/lib/auth/session.server";
import { OFFICE_ROLES, findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import { speakLengths } from "~/lib/format/length-text";
import { possessive } from "~/lib/format/wording";
import { readForm } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  {
    title: loaderData
      ? `Revise ${possessive(loaderData.lead.customerName)} design · Emberwright`
      : "Revise a design · Emberwright",
  },
];

async function loadContext(request: Request, rawLeadId: string | undefined) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const lead = await findLeadFor(user, parseLeadId(rawLeadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const company = await getCompany(user.companyId);
  const catalog = (await listCatalog(company.id, { activeOnly: true })).map(toCatalogChoice);
  return { user, lead, company, catalog, factors: publicFactors(readCompanyFactors(company)) };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { lead, company, catalog, factors } = await loadContext(request, params.leadId);
  const current = await currentVersion(lead);
  // Read back through the current catalog: an item taken off sale since falls back to one on offer.
  const design = parseDesign(designToSearchParams(current.design.choices), catalog);
  const result = design ? await planForDesign(company.slug, design, catalog, factors) : { plan: null, errors: [] };
  return {
    lead: { id: lead.id, customerName: lead.customerName },
    company: { slug: company.slug },
    catalog,
    factors,
    design,
    plan: result.plan ? (publicPlan(result.plan) as PublicPlan) : null,
    planErrors: result.errors,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { user, lead, company, catalog, factors } = await loadContext(request, params.leadId);
  const form = await readForm(request);
  const query = String(form.get("design") ?? "");
  const errors = checkDesignParams(query, catalog);
  if (Object.keys(errors).length) return data({ errors }, { status: 400 });
  const design = parseDesign(new URLSearchParams(query), catalog);
  const result = design
    ? await planForDesign(company.slug, design, catalog, factors)
    : { plan: null, resolved: null, errors: [] as PlanFieldError[] };
  if (!design || !result.plan) {
    return data(
      {
        errors: {
          design: `This design cannot be built: ${result.errors[0]?.message ?? "check the choices."}`,
        } as Record<string, string>,
      },
      { status: 400 },
    );
  }
  const summary = summarizeDesign(publicPlan(result.plan) as PublicPlan, design, catalog, "in");
  await saveRevision(user, lead, recordPlan({ design, summary, resolved: result.resolved, plan: result.plan }));
  return redirect(`/app/leads/${lead.id}`);
}

// Live updates come from the plan API; re-running this loader after each would be waste.
export function shouldRevalidate({ formAction, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return formAction === "/api/plan" ? false : defaultShouldRevalidate;
}

export default function LeadDesignRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { lead, company, catalog, factors } = loaderData;
  const { design, plan, planErrors, changeDesign, isUpdating } = useLivePlan({
    initial: loaderData,
    companySlug: company.slug,
    catalog,
    factors,
  });
  const navigation = useNavigation();
  const errors: Record<string, string> = actionData?.errors ?? {};

  if (!design) {
    return <p className="card p-6">Your catalog offers no wall stone, so there is nothing to design with.</p>;
  }
  const f = (inches: number) => formatLength(inches, design.unit);
  const sceneInput = plan ? designToSceneInput(plan, design, catalog) : null;

  return (
    <div className="flex flex-col gap-6">
      <div>
        <Link to={`/app/leads/${lead.id}`} className="text-sm font-bold text-ember-700 hover:underline">
          ← {lead.customerName}
        </Link>
        <h1 className="mt-1 text-2xl font-extrabold">Revise the design</h1>
        <p className="text-char-600">
          Saved as a new revision with today's catalog costs. The homeowner's original request stays as it was sent.
        </p>
      </div>
      {Object.keys(errors).length ? (
        <FormAlert>
          Nothing was saved.{" "}
          {Object.entries(errors)
            .map(([field, message]) => `${field}: ${message}`)
            .join(" ")}
        </FormAlert>
      ) : null}
      <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="flex min-w-0 flex-col gap-6">
          {sceneInput && plan ? (
            <PitPreview
              input={sceneInput}
              caption={describePreview(plan, design.unit)}
              unit={design.unit}
              formatLength={f}
            />
          ) : null}
          {planErrors.length ? (
            <p role="alert" className="rounded-lg bg-alert-100 px-4 py-3 text-sm font-semibold text-alert-700">
              {planErrors.map((e) => speakLengths(e.message, design.unit)).join(" ")}
            </p>
          ) : null}
          {plan ? <RevisionSummary plan={plan} unit={design.unit} isUpdating={isUpdating} /> : null}
        </div>
        <div className="card p-5 lg:sticky lg:top-4">
          <DesignControls
            design={design}
            catalog={catalog}
            plannedUnitCount={plan?.ring.unitCount ?? null}
            outsideDiameterIn={plan?.ring.outsideDiameterIn ?? null}
            onChange={changeDesign}
          />
          <Form method="post" className="mt-5 border-t border-ash-200 pt-4">
            <input type="hidden" name="design" value={designToSearchParams(design).toString()} />
            <button
              type="submit"
              className="btn-primary w-full"
              disabled={navigation.state === "submitting" || planErrors.length > 0}
            >
              Save this revision
            </button>
          </Form>
        </div>
      </div>
    </div>
  );
}

/**
 * What the revision comes to, for staff: the price range at today's prices, the key sizes and anything worth a look.
 */
function RevisionSummary({ plan, unit, isUpdating }: { plan: PublicPlan; unit: LengthUnit; isUpdating: boolean }) {
  const f = (inches: number) => formatLength(inches, unit);
  const facts: [string, string][] = [
    ["Bowl", f(plan.ring.bowlDiameterIn)],
    ["Outside", f(plan.ring.outsideDiameterIn)],
    ["Wall height", f(plan.ring.wallHeightIn)],
    ["Units", `${plan.ring.unitsPerCourse} a course × ${plan.ring.courses}`],
    ["Caps", plan.caps ? String(plan.caps.count) : "None"],
    ["Labour", `${plan.labour.hours} h`],
  ];
  return (
    <section aria-labelledby="revision-summary" aria-busy={isUpdating} className="card p-5">
      <h2 id="revision-summary" className="text-sm font-extrabold tracking-wide text-char-600 uppercase">
        This revision
      </h2>
      <p className="mt-1 text-3xl font-extrabold text-char-900" data-testid="price-range">
        {plan.price
          ? `${formatMoneyWhole(plan.price.lowCents)} – ${formatMoneyWhole(plan.price.highCents)}`
          : "No price: an item has no cost in the catalog"}
      </p>
      <p className="text-sm text-char-600">
        At today's catalog costs and company rates. The full breakdown shows on the request once saved.
      </p>
      <dl className="mt-4 grid grid-cols-2 gap-x-4 gap-y-3 text-sm sm:grid-cols-3">
        {facts.map(([label, value]) => (
          <div key={label}>
            <dt className="text-char-500">{label}</dt>
            <dd className="font-extrabold text-char-900 tabular-nums">{value}</dd>
          </div>
        ))}
      </dl>
      {plan.warnings.length ? (
        <ul className="mt-4 list-disc rounded-lg bg-ember-50 py-3 pr-3 pl-8 text-sm text-char-800">
          {plan.warnings.map((w) => (
            <li key={w.code}>{speakLengths(w.message, unit)}</li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
