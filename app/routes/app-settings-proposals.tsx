import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/app-settings-proposals";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { FormAlert, SelectField, TextField } from "~/components/ui/field";
import { fieldErrors, formLength, formNumber, LENGTH_EXAMPLES } from "~/lib/format/form-fields";
import { getProposalTerms, saveProposalTerms } from "~/lib/proposals/proposal-terms.server";
import { formMoneyCents } from "~/lib/proposals/proposal-schema";
import { requireUser } from "~/lib/auth/session.server";
import { formatLengthInput } from "~/domain/units";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Proposal terms · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const terms = await getProposalTerms(user.companyId);
  return {
    values: {
      depositKind: terms.depositKind,
      depositPercent: String(terms.depositBasisPoints / 100),
      depositFixed: (terms.depositFixedCents / 100).toFixed(2),
      validDays: String(terms.validDays),
      includedText: terms.includedText,
      excludedText: terms.excludedText,
      streetAddress: terms.streetAddress,
      licenceNumber: terms.licenceNumber,
      narrowAccessIn: formatLengthInput(terms.narrowAccessIn),
      narrowAccessAllowance: (terms.narrowAccessAllowanceCents / 100).toFixed(2),
      steepSlopeAllowance: (terms.steepSlopeAllowanceCents / 100).toFixed(2),
    } as Record<string, string>,
  };
}

const text = (label: string, max: number, min = 0) =>
  z
    .string()
    .trim()
    .min(min, `${label} must be ${min} to ${max} characters.`)
    .max(max, `${label} must be at most ${max} characters.`);

const termsSchema = z.object({
  depositKind: z.enum(["percent", "fixed"], { error: "Deposit must be a percentage or a fixed amount." }),
  depositPercent: formNumber("Deposit percentage", 0, 100, "%"),
  depositFixed: formMoneyCents("Fixed deposit", 0, 100_000),
  validDays: formNumber("Days a proposal stays open", 1, 120).pipe(
    z.number().int("Days a proposal stays open must be a whole number."),
  ),
  includedText: text("Included", 3000, 3),
  excludedText: text("Not included", 3000, 3),
  streetAddress: text("Address", 200),
  licenceNumber: text("Licence number", 60),
  narrowAccessIn: formLength("Narrow access below", 12, 120),
  narrowAccessAllowance: formMoneyCents("Narrow-access allowance", 0, 20_000),
  steepSlopeAllowance: formMoneyCents("Steep-ground allowance", 0, 20_000),
});

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const values = await readTextFields(request);
  const parsed = termsSchema.safeParse(values);
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error), values }, { status: 400 });
  const v = parsed.data;
  await saveProposalTerms(user.companyId, {
    depositKind: v.depositKind,
    // Percent to basis points: 30 % is 3000, kept whole.
    depositBasisPoints: Math.round(v.depositPercent * 100),
    depositFixedCents: v.depositFixed,
    validDays: v.validDays,
    includedText: v.includedText,
    excludedText: v.excludedText,
    streetAddress: v.streetAddress,
    licenceNumber: v.licenceNumber,
    narrowAccessIn: v.narrowAccessIn,
    narrowAccessAllowanceCents: v.narrowAccessAllowance,
    steepSlopeAllowanceCents: v.steepSlopeAllowance,
  });
  return redirect("/app/settings/proposals?saved=1");
}

export default function ProposalTermsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const values = { ...loaderData.values, ...(actionData?.values ?? {}) };
  const [params] = useSearchParams();
  const navigation = useNavigation();
  const area = (name: string, label: string) => (
    <div>
      <label htmlFor={`terms-${name}`} className="field-label">
        {label}
      </label>
      <textarea
        id={`terms-${name}`}
        name={name}
        rows={5}
        defaultValue={values[name]}
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={errors[name] ? `terms-${name}-error` : undefined}
        className="field-input"
      />
      {errors[name] ? (
        <p id={`terms-${name}-error`} className="field-error">
          {errors[name]}
        </p>
      ) : null}
    </div>
  );
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-5">
      <div>
        <Link to="/app/settings" className="text-sm font-bold text-ember-700 hover:underline">
          ← Company settings
        </Link>
        <h1 className="mt-1 text-2xl font-extrabold">Proposal terms</h1>
        <p className="text-sm text-char-600">
          What every new proposal starts from: the deposit, how long it stays open, what is included, your letterhead
          and the site allowances. Proposals already sent keep the terms they were sent with.
        </p>
      </div>
      {params.get("saved") ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          Saved.
        </p>
      ) : null}
      {Object.keys(errors).length ? <FormAlert>Some fields need a look: see the messages below.</FormAlert> : null}
      <Form method="post" className="flex flex-col gap-4 card p-5" noValidate>
        <fieldset className="grid gap-3 sm:grid-cols-3">
          <legend className="mb-1 font-extrabold">Deposit on signing</legend>
          <SelectField
            label="Deposit is"
            name="depositKind"
            defaultValue={values.depositKind}
            error={errors.depositKind}
          >
            <option value="percent">a percentage of the total</option>
            <option value="fixed">a fixed amount</option>
          </SelectField>
          <TextField
            label="Percentage"
            name="depositPercent"
            inputMode="decimal"
            suffix="%"
            defaultValue={values.depositPercent}
            error={errors.depositPercent}
          />
          <TextField
            label="Fixed amount"
            name="depositFixed"
            inputMode="decimal"
            defaultValue={values.depositFixed}
            error={errors.depositFixed}
          />
        </fieldset>
        <TextField
          label="Days a proposal stays open"
          name="validDays"
          inputMode="numeric"
          defaultValue={values.validDays}
          error={errors.validDays}
          className="max-w-xs"
        />
        {area("includedText", "Included (one line each)")}
        {area("excludedText", "Not included (one line each)")}
        <fieldset className="grid gap-3 sm:grid-cols-2">
          <legend className="mb-1 font-extrabold">Letterhead</legend>
          <TextField
            label="Business address"
            name="streetAddress"
            defaultValue={values.streetAddress}
            error={errors.streetAddress}
          />
          <TextField
            label="Contractor's licence number"
            name="licenceNumber"
            defaultValue={values.licenceNumber}
            error={errors.licenceNumber}
          />
        </fieldset>
        <fieldset className="grid gap-3 sm:grid-cols-3">
          <legend className="mb-1 font-extrabold">Site allowances</legend>
          <TextField
            label="Narrow access below"
            name="narrowAccessIn"
            suffix="in"
            hint={`Like ${LENGTH_EXAMPLES}.`}
            defaultValue={values.narrowAccessIn}
            error={errors.narrowAccessIn}
          />
          <TextField
            label="Narrow-access allowance"
            name="narrowAccessAllowance"
            inputMode="decimal"
            defaultValue={values.narrowAccessAllowance}
            error={errors.narrowAccessAllowance}
          />
          <TextField
            label="Steep-ground allowance"
            name="steepSlopeAllowance"
            inputMode="decimal"
            defaultValue={values.steepSlopeAllowance}
            error={errors.steepSlopeAllowance}
          />
        </fieldset>
        <button type="submit" className="btn-primary self-start" disabled={navigation.state === "submitting"}>
          Save the terms
        </button>
      </Form>
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
