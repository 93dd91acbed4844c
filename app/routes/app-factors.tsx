import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-factors";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { FormAlert, TextField } from "~/components/ui/field";
import { DEFAULT_FACTORS } from "~/domain/factors";
import { getCompany } from "~/lib/catalog/catalog.server";
import { factorSettingsSchema } from "~/lib/settings/factor-schema";
import {
  FACTOR_GROUPS,
  FACTOR_ROWS,
  readCompanyFactors,
  toFormValue,
  type FactorRow,
} from "~/lib/settings/factor-settings";
import { saveCompanyFactors } from "~/lib/settings/factor-settings.server";
import { fieldErrors } from "~/lib/format/form-fields";
import { requireUser } from "~/lib/auth/session.server";
import { formatLengthInput } from "~/domain/units";
import { readForm } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Estimating factors · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const factors = readCompanyFactors(await getCompany(user.companyId));
  return {
    values: Object.fromEntries(FACTOR_ROWS.map((row) => [row.key, toFormValue(row, factors[row.key])])) as Record<
      string,
      string
    >,
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const form = await readForm(request);
  const fields: Record<string, string> = {};
  for (const row of FACTOR_ROWS) {
    const value = form.get(row.key);
    if (typeof value === "string") fields[row.key] = value;
  }
  const resetAll = form.get("intent") === "reset-all";
  const reset = FACTOR_ROWS.find((row) => row.key === form.get("reset"));
  // A reset puts the default in that one field and saves the form as typed, like any other save.
  for (const row of resetAll ? FACTOR_ROWS : reset ? [reset] : [])
    fields[row.key] = toFormValue(row, DEFAULT_FACTORS[row.key]);
  const parsed = factorSettingsSchema.safeParse(fields);
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error), values: fields }, { status: 400 });
  await saveCompanyFactors(user.companyId, parsed.data);
  return redirect(`/app/settings/factors?saved=${resetAll ? "all" : (reset?.key ?? "1")}`);
}

function formatDefault(row: FactorRow): string {
  if (row.kind === "choice") return row.options.find((o) => o.value === row.default)?.label ?? String(row.default);
  if (row.kind === "money") return `$${toFormValue(row, row.default)}${row.unit.slice(1)}`;
  // "1 blanks" reads wrong: counts of one take the singular.
  if (row.unit === "in") return `${toFormValue(row, row.default)} in`;
  return `${row.default} ${row.default === 1 && row.whole ? row.unit.replace(/s$/, "") : row.unit}`;
}

export default function FactorsRoute({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const values: Record<string, string> = actionData?.values ?? loaderData.values;
  const [params] = useSearchParams();
  const navigation = useNavigation();
  const saved = params.get("saved");
  const savedRow = FACTOR_ROWS.find((row) => row.key === saved);
  const busy = navigation.state === "submitting";
  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-6">
      <div>
        <Link to="/app/settings" className="text-sm font-bold text-ember-700 hover:underline">
          ← Company settings
        </Link>
        <h1 className="mt-1 text-2xl font-extrabold">Estimating factors</h1>
        <p className="text-char-600">
          Every number the plan uses beyond your catalog: prices and profit, production rates, spares, base, adhesive,
          liner and patio. New designs in your configurator, the plan API and every revision you save use them at once;
          a request already sent keeps the plan it was priced with until you save a revision.
        </p>
      </div>
      {saved && !actionData ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {saved === "all"
            ? "Every factor is back to its default."
            : savedRow
              ? `${savedRow.label} is back to its default.`
              : "Factors saved."}
        </p>
      ) : null}
      <Form method="post" className="flex flex-col gap-6" noValidate>
        {/* Enter in a field saves the form: the first submit button is the one implicit submission presses. */}
        <button type="submit" className="sr-only" tabIndex={-1} aria-hidden="true">
          Save factors
        </button>
        {Object.keys(errors).length ? <FormAlert>Nothing was saved. Fix the fields marked below.</FormAlert> : null}
        {FACTOR_GROUPS.map((group) => (
          <section key={group.id} aria-labelledby={`group-${group.id}`} className="flex flex-col gap-5 card p-6">
            <div>
              <h2 id={`group-${group.id}`} className="text-lg font-extrabold">
                {group.title}
              </h2>
              <p className="text-sm text-char-600">{group.intro}</p>
            </div>
            {FACTOR_ROWS.filter((row) => row.group === group.id).map((row) => (
              <FactorField
                key={`${row.key}:${values[row.key]}`}
                row={row}
                value={values[row.key] ?? ""}
                error={errors[row.key]}
                disabled={busy}
              />
            ))}
          </section>
        ))}
        <div className="flex flex-wrap gap-3">
          <button type="submit" className="btn-primary" disabled={busy}>
            Save factors
          </button>
          <button type="submit" name="intent" value="reset-all" className="btn-quiet" disabled={busy}>
            Reset every factor to its default
          </button>
        </div>
      </Form>
    </div>
  );
}

/** One factor: its input in its unit, the default beside it and a reset that saves the default. */
function FactorField({
  row,
  value,
  error,
  disabled,
}: {
  row: FactorRow;
  value: string;
  error?: string;
  disabled: boolean;
}) {
  const isDefault = value === toFormValue(row, row.default);
  const defaultText = `Default: ${formatDefault(row)}${isDefault ? " (in use)" : ""}.`;
  const reset = (
    <button
      type="submit"
      name="reset"
      value={row.key}
      className="btn-quiet self-end text-sm"
      disabled={disabled || isDefault}
      aria-label={`Reset ${row.label} to its default`}
    >
      Reset
    </button>
  );
  if (row.kind === "choice") {
    return (
      <div className="flex flex-wrap items-start gap-3" data-factor={row.key}>
        <fieldset className="min-w-0 flex-1" aria-describedby={`${row.key}-hint`}>
          <legend className="field-label">{row.label}</legend>
          <div className="flex flex-col gap-1.5">
            {row.options.map((option) => (
              <label key={option.value} className="flex items-start gap-2 text-sm">
                <input
                  type="radio"
                  name={row.key}
                  value={option.value}
                  defaultChecked={value === option.value}
                  className="mt-0.5"
                />
                <span>{option.label}</span>
              </label>
            ))}
          </div>
          <p id={`${row.key}-hint`} className="field-hint">
            {defaultText} {row.help}
          </p>
          {error ? <p className="field-error">{error}</p> : null}
        </fieldset>
        {reset}
      </div>
    );
  }
  // Lengths are typed as read off a tape ("1 1/4") or in metric; a decimal keypad has no space or slash.
  const isLength = row.kind === "number" && (row.unit === "in" || row.unit === "ft");
  const allowed =
    row.kind === "money"
      ? `$${row.min}–$${row.max}`
      : row.unit === "in"
        ? `${formatLengthInput(row.min)}–${formatLengthInput(row.max)} in, typed like 1 1/4, 1-1/4, 5/4 or 32 mm`
        : `${row.min}–${row.max} ${row.unit}${row.unit === "ft" ? ", or in metres like 3 m" : ""}`;
  return (
    <div className="flex flex-wrap items-start gap-3" data-factor={row.key}>
      <TextField
        label={row.label}
        name={row.key}
        suffix={row.unit}
        inputMode={isLength ? "text" : "decimal"}
        defaultValue={value}
        error={error}
        hint={`${defaultText} ${row.help} Allowed: ${allowed}${row.whole ? ", whole numbers" : ""}.`}
        className="min-w-0 flex-1"
      />
      <div className="pt-7">{reset}</div>
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
