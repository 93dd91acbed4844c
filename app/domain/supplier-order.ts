/**
 * A supplier order from a signed job's material order: each line of the plan (quantities already
 * include the spares) rounded up to how the yard sells the item, with the weight that arrives on
 * the truck. Pure: the caller passes each line's catalog terms and the densities to use.
 *
 * Units: short ton = 2,000 lb exactly (NIST Handbook 44, Appendix C); 1 yd³ = 27 ft³ (NIST SP 811).
 */
import type { MaterialKey, MaterialUnit } from "~/domain/quantities";
import { addCalendarDays, daysBetween, weekdayOf } from "~/domain/build-schedule";

export const LB_PER_SHORT_TON = 2000;

export type OrderUnit =
  "each" | "piece" | "pallet" | "cube" | "bundle" | "case" | "bag" | "pail" | "cartridge" | "ton" | "cubic-yard";

/** Order units that are whole packs of `unitsPerOrderUnit` pieces, bags, pails or cartridges. */
export const PACK_UNITS: readonly OrderUnit[] = ["pallet", "cube", "bundle", "case"];
/** Order units sold in bulk, rounded up to a step of `unitsPerOrderUnit` (0.5 = half tons). */
export const BULK_UNITS: readonly OrderUnit[] = ["ton", "cubic-yard"];

/** How the catalog says a yard sells an item. */
export type OrderTerms = {
  orderUnit: OrderUnit;
  /** Pieces in one pack; for ton and cubic yard, the smallest step sold; otherwise 1. */
  unitsPerOrderUnit: number;
  /** Weight of one order unit as delivered (a full pallet, a bag, a piece), lb; null when unknown. */
  orderUnitWeightLb: number | null;
};

export type PlanLine = { key: MaterialKey; item: string; quantity: number; unit: MaterialUnit };

export type RoundedLine = {
  key: MaterialKey;
  item: string;
  /** What the plan asks for (spares included), in the plan's unit. */
  planQuantity: number;
  planUnit: MaterialUnit;
  /** What to order, in the yard's unit. */
  orderQuantity: number;
  orderUnit: OrderUnit;
  /** What arrives, in the plan's unit (a whole pallet holds more than the plan needs). */
  suppliedQuantity: number;
  /** Delivered weight of the line, lb; null when the catalog gives no weight. */
  weightLb: number | null;
  /** The rounding in words, e.g. "62 each ÷ 72 a pallet, rounded up". */
  working: string;
};

export type RoundingProblem = { key: MaterialKey; item: string; message: string };

export type RoundingResult = { ok: true; line: RoundedLine } | { ok: false; problem: RoundingProblem };

// A hair below a whole step still rounds up; float noise above a whole step does not (0.1 × 3).
const EPSILON = 1e-9;
const ceilTo = (value: number, step: number) => Math.ceil(value / step - EPSILON) * step;
/** Rounds away float noise from a product of steps (0.5 × 3 stays 1.5). */
const tidy = (value: number) => Math.round(value * 1e6) / 1e6;

const COUNT_UNITS: readonly MaterialUnit[] = ["each", "piece", "bag", "pail", "cartridge"];
/** A counted unit named in the plural: "bags", "cartridges"; things sold each are "pieces". */
const countedAs = (unit: MaterialUnit) => (unit === "each" || unit === "piece" ? "pieces" : `${unit}s`);
// The plan's count units and the order units that mean one of the same thing.
const SAME_COUNT: Record<string, readonly OrderUnit[]> = {
  each: ["each", "piece"],
  piece: ["each", "piece"],
  bag: ["bag"],
  pail: ["pail"],
  cartridge: ["cartridge"],
};

function weigh(orderQuantity: number, terms: OrderTerms): number | null {
  return terms.orderUnitWeightLb === null ? null : tidy(orderQuantity * terms.orderUnitWeightLb);
}

/**
 * Rounds one line of the material order to the yard's unit.
 * - Counted items (each, piece, bag, pail, cartridge): by the same unit as planned, or in whole
 *   packs (pallet, cube, bundle, case) of `unitsPerOrderUnit`, rounded up.
 * - Tons: in tons rounded up to the step; in cubic yards from the tons ÷ the material's density
 *   (tons per yd³), rounded up to the step; in bags of `orderUnitWeightLb`, rounded up.
 * Anything else (tons in pallets, bags in tons) is a problem for the owner to settle in the catalog.
 */
