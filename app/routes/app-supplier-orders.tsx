import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-supplier-orders";
import { STATE_BADGE } from "~/components/supplier-order-view";
import { FormAlert } from "~/components/ui/field";
import { findCombinable } from "~/domain/supplier-order";
import { fieldErrors } from "~/lib/format/form-fields";
import { formatDeliveryDay, formatPounds } from "~/lib/suppliers/order-units";
import { requireUser } from "~/lib/auth/session.server";
import { combineSchema } from "~/lib/suppliers/supplier-order-schema";
import {
  combineOrders,
  listSupplierOrders,
  ORDER_STATE_LABEL,
  orderNumber,
} from "~/lib/suppliers/supplier-orders.server";
import { readForm } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Supplier orders · Emberwright" }];

const ROLES = ["owner"] as const;

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ROLES });
  const orders = await listSupplierOrders(user.companyId);
  const combinable = findCombinable(
    orders.map((o) => ({
      id: o.id,
      supplierId: o.supplierId,
      state: o.status,
      requestedOn: o.drops.map((d) => d.requestedOn),
    })),
  );
  return {
    orders: orders.map((o) => ({
      id: o.id,
      number: orderNumber(o.id),
      status: o.status,
      stateLabel: ORDER_STATE_LABEL[o.status],
      supplierName: o.supplier.name,
      jobs: o.drops.map((d) => ({ leadId: d.leadId, customerName: d.customerName, requestedOn: d.requestedOn })),
      weight: formatPounds(o.weightLb),
    })),
    combinable: combinable.map((g) => ({
      ...g,
      supplierName: orders.find((o) => o.supplierId === g.supplierId)?.supplier.name ?? "",
      numbers: g.orderIds.map(orderNumber),
    })),
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ROLES });
  const form = await readForm(request);
  const parsed = combineSchema.safeParse({
    orderIds: form.getAll("orderId").filter((v): v is string => typeof v === "string"),
  });
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) }, { status: 400 });
  const result = await combineOrders(user, user.companyId, parsed.data.orderIds);
  if (!result.ok) return data({ errors: result.errors }, { status: result.status });
  return redirect(`/app/supplier-orders/${result.orderId}?saved=combined`);
}

export default function SupplierOrdersRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { orders, combinable } = loaderData;
  const isBusy = useNavigation().state === "submitting";
  const [params] = useSearchParams();
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-extrabold">Supplier orders</h1>
          <p className="text-char-600">Stone and supplies ordered for signed jobs. Draft them from each job's page.</p>
        </div>
        <Link to="/app/suppliers" className="btn-quiet">
          Suppliers
        </Link>
      </div>
      {params.get("saved") === "discarded" && !actionData ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          Draft discarded.
        </p>
      ) : null}
      {Object.keys(errors).length ? <FormAlert>{Object.values(errors).join(" ")}</FormAlert> : null}

      {combinable.length ? (
        <section aria-labelledby="combine-title" className="flex flex-col gap-3 card p-5">
          <h2 id="combine-title" className="text-lg font-extrabold">
            Combine drafts
          </h2>
          <p className="text-sm text-char-600">
            Drafts to the same supplier for deliveries in the same week can go as one order: one e-mail and one
            confirmation, a drop at each site.
          </p>
          {combinable.map((g) => (
            <Form
              key={`${g.supplierId}-${g.week}`}
              method="post"
              className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-ash-200 p-3"
            >
              {g.orderIds.map((id) => (
                <input key={id} type="hidden" name="orderId" value={id} />
              ))}
              <span>
                <span className="font-bold">{g.supplierName}</span>, week {g.week.slice(-2)}: {g.numbers.join(", ")}
              </span>
              <button type="submit" className="btn-primary" disabled={isBusy}>
                Combine {g.numbers.join(" and ")}
              </button>
            </Form>
          ))}
        </section>
      ) : null}

      <section aria-labelledby="list-title" className="overflow-hidden card">
        <h2
          id="list-title"
          className="border-b border-ash-200 bg-ash-100 px-4 py-2 text-sm font-extrabold tracking-wide text-char-700 uppercase"
        >
          Orders
        </h2>
        {orders.length === 0 ? <p className="px-4 py-3 text-char-600">No orders yet.</p> : null}
        <ul className="divide-y divide-ash-200">
          {orders.map((o) => (
            <li key={o.id} className="flex flex-col gap-1 px-4 py-3 sm:flex-row sm:items-center sm:justify-between">
              <div className="min-w-0">
                <Link
                  to={`/app/supplier-orders/${o.id}`}
                  className="font-bold text-ember-700 underline underline-offset-2"
                >
                  {o.number} to {o.supplierName}
                </Link>
                <p className="text-sm text-char-600">
                  {o.jobs.map((j) => `${j.customerName} (${formatDeliveryDay(j.requestedOn)})`).join("; ")} · {o.weight}
                </p>
              </div>
              <span
                className={`self-start rounded-full px-2 py-0.5 text-xs font-bold sm:self-center ${STATE_BADGE[o.status] ?? ""}`}
              >
                {o.stateLabel}
              </span>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
