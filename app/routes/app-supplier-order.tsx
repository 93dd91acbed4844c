import { data, Form, Link, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/app-supplier-order";
import { OrderLinesTable, STATE_BADGE } from "~/components/supplier-order-view";
import { FormAlert, TextField } from "~/components/ui/field";
import { getCompany } from "~/lib/catalog/catalog.server";
import { fieldErrors } from "~/lib/format/form-fields";
import { formatDeliveryDay, formatPounds } from "~/lib/suppliers/order-units";
import { formatPhone } from "~/lib/format/phone";
import { requireUser } from "~/lib/auth/session.server";
import { orderMoveSchema } from "~/lib/suppliers/supplier-order-schema";
import { moveOrder, ORDER_STATE_LABEL, orderNumber, requireOrder } from "~/lib/suppliers/supplier-orders.server";
import { formatZonedDateTime } from "~/lib/format/zoned-time";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `${data.order.number} · Supplier orders · Emberwright` : "Supplier order · Emberwright" },
];

const ROLES = ["owner"] as const;

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ROLES });
  const order = await requireOrder(user.companyId, params.orderId);
  if (order.status === "combined" && order.combinedIntoId)
    throw redirect(`/app/supplier-orders/${order.combinedIntoId}`);
  const tz = (await getCompany(user.companyId)).timeZone;
  const when = (iso: string | null) => (iso ? formatZonedDateTime(iso, tz) : null);
  return {
    order: {
      id: order.id,
      number: orderNumber(order.id),
      status: order.status,
      stateLabel: ORDER_STATE_LABEL[order.status],
      supplier: {
        name: order.supplier.name,
        email: order.supplier.email,
        phone: order.supplier.phone ? formatPhone(order.supplier.phone) : "",
      },
      weight: formatPounds(order.weightLb),
      sentAt: when(order.sentAt),
      confirmedAt: when(order.confirmedAt),
      confirmationNote: order.confirmationNote,
      deliveredAt: when(order.deliveredAt),
      drops: order.drops.map((d) => ({
        id: d.id,
        leadId: d.leadId,
        customerName: d.customerName,
        requestedOn: d.requestedOn,
        siteAddress: d.siteAddress,
        accessNotes: d.accessNotes,
        lines: d.lines,
        weightLb: d.weightLb,
      })),
    },
  };
}

const SAVED: Record<string, string> = {
  send: "Sent: the e-mail with the PDF and CSV is on its way to the supplier.",
  confirm: "Marked confirmed.",
  deliver: "Marked delivered.",
  combined: "Combined: one order for every delivery below.",
};

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: ROLES });
  const order = await requireOrder(user.companyId, params.orderId);
  const fields = await readTextFields(request);
  const parsed = orderMoveSchema.safeParse(fields);
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) }, { status: 400 });
  const result = await moveOrder(user, order, parsed.data.intent, parsed.data.note);
  if (!result.ok) return data({ errors: result.errors }, { status: result.status });
  if (parsed.data.intent === "discard") return redirect("/app/supplier-orders?saved=discarded");
  return redirect(`/app/supplier-orders/${order.id}?saved=${parsed.data.intent}`);
}

