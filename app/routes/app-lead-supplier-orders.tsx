import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-lead-supplier-orders";
import { OrderLinesTable, STATE_BADGE } from "~/components/supplier-order-view";
import { FormAlert, TextField } from "~/components/ui/field";
import { getCompany } from "~/lib/catalog/catalog.server";
import { isSignedStage, STATUS_LABEL } from "~/lib/leads/lead-status";
import { formatDeliveryDay, formatPounds } from "~/lib/suppliers/order-units";
import { requireUser } from "~/lib/auth/session.server";
import { findLeadFor, parseLeadId } from "~/lib/auth/staff.server";
import { WorkspaceProblem } from "~/components/workspace-problem";
import {
  draftSupplierOrders,
  listJobSupplierOrders,
  ORDER_STATE_LABEL,
  orderNumber,
  planSupplierOrders,
} from "~/lib/suppliers/supplier-orders.server";
import { nextDay, zonedDay } from "~/lib/format/zoned-time";
import { readForm } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Supplier orders · ${data.lead.customerName} · Emberwright` : "Supplier orders · Emberwright" },
];

// Owners order the material (the catalog, its suppliers and what the company buys are theirs).
const ROLES = ["owner"] as const;

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const company = await getCompany(user.companyId);
  const today = zonedDay(new Date(), company.timeZone);
  const [planned, orders] = await Promise.all([
    isSignedStage(lead.status) ? planSupplierOrders(lead) : null,
    listJobSupplierOrders(lead),
  ]);
  return {
    lead: {
      id: lead.id,
      customerName: lead.customerName,
      address: `${lead.street}, ${lead.town}`,
      stageLabel: STATUS_LABEL[lead.status],
      isSigned: isSignedStage(lead.status),
    },
    today,
    // A week out is a usual lead time to ask for (common practice, no source); the owner changes it.
    suggestedDay: Array.from({ length: 7 }).reduce<string>((day) => nextDay(day), today),
    planned,
    orders: orders.map((o) => ({
      id: o.id,
      number: orderNumber(o.id),
      status: o.status,
      stateLabel: ORDER_STATE_LABEL[o.status],
      supplierName: o.supplier.name,
      deliveries: o.drops.length,
      drop: o.drops.find((d) => d.leadId === lead.id) ?? null,
      weight: formatPounds(o.weightLb),
    })),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ROLES });
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead) throw new Response("Not found", { status: 404 });
  const form = await readForm(request);
  const requestedOn = String(form.get("requestedOn") ?? "").trim();
  const result = await draftSupplierOrders(user, lead, requestedOn);
  if (!result.ok) return data({ errors: result.errors, requestedOn }, { status: result.status });
  return redirect(`/app/leads/${lead.id}/supplier-orders?drafted=${result.orderIds.length}`);
}

export default function LeadSupplierOrdersRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { lead, planned, orders, today, suggestedDay } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const [params] = useSearchParams();
  const isBusy = useNavigation().state === "submitting";
  const drafted = !actionData && params.get("drafted");
  const hasLive = orders.length > 0;
  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-6">
      <div>
        <Link to={`/app/leads/${lead.id}`} className="text-sm font-bold text-ember-700 hover:underline">
          ← {lead.customerName}
        </Link>
        <h1 className="mt-2 text-2xl font-extrabold">Supplier orders</h1>
        <p className="text-char-600">
          The material order of the job as signed, rounded to how each yard sells it, to {lead.address}. Stage:{" "}
          {lead.stageLabel}.
        </p>
      </div>
      {drafted ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {drafted === "1" ? "One order drafted." : `${drafted} orders drafted.`} Open each to send it.
        </p>
      ) : null}
      {errors.form ? <FormAlert>{errors.form}</FormAlert> : null}

      {orders.length ? (
        <section aria-labelledby="orders-title" className="card p-5">
          <h2 id="orders-title" className="text-lg font-extrabold">
            This job's orders
          </h2>
          <ul className="mt-3 divide-y divide-ash-200">
            {orders.map((o) => (
              <li key={o.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                <span>
                  <Link
                    to={`/app/supplier-orders/${o.id}`}
                    className="font-bold text-ember-700 underline underline-offset-2"
                  >
                    {o.number} to {o.supplierName}
                  </Link>{" "}
                  <span className="text-sm text-char-600">
                    {o.drop ? `for ${formatDeliveryDay(o.drop.requestedOn)}` : ""}
                    {o.deliveries > 1
                      ? `, combined with ${o.deliveries - 1} other ${o.deliveries === 2 ? "job" : "jobs"}`
                      : ""}
                    , {o.weight}
                  </span>
                </span>
                <span className={`rounded-full px-2 py-0.5 text-xs font-bold ${STATE_BADGE[o.status] ?? ""}`}>
                  {o.stateLabel}
                </span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {!lead.isSigned ? (
        <p className="card p-5 text-char-700">
          Supplier orders are for signed jobs: this one is at “{lead.stageLabel}”.
        </p>
      ) : !planned ? (
        <p className="card p-5 text-char-700">This job has no signed proposal to order from.</p>
      ) : (
        <section aria-labelledby="plan-title" className="flex flex-col gap-4 card p-5">
          <h2 id="plan-title" className="text-lg font-extrabold">
            {hasLive ? "The material order, rounded" : "Draft the orders"}
          </h2>
          {planned.groups.map((g) => (
            <div key={g.supplier.id} className="flex flex-col gap-1">
              <h3 className="font-extrabold">{g.supplier.name}</h3>
              <OrderLinesTable lines={g.lines} weightLb={g.weightLb} label={`Lines for ${g.supplier.name}`} />
              {g.unknownWeights.length ? (
                <p className="text-xs text-char-600">
                  Weight not known for {g.unknownWeights.join(", ")}: add it in the catalog.
                </p>
              ) : null}
            </div>
          ))}
          {planned.problems.length ? (
            <div className="rounded-lg border border-ember-300 bg-ember-50 p-3 text-sm">
              <p className="font-bold">Not on any order yet</p>
              <ul className="list-disc pl-5">
                {planned.problems.map((p) => (
                  <li key={p.key}>{p.message}</li>
                ))}
              </ul>
              <Link to="/app/catalog" className="font-bold text-ember-700 underline">
                Set suppliers and order units in the catalog
              </Link>
            </div>
          ) : null}
          {planned.groups.length && !hasLive ? (
            <Form method="post" className="flex flex-wrap items-end gap-3" noValidate>
              <TextField
                label="Requested delivery date"
                name="requestedOn"
                type="date"
                min={today}
                defaultValue={actionData?.requestedOn ?? suggestedDay}
                error={errors.requestedOn}
              />
              <button type="submit" className="btn-primary" disabled={isBusy}>
                Draft {planned.groups.length === 1 ? "the order" : `${planned.groups.length} orders`}
              </button>
            </Form>
          ) : null}
          <p className="text-xs text-char-600">
            Quantities include the plan's spares; whole pallets and cubes, bags and half tons round up. Deliveries go to
            the site address with the access notes from the site visit.
          </p>
        </section>
      )}
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
