import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/app-lead-proposal";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { FormAlert, TextField } from "~/components/ui/field";
import { basePriceCents, depositCents } from "~/domain/proposal-money";
import { getCompany } from "~/lib/catalog/catalog.server";
import { appOrigin } from "~/lib/platform/email.server";
import { isSignedStage } from "~/lib/leads/lead-status";
import { formatMoney } from "~/lib/format/money";
import { describeDeposit } from "~/lib/proposals/proposal-document";
import { MAX_ADD_ONS, parseComposeForm, withdrawSchema } from "~/lib/proposals/proposal-schema";
import { draftProposal, sendProposal, withdrawProposal } from "~/lib/proposals/proposals.server";
import { requireUser } from "~/lib/auth/session.server";
import { OFFICE_ROLES, findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `Proposal: ${loaderData.customerName} · Emberwright` : "Proposal · Emberwright" },
];

const dollars = (cents: number) => (cents / 100).toFixed(2);

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  if (isSignedStage(lead.status)) throw redirect(`/app/leads/${lead.id}/change-order`);
  const company = await getCompany(user.companyId);
  const draft = await draftProposal(lead, company);
  const base = basePriceCents(draft.fixedPriceCents, draft.allowances);
  return {
    leadId: lead.id,
    customerName: lead.customerName,
    designLabel: draft.version.revisionId === null ? "the homeowner's original design" : "the latest staff revision",
    estimate: draft.version.plan.price
      ? `${formatMoney(draft.version.plan.price.lowCents)}–${formatMoney(draft.version.plan.price.highCents)}`
      : null,
    defaults: {
      fixedPrice: dollars(draft.fixedPriceCents),
      validUntil: draft.validUntil,
      included: draft.included,
      excluded: draft.excluded,
    },
    scope: draft.scope,
    siteFacts: draft.siteFacts,
    allowances: draft.allowances.map((a) => ({ label: a.label, amount: formatMoney(a.cents) })),
    deposit: `${describeDeposit(draft.deposit)}: ${formatMoney(depositCents(draft.deposit, base))} on the base price`,
    hasVisit: draft.siteFacts.length > 0,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const fields = await readTextFields(request);
  if (fields.intent === "withdraw") {
    const parsed = withdrawSchema.safeParse(fields);
    if (!parsed.success)
      return data({ intent: "withdraw", errors: { reason: parsed.error.issues[0]!.message }, fields }, { status: 400 });
    const refused = await withdrawProposal(user, lead, parsed.data.proposalId, parsed.data.reason);
    if (refused) return data({ intent: "withdraw", errors: { reason: refused }, fields }, { status: 409 });
    return redirect(`/app/leads/${lead.id}`);
  }
  if (isSignedStage(lead.status))
    return data(
      { intent: "send", errors: { form: "This job is signed: send a change order instead." }, fields },
      { status: 409 },
    );
  const company = await getCompany(user.companyId);
  const today = new Intl.DateTimeFormat("en-CA", { timeZone: company.timeZone }).format(new Date());
  const parsed = parseComposeForm(fields, today);
  if (!parsed.ok) return data({ intent: "send", errors: parsed.errors, fields }, { status: 400 });
  await sendProposal({ user, lead, company, input: parsed.value, origin: appOrigin(request) });
  return redirect(`/app/leads/${lead.id}`);
}

