import type { OrderUnit } from "~/db/enums";
import type { OrderUnit as DomainOrderUnit } from "~/domain/supplier-order";
import { formatNumber } from "~/domain/number-text";

// The schema's order units and the rounding's must be the same list.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : never) : never;
const SAME: Same<OrderUnit, DomainOrderUnit> = true;
void SAME;

/*
 * How a yard sells an item, in words (safe on the client). "Per" says what the catalog's
 * "units per order unit" means for each: pieces in a pack, or the smallest step of a bulk sale.
 */
export const ORDER_UNIT_LABEL: Record<OrderUnit, { label: string; plural: string; per: string | null }> = {
  each: { label: "each", plural: "each", per: null },
  piece: { label: "piece", plural: "pieces", per: null },
  pallet: { label: "pallet", plural: "pallets", per: "Pieces on a full pallet" },
  cube: { label: "cube", plural: "cubes", per: "Pieces in a cube" },
  bundle: { label: "bundle", plural: "bundles", per: "Pieces in a bundle" },
  case: { label: "case", plural: "cases", per: "Items in a case" },
  bag: { label: "bag", plural: "bags", per: null },
  pail: { label: "pail", plural: "pails", per: null },
  cartridge: { label: "cartridge", plural: "cartridges", per: null },
  ton: { label: "ton", plural: "tons", per: "Smallest step sold, tons (0.5 for half tons)" },
  "cubic-yard": { label: "cubic yard", plural: "cubic yards", per: "Smallest step sold, yd³ (0.5 for half yards)" },
};

/** "3 pallets", "2.5 tons", "1 cubic yard". */
export function describeOrderQuantity(quantity: number, unit: OrderUnit): string {
  const words = ORDER_UNIT_LABEL[unit];
  const n = Number.isInteger(quantity) ? String(quantity) : String(Math.round(quantity * 100) / 100);
  return `${n} ${quantity === 1 || unit === "each" ? words.label : words.plural}`;
}

const PLAN_UNIT_PLURAL: Record<string, string> = {
  each: "each",
  piece: "pieces",
  bag: "bags",
  pail: "pails",
  cartridge: "cartridges",
};

/** A quantity of the material order in its own unit: "68 each", "4 pails", "4.6 t". */
export function describePlanQuantity(quantity: number, unit: string): string {
  const n = Number.isInteger(quantity) ? String(quantity) : String(Math.round(quantity * 100) / 100);
  if (unit === "ton") return `${n} t`;
  return `${n} ${quantity === 1 ? unit : (PLAN_UNIT_PLURAL[unit] ?? unit)}`;
}

/** A calendar day (YYYY-MM-DD) as people read it: "Wed, Dec 9, 2026" (the same on server and browser). */
export function formatDeliveryDay(day: string): string {
  return new Intl.DateTimeFormat("en-US", {
    weekday: "short",
    month: "short",
    day: "numeric",
    year: "numeric",
    timeZone: "UTC",
  }).format(new Date(`${day}T12:00:00Z`));
}

/** Pounds as people write them: "9,600 lb". */
export function formatPounds(lb: number): string {
  return `${formatNumber(Math.round(lb))} lb`;
}
