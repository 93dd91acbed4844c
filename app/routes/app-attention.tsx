import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/app-attention";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { FormAlert } from "~/components/ui/field";
import {
  listFailedWork,
  retryFailedBalanceRefund,
  retryFailedDepositRefund,
  retryFailedEmail,
  retryFailedRefund,
} from "~/lib/jobs/attention.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { formatSlot } from "~/lib/consults/consult-slots";
import { formatMoney } from "~/lib/format/money";
import { requireUser } from "~/lib/auth/session.server";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Needs attention · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const company = await getCompany(user.companyId);
  const { mail, refunds, deposits, balances } = await listFailedWork(user.companyId);
  return {
    mail,
    refunds: [
      ...refunds.map((r) => ({
        key: `consult-${r.id}`,
        intent: "retry-refund" as const,
        id: r.id,
        leadId: r.leadId,
        customerName: r.customerName,
        what: `Consult of ${formatSlot(r.startsAt, company.timeZone)}`,
        amount: formatMoney(r.amountCents),
        attempts: r.attempts,
        lastError: r.lastError,
      })),
      ...deposits.map((r) => ({
        key: `deposit-${r.id}`,
        intent: "retry-deposit-refund" as const,
        id: r.id,
        leadId: r.leadId,
        customerName: r.customerName,
        what: `Deposit on ${r.number}`,
        amount: formatMoney(r.amountCents),
        attempts: r.attempts,
        lastError: r.lastError,
      })),
      ...balances.map((r) => ({
        key: `balance-${r.id}`,
        intent: "retry-balance-refund" as const,
        id: r.id,
        leadId: r.leadId,
        customerName: r.customerName,
        what: "Second payment of the balance",
        amount: formatMoney(r.amountCents),
        attempts: r.attempts,
        lastError: r.lastError,
      })),
    ],
  };
}

const retrySchema = z.object({
  intent: z.enum(["retry-email", "retry-refund", "retry-deposit-refund", "retry-balance-refund"], {
    error: "Choose what to try again.",
  }),
  id: z.coerce.number().int().positive({ error: "Choose what to try again." }),
});

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const parsed = retrySchema.safeParse(await readTextFields(request));
  if (!parsed.success) return data({ error: parsed.error.issues[0]!.message, done: null }, { status: 400 });
  const { intent, id } = parsed.data;
  const retry = {
    "retry-email": retryFailedEmail,
    "retry-refund": retryFailedRefund,
    "retry-deposit-refund": retryFailedDepositRefund,
    "retry-balance-refund": retryFailedBalanceRefund,
  }[intent];
  const isQueued = await retry(id, user.companyId);
  // Another company's row, or one already back in the queue, is simply not found here.
  if (!isQueued)
    return data({ error: "That item was not found, or it is already being tried again.", done: null }, { status: 404 });
  return data({
    error: null,
    done: intent === "retry-email" ? "The e-mail is queued again." : "The refund is queued again.",
  });
}

export default function AttentionRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { mail, refunds } = loaderData;
  const navigation = useNavigation();
  const isBusy = navigation.state === "submitting";
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-extrabold">Needs attention</h1>
        <p className="text-char-600">
          E-mails and refunds that failed after several tries. Check the reason, then try again or deal with it by hand.
        </p>
      </div>
      {actionData?.error ? <FormAlert>{actionData.error}</FormAlert> : null}
      {actionData?.done ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {actionData.done}
        </p>
      ) : null}
      {mail.length === 0 && refunds.length === 0 ? (
        <p className="card p-6 text-char-600">Nothing needs attention: every e-mail and refund went through.</p>
      ) : null}
      {refunds.length ? (
        <section className="overflow-hidden card" aria-labelledby="failed-refunds">
          <h2 id="failed-refunds" className="border-b border-ash-200 bg-ash-100 px-4 py-2 font-extrabold">
            Refunds not made
          </h2>
          <ul className="divide-y divide-ash-200">
            {refunds.map((r) => (
              <li key={r.key} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
                <div className="min-w-0">
                  <p className="font-extrabold">
                    {r.amount} to{" "}
                    <Link to={`/app/leads/${r.leadId}`} className="text-ember-700 hover:underline">
                      {r.customerName}
                    </Link>
                  </p>
                  <p className="text-sm text-char-600">
                    {r.what} · {r.attempts} tries
                  </p>
                  {r.lastError ? <p className="text-sm break-words text-char-600">Last answer: {r.lastError}</p> : null}
                </div>
                <Form method="post">
                  <input type="hidden" name="intent" value={r.intent} />
                  <input type="hidden" name="id" value={r.id} />
                  <button
                    type="submit"
                    className="btn-quiet"
                    disabled={isBusy}
                    aria-label={`Try the refund to ${r.customerName} again`}
                  >
                    Try again
                  </button>
                </Form>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {mail.length ? (
        <section className="overflow-hidden card" aria-labelledby="failed-mail">
          <h2 id="failed-mail" className="border-b border-ash-200 bg-ash-100 px-4 py-2 font-extrabold">
            E-mails not sent
          </h2>
          <ul className="divide-y divide-ash-200">
            {mail.map((m) => (
              <li key={m.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
                <div className="min-w-0">
                  <p className="font-extrabold break-words">{m.subject}</p>
                  <p className="text-sm break-words text-char-600">
                    To {m.to} · {m.attempts} tries
                  </p>
                  {m.lastError ? <p className="text-sm break-words text-char-600">Last answer: {m.lastError}</p> : null}
                </div>
                <Form method="post">
                  <input type="hidden" name="intent" value="retry-email" />
                  <input type="hidden" name="id" value={m.id} />
                  <button
                    type="submit"
                    className="btn-quiet"
                    disabled={isBusy}
                    aria-label={`Send the e-mail to ${m.to} again`}
                  >
                    Try again
                  </button>
                </Form>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