export default function ProposalComposeRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { leadId, customerName, defaults, scope, siteFacts, allowances, deposit, designLabel, estimate, hasVisit } =
    loaderData;
  const errors: Record<string, string> = actionData?.intent === "send" ? actionData.errors : {};
  const values: Record<string, string> = { ...defaults, ...(actionData?.intent === "send" ? actionData.fields : {}) };
  const navigation = useNavigation();
  const count = Object.keys(errors).length;
  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-5">
      <div>
        <Link to={`/app/leads/${leadId}`} className="text-sm font-bold text-ember-700 hover:underline">
          ← {customerName}
        </Link>
        <h1 className="mt-1 text-2xl font-extrabold">Write the proposal</h1>
        <p className="text-sm text-char-600">
          From {designLabel}
          {estimate ? ` (the engine's range: ${estimate})` : ""}. Sending it e-mails {customerName} a link to read,
          choose add-ons, sign and pay the deposit.
        </p>
      </div>
      {count ? (
        <FormAlert>
          {errors.form ?? `${count === 1 ? "One field needs" : `${count} fields need`} a look: see the messages below.`}
        </FormAlert>
      ) : null}
      <section aria-labelledby="scope-title" className="card p-5 text-sm">
        <h2 id="scope-title" className="text-lg font-extrabold">
          Scope of work (from the plan)
        </h2>
        <ul className="mt-2 list-disc pl-5">
          {scope.map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
        <h3 className="mt-4 font-extrabold">Site visit</h3>
        {hasVisit ? (
          <ul className="mt-1 list-disc pl-5">
            {siteFacts.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        ) : (
          <p className="mt-1 text-char-600">
            No site visit recorded yet:{" "}
            <Link to={`/app/leads/${leadId}/visit`} className="font-bold text-ember-700 underline">
              record it
            </Link>{" "}
            so the measured setbacks and access go in.
          </p>
        )}
      </section>
      <Form method="post" className="flex flex-col gap-4 card p-5" noValidate>
        <input type="hidden" name="intent" value="send" />
        <TextField
          label="Fixed price"
          name="fixedPrice"
          inputMode="decimal"
          defaultValue={values.fixedPrice}
          error={errors.fixedPrice}
          hint="In dollars, for the scope above, before allowances and add-ons."
        />
        {allowances.length ? (
          <div className="text-sm">
            <p className="field-label">Site allowances (from your terms)</p>
            <ul className="mt-1">
              {allowances.map((a) => (
                <li key={a.label}>
                  {a.label}: {a.amount}
                </li>
              ))}
            </ul>
          </div>
        ) : null}
        <fieldset className="flex flex-col gap-2">
          <legend className="field-label">Optional add-ons the homeowner can tick</legend>
          {Array.from({ length: MAX_ADD_ONS }, (_, k) => k + 1).map((i) => (
            <div key={i} className="grid grid-cols-[minmax(0,2fr)_minmax(0,1fr)] gap-2">
              <TextField
                label={`Add-on ${i}`}
                name={`addOnLabel${i}`}
                defaultValue={values[`addOnLabel${i}`] ?? ""}
                error={errors[`addOnLabel${i}`]}
                placeholder={i === 1 ? "e.g. Firebrick lining" : ""}
              />
              <TextField
                label={`Add-on ${i} price`}
                name={`addOnPrice${i}`}
                inputMode="decimal"
                defaultValue={values[`addOnPrice${i}`] ?? ""}
                error={errors[`addOnPrice${i}`]}
              />
            </div>
          ))}
        </fieldset>
        <p className="text-sm text-char-700">
          Deposit: {deposit}. Balance on completion. (Owners set the deposit in the proposal terms.)
        </p>
        <TextField
          label="Valid until"
          name="validUntil"
          type="date"
          defaultValue={values.validUntil}
          error={errors.validUntil}
          className="max-w-xs"
        />
        <TextBlock
          label="Included (one line each)"
          name="included"
          value={values.included ?? ""}
          error={errors.included}
        />
        <TextBlock
          label="Not included (one line each)"
          name="excluded"
          value={values.excluded ?? ""}
          error={errors.excluded}
        />
        <button type="submit" className="btn-primary self-start" disabled={navigation.state === "submitting"}>
          Send the proposal
        </button>
      </Form>
    </div>
  );
}

function TextBlock({ label, name, value, error }: { label: string; name: string; value: string; error?: string }) {
  return (
    <div>
      <label htmlFor={`tb-${name}`} className="field-label">
        {label}
      </label>
      <textarea
        id={`tb-${name}`}
        name={name}
        rows={5}
        defaultValue={value}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `tb-${name}-error` : undefined}
        className="field-input"
      />
      {error ? (
        <p id={`tb-${name}-error`} className="field-error">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
