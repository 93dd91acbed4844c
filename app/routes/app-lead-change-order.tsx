import { z } from "zod";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/app-lead-change-order";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { FormAlert, TextField } from "~/components/ui/field";
import { CREDIT_TOO_LARGE, draftChangeOrder, sendChangeOrder } from "~/lib/proposals/change-orders.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { appOrigin } from "~/lib/platform/email.server";
import { formatMoney } from "~/lib/format/money";
import { requireUser } from "~/lib/auth/session.server";
import { OFFICE_ROLES, findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import { readTextFields } from "~/lib/platform/forms.server";
import { DOLLARS_TYPED, validUntilProblem } from "~/lib/proposals/proposal-schema";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: loaderData ? `Change order: ${loaderData.customerName} · Emberwright` : "Change order · Emberwright" },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const company = await getCompany(user.companyId);
  const draft = await draftChangeOrder(lead, company);
  return {
    leadId: lead.id,
    customerName: lead.customerName,
    draft: draft
      ? {
          contract: formatMoney(draft.totals.contractCents),
          balance: formatMoney(draft.totals.balanceCents),
          added: draft.added,
          removed: draft.removed,
          suggestedDelta: (draft.suggestedDeltaCents / 100).toFixed(2),
          validUntil: draft.validUntil,
          revisionLabel:
            draft.version.revisionId === null ? "the homeowner's original design" : "the latest staff revision",
        }
      : null,
  };
}

// A change may add or credit up to $100,000; typed in dollars, kept in cents.
const changeSchema = z.object({
  delta: z
    .string()
    .trim()
    .refine((s) => DOLLARS_TYPED.test(s.replace(/^-?\$?/, "")), {
      error: "Price difference must be an amount in dollars, like 450 or -120.50 for a credit.",
    })
    .transform((s) => {
      const negative = s.startsWith("-");
      const [whole, fraction = ""] = s.replace(/[-$,]/g, "").split(".");
      const cents = Number(whole) * 100 + Number(fraction.padEnd(2, "0"));
      return negative ? -cents : cents;
    })
    .pipe(
      z
        .number()
        .min(-10_000_000, "Price difference must be between −$100,000 and $100,000.")
        .max(10_000_000, "Price difference must be between −$100,000 and $100,000."),
    ),
  validUntil: z.string({ error: "Valid until must be a date like 2026-12-31." }),
});

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const fields = await readTextFields(request);
  const parsed = changeSchema.safeParse(fields);
  const company = await getCompany(user.companyId);
  const today = new Intl.DateTimeFormat("en-CA", { timeZone: company.timeZone }).format(new Date());
  const errors: Record<string, string> = {};
  if (!parsed.success) for (const issue of parsed.error.issues) errors[String(issue.path[0])] ??= issue.message;
  else {
    const problem = validUntilProblem(parsed.data.validUntil, today);
    if (problem) errors.validUntil = problem;
  }
  if (!parsed.success || Object.keys(errors).length) return data({ errors, fields }, { status: 400 });
  const sent = await sendChangeOrder({
    user,
    lead,
    company,
    deltaCents: parsed.data.delta,
    validUntil: parsed.data.validUntil,
    origin: appOrigin(request),
  });
  if (typeof sent === "string")
    return sent.startsWith(CREDIT_TOO_LARGE)
      ? data({ errors: { delta: sent }, fields }, { status: 400 })
      : data({ errors: { form: sent }, fields }, { status: 409 });
  return redirect(`/app/leads/${lead.id}`);
}

export default function ChangeOrderRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { leadId, customerName, draft } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const navigation = useNavigation();
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-5">
      <div>
        <Link to={`/app/leads/${leadId}`} className="text-sm font-bold text-ember-700 hover:underline">
          ← {customerName}
        </Link>
        <h1 className="mt-1 text-2xl font-extrabold">Change order</h1>
      </div>
      {!draft ? (
        <p className="card p-5">
          This job has no signed proposal yet: send a proposal first. Change orders change a signed job.
        </p>
      ) : (
        <>
          <section aria-labelledby="diff-title" className="card p-5 text-sm">
            <h2 id="diff-title" className="text-lg font-extrabold">
              What changes, from {draft.revisionLabel}
            </h2>
            {draft.added.length || draft.removed.length ? (
              <>
                {draft.added.length ? (
                  <>
                    <h3 className="mt-2 font-extrabold">Added or changed</h3>
                    <ul className="list-disc pl-5">
                      {draft.added.map((l) => (
                        <li key={l}>{l}</li>
                      ))}
                    </ul>
                  </>
                ) : null}
                {draft.removed.length ? (
                  <>
                    <h3 className="mt-2 font-extrabold">No longer part of the job</h3>
                    <ul className="list-disc pl-5">
                      {draft.removed.map((l) => (
                        <li key={l}>{l}</li>
                      ))}
                    </ul>
                  </>
                ) : null}
              </>
            ) : (
              <p className="mt-1 text-char-600">
                The scope is the same as signed.{" "}
                <Link to={`/app/leads/${leadId}/design`} className="font-bold text-ember-700 underline">
                  Revise the design
                </Link>{" "}
                first, or change only the price.
              </p>
            )}
            <p className="mt-3">
              The job as signed: {draft.contract} (balance {draft.balance}).
            </p>
          </section>
          {Object.keys(errors).length ? (
            <FormAlert>{errors.form ?? "Nothing was sent. Fix the fields marked below."}</FormAlert>
          ) : null}
          <Form method="post" className="flex flex-col gap-4 card p-5" noValidate>
            <TextField
              label="Price difference"
              name="delta"
              inputMode="decimal"
              defaultValue={actionData?.fields.delta ?? draft.suggestedDelta}
              error={errors.delta}
              hint="Dollars added to the job; a minus sign for a credit. Suggested from the engine's estimate of both designs."
            />
            <TextField
              label="Valid until"
              name="validUntil"
              type="date"
              defaultValue={actionData?.fields.validUntil ?? draft.validUntil}
              error={errors.validUntil}
              className="max-w-xs"
            />
            <button type="submit" className="btn-primary self-start" disabled={navigation.state === "submitting"}>
              Send the change order
            </button>
          </Form>
        </>
      )}
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