export default function SupplierOrderRoute({ loaderData, actionData }: Route.ComponentProps) {
  const { order } = loaderData;
  const [params] = useSearchParams();
  const isBusy = useNavigation().state === "submitting";
  const errors: Record<string, string> = actionData?.errors ?? {};
  const saved = !actionData ? SAVED[params.get("saved") ?? ""] : undefined;
  const history = [
    order.sentAt ? `Sent ${order.sentAt}` : null,
    order.confirmedAt
      ? `Confirmed ${order.confirmedAt}${order.confirmationNote ? ` (${order.confirmationNote})` : ""}`
      : null,
    order.deliveredAt ? `Delivered ${order.deliveredAt}` : null,
  ].filter(Boolean);
  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-6">
      <div>
        <Link to="/app/supplier-orders" className="text-sm font-bold text-ember-700 hover:underline">
          ← Supplier orders
        </Link>
        <div className="mt-2 flex flex-wrap items-center gap-3">
          <h1 className="text-2xl font-extrabold">
            {order.number} to {order.supplier.name}
          </h1>
          <span
            className={`rounded-full px-2 py-0.5 text-xs font-bold ${STATE_BADGE[order.status] ?? ""}`}
            data-testid="order-state"
          >
            {order.stateLabel}
          </span>
        </div>
        <p className="break-words text-char-600">
          {order.supplier.email}
          {order.supplier.phone ? ` · ${order.supplier.phone}` : ""} ·{" "}
          {order.drops.length === 1 ? "one delivery" : `${order.drops.length} deliveries`}, {order.weight}
        </p>
        {history.length ? <p className="text-sm text-char-600">{history.join(" · ")}</p> : null}
      </div>
      {saved ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          {saved}
        </p>
      ) : null}
      {Object.keys(errors).length ? <FormAlert>{Object.values(errors).join(" ")}</FormAlert> : null}

      <section aria-labelledby="next-title" className="flex flex-col gap-3 card border-l-4 border-l-ember-500 p-5">
        <h2 id="next-title" className="text-lg font-extrabold">
          {order.status === "drafted"
            ? "Send it to the supplier"
            : order.status === "sent"
              ? "Waiting for the supplier to confirm"
              : order.status === "confirmed"
                ? "Waiting for the delivery"
                : "Delivered"}
        </h2>
        {order.status === "drafted" ? (
          <div className="flex flex-wrap gap-3">
            <Form method="post">
              <input type="hidden" name="intent" value="send" />
              <button type="submit" className="btn-primary" disabled={isBusy}>
                Send to {order.supplier.name}
              </button>
            </Form>
            <Form method="post">
              <input type="hidden" name="intent" value="discard" />
              <button type="submit" className="btn-quiet" disabled={isBusy}>
                Discard this draft
              </button>
            </Form>
          </div>
        ) : null}
        {order.status === "sent" ? (
          <Form method="post" className="flex flex-wrap items-end gap-3" noValidate>
            <input type="hidden" name="intent" value="confirm" />
            <TextField
              label="Their reference or who confirmed"
              name="note"
              maxLength={120}
              hint="Optional."
              error={errors.note}
            />
            <button type="submit" className="btn-primary" disabled={isBusy}>
              Mark confirmed
            </button>
          </Form>
        ) : null}
        {order.status === "confirmed" ? (
          <Form method="post">
            <input type="hidden" name="intent" value="deliver" />
            <button type="submit" className="btn-primary" disabled={isBusy}>
              Mark delivered
            </button>
          </Form>
        ) : null}
        <p className="text-sm">
          <a href={`/app/supplier-orders/${order.id}/order.pdf`} className="font-bold text-ember-700 underline">
            The order as a PDF
          </a>{" "}
          ·{" "}
          <a href={`/app/supplier-orders/${order.id}/order.csv`} className="font-bold text-ember-700 underline">
            as a CSV
          </a>
        </p>
      </section>

      {order.drops.map((d) => (
        <section key={d.id} aria-labelledby={`drop-${d.id}`} className="flex flex-col gap-2 card p-5">
          <h2 id={`drop-${d.id}`} className="text-lg font-extrabold">
            Deliver {formatDeliveryDay(d.requestedOn)} to {d.siteAddress}
          </h2>
          <p className="text-sm">
            <Link to={`/app/leads/${d.leadId}`} className="font-bold text-ember-700 underline">
              {d.customerName}
            </Link>
          </p>
          {d.accessNotes ? <p className="text-sm text-char-700">Access: {d.accessNotes}</p> : null}
          <OrderLinesTable lines={d.lines} weightLb={d.weightLb} label={`Lines for ${d.customerName}`} />
        </section>
      ))}
    </div>
  );
}
