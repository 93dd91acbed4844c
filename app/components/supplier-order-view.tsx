import type { OrderUnit } from "~/db/enums";
import type { MaterialUnit } from "~/domain/quantities";
import { describeOrderQuantity, describePlanQuantity, formatPounds } from "~/lib/suppliers/order-units";

export type OrderLineView = {
  item: string;
  planQuantity: number;
  planUnit: MaterialUnit;
  orderQuantity: number;
  orderUnit: OrderUnit;
  suppliedQuantity: number;
  weightLb: number | null;
  working: string;
};

/** The lines of one delivery: what the plan needs (spares included), what is ordered, and its weight. */
export function OrderLinesTable({
  lines,
  weightLb,
  label,
}: {
  lines: OrderLineView[];
  weightLb: number;
  label: string;
}) {
  return (
    <div className="overflow-x-auto" tabIndex={0} role="region" aria-label={label}>
      <table className="w-full text-left text-sm">
        <thead className="text-xs text-char-500 uppercase">
          <tr>
            <th scope="col" className="py-2 pr-3 font-bold">
              Item
            </th>
            <th scope="col" className="py-2 pr-3 font-bold">
              Order
            </th>
            <th scope="col" className="hidden py-2 pr-3 font-bold sm:table-cell">
              Needed
            </th>
            <th scope="col" className="py-2 text-right font-bold">
              Weight
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ash-200">
          {lines.map((l) => (
            <tr key={l.item}>
              <td className="py-2 pr-3 font-bold">
                {l.item}
                <span className="block text-xs font-normal text-char-600 sm:hidden">
                  needs {describePlanQuantity(l.planQuantity, l.planUnit)}
                </span>
              </td>
              <td className="py-2 pr-3 whitespace-nowrap" title={l.working}>
                {describeOrderQuantity(l.orderQuantity, l.orderUnit)}
              </td>
              <td className="hidden py-2 pr-3 text-char-700 sm:table-cell">
                {describePlanQuantity(l.planQuantity, l.planUnit)}
                {l.suppliedQuantity > l.planQuantity + 1e-9
                  ? `; ${describePlanQuantity(l.suppliedQuantity, l.planUnit)} arrive`
                  : ""}
              </td>
              <td className="py-2 text-right whitespace-nowrap tabular-nums">
                {l.weightLb === null ? "—" : formatPounds(l.weightLb)}
              </td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr className="border-t-2 border-ash-300 font-extrabold">
            <td className="py-2 pr-3" colSpan={2}>
              Delivered weight
            </td>
            <td className="hidden sm:table-cell" />
            <td className="py-2 text-right whitespace-nowrap tabular-nums">{formatPounds(weightLb)}</td>
          </tr>
        </tfoot>
      </table>
    </div>
  );
}

export const STATE_BADGE: Record<string, string> = {
  drafted: "bg-ash-200 text-char-700",
  sent: "bg-ember-100 text-ember-700",
  confirmed: "bg-moss-100 text-moss-700",
  delivered: "bg-moss-700 text-white",
};