export function roundOrderLine(line: PlanLine, terms: OrderTerms, tonsPerYd3: number | null): RoundingResult {
  const problem = (message: string): RoundingResult => ({
    ok: false,
    problem: { key: line.key, item: line.item, message },
  });
  const { orderUnit, unitsPerOrderUnit: per } = terms;
  if (!(per > 0) || !Number.isFinite(per)) return problem(`${line.item}: units per order unit must be more than 0.`);
  const base = { key: line.key, item: line.item, planQuantity: line.quantity, planUnit: line.unit, orderUnit };

  if (COUNT_UNITS.includes(line.unit)) {
    if (SAME_COUNT[line.unit]?.includes(orderUnit)) {
      const q = Math.ceil(line.quantity - EPSILON);
      return {
        ok: true,
        line: {
          ...base,
          orderQuantity: q,
          suppliedQuantity: q,
          weightLb: weigh(q, terms),
          working: `${line.quantity} ${line.unit}, as planned`,
        },
      };
    }
    if (PACK_UNITS.includes(orderUnit)) {
      if (!Number.isInteger(per))
        return problem(`${line.item}: a ${orderUnit} holds a whole number of ${countedAs(line.unit)}.`);
      const packs = Math.ceil(line.quantity / per - EPSILON);
      return {
        ok: true,
        line: {
          ...base,
          orderQuantity: packs,
          suppliedQuantity: packs * per,
          weightLb: weigh(packs, terms),
          working: `${line.quantity} ${line.unit} ÷ ${per} a ${orderUnit}, rounded up to whole ${orderUnit}s`,
        },
      };
    }
    return problem(
      `${line.item} is counted (${line.unit}) but the catalog sells it by the ${orderUnit.replace("-", " ")}: choose ${line.unit}, pallet, cube, bundle or case.`,
    );
  }

  // Bulk, planned in short tons.
  if (orderUnit === "ton") {
    const tons = tidy(ceilTo(line.quantity, per));
    return {
      ok: true,
      line: {
        ...base,
        orderQuantity: tons,
        suppliedQuantity: tons,
        weightLb: tidy(tons * LB_PER_SHORT_TON),
        working: `${line.quantity} t rounded up to a step of ${per} t`,
      },
    };
  }
  if (orderUnit === "cubic-yard") {
    if (tonsPerYd3 === null || !(tonsPerYd3 > 0))
      return problem(`${line.item}: no density is known to turn tons into cubic yards; sell it by the ton.`);
    const yd3 = tidy(ceilTo(line.quantity / tonsPerYd3, per));
    const tons = yd3 * tonsPerYd3;
    return {
      ok: true,
      line: {
        ...base,
        orderQuantity: yd3,
        suppliedQuantity: tidy(tons),
        weightLb: tidy(tons * LB_PER_SHORT_TON),
        working: `${line.quantity} t ÷ ${tonsPerYd3} t/yd³ = ${(line.quantity / tonsPerYd3).toFixed(2)} yd³, rounded up to a step of ${per} yd³`,
      },
    };
  }
  if (orderUnit === "bag") {
    const bagLb = terms.orderUnitWeightLb;
    if (bagLb === null || !(bagLb > 0))
      return problem(`${line.item}: give the weight of one bag to order tons in bags.`);
    const bags = Math.ceil((line.quantity * LB_PER_SHORT_TON) / bagLb - EPSILON);
    return {
      ok: true,
      line: {
        ...base,
        orderQuantity: bags,
        suppliedQuantity: tidy((bags * bagLb) / LB_PER_SHORT_TON),
        weightLb: tidy(bags * bagLb),
        working: `${line.quantity} t × 2,000 lb ÷ ${bagLb} lb a bag, rounded up`,
      },
    };
  }
  return problem(
    `${line.item} is planned in tons but the catalog sells it by the ${orderUnit.replace("-", " ")}: choose ton, cubic yard or bag.`,
  );
}

/** The delivered weight of some lines, lb, and the items whose weight is unknown. */
export function deliveredWeight(lines: readonly RoundedLine[]): { weightLb: number; unknown: string[] } {
  let weightLb = 0;
  const unknown: string[] = [];
  for (const line of lines) {
    if (line.weightLb === null) unknown.push(line.item);
    else weightLb += line.weightLb;
  }
  return { weightLb: tidy(weightLb), unknown };
}

// ---- States ----

export type SupplierOrderState = "drafted" | "sent" | "confirmed" | "delivered" | "combined" | "discarded";
export type SupplierOrderMove = "send" | "confirm" | "deliver" | "discard" | "combine";

/** Each move and the one state it starts from; states never go backwards. */
const MOVES: Record<SupplierOrderMove, { from: SupplierOrderState; to: SupplierOrderState }> = {
  send: { from: "drafted", to: "sent" },
  confirm: { from: "sent", to: "confirmed" },
  deliver: { from: "confirmed", to: "delivered" },
  discard: { from: "drafted", to: "discarded" },
  combine: { from: "drafted", to: "combined" },
};

const STATE_WORDS: Record<SupplierOrderState, string> = {
  drafted: "a draft",
  sent: "sent",
  confirmed: "confirmed by the supplier",
  delivered: "delivered",
  combined: "combined into another order",
  discarded: "discarded",
};

const MOVE_WORDS: Record<SupplierOrderMove, string> = {
  send: "sent",
  confirm: "marked confirmed",
  deliver: "marked delivered",
  discard: "discarded",
  combine: "combined",
};

/** The state a move leads to, or why it cannot be made from `state`. */
export function moveSupplierOrder(
  state: SupplierOrderState,
  move: SupplierOrderMove,
): { ok: true; to: SupplierOrderState } | { ok: false; message: string } {
  const rule = MOVES[move];
  if (rule.from === state) return { ok: true, to: rule.to };
  return {
    ok: false,
    message: `This order is ${STATE_WORDS[state]}; only ${STATE_WORDS[rule.from] === "a draft" ? "a draft" : `an order ${STATE_WORDS[rule.from]}`} can be ${MOVE_WORDS[move]}.`,
  };
}

// ---- Combining ----

/**
 * The ISO 8601 week of a calendar day "YYYY-MM-DD", as "YYYY-Www": weeks start on Monday and week 1
 * holds the year's first Thursday (ISO 8601-1:2019, 5.2.4.2).
 */
export function isoWeekOf(day: string): string {
  const weekday = weekdayOf(day) || 7; // Monday 1 … Sunday 7
  // The Thursday of the same week decides the year.
  const thursday = addCalendarDays(day, 4 - weekday);
  const year = thursday.slice(0, 4);
  const week = Math.floor(daysBetween(`${year}-01-01`, thursday) / 7) + 1;
  return `${year}-W${String(week).padStart(2, "0")}`;
}

/** An order as combining sees it; `label` names it in messages ("SO-0012"), else "Order <id>". */
export type CombinableOrder = {
  id: number;
  supplierId: number;
  state: SupplierOrderState;
  requestedOn: string[];
  label?: string;
};

/**
 * Drafts that can go as one order: the same supplier, every delivery in the same ISO week. Groups of
 * two or more, keyed "supplierId/week", each listing order ids ascending.
 */
export function findCombinable(
  orders: readonly CombinableOrder[],
): { supplierId: number; week: string; orderIds: number[] }[] {
  const groups = new Map<string, { supplierId: number; week: string; orderIds: number[] }>();
  for (const order of orders) {
    if (order.state !== "drafted" || order.requestedOn.length === 0) continue;
    const weeks = new Set(order.requestedOn.map(isoWeekOf));
    if (weeks.size !== 1) continue;
    const week = [...weeks][0]!;
    const key = `${order.supplierId}/${week}`;
    const group = groups.get(key) ?? { supplierId: order.supplierId, week, orderIds: [] };
    group.orderIds.push(order.id);
    groups.set(key, group);
  }
  return [...groups.values()]
    .filter((g) => g.orderIds.length > 1)
    .map((g) => ({ ...g, orderIds: [...g.orderIds].sort((a, b) => a - b) }));
}

/** Why these orders cannot be combined, or null when they can (same supplier, all drafts, one week). */
export function checkCombine(orders: readonly CombinableOrder[]): string | null {
  if (orders.length < 2) return "Choose at least two draft orders to combine.";
  const notDraft = orders.find((o) => o.state !== "drafted");
  if (notDraft)
    return `${notDraft.label ?? `Order ${notDraft.id}`} is ${STATE_WORDS[notDraft.state]}; only drafts can be combined.`;
  if (new Set(orders.map((o) => o.supplierId)).size > 1) return "Only orders to the same supplier can be combined.";
  const weeks = new Set(orders.flatMap((o) => o.requestedOn.map(isoWeekOf)));
  if (weeks.size > 1)
    return `Only deliveries in the same week can be combined; these fall in ${[...weeks].sort().join(", ")}.`;
  return null;
}
