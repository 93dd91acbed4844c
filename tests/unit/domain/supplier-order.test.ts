import { describe, expect, test } from "vitest";
import {
  checkCombine,
  deliveredWeight,
  findCombinable,
  isoWeekOf,
  moveSupplierOrder,
  roundOrderLine,
  type OrderTerms,
  type PlanLine,
} from "~/domain/supplier-order";

/*
 * Rounding a material order to how yards sell, each example worked by hand in its comment.
 * Units: 1 short ton = 2,000 lb (NIST Handbook 44, Appendix C). Pack sizes and weights here are
 * invented examples, not any maker's figures. Densities: 1.4 t/yd³ for crushed stone and 1.35 t/yd³
 * for sand are the engine's defaults (app/domain/factors.ts), both from memory.
 */

const wallUnits = (quantity: number): PlanLine => ({ key: "wall-unit", item: "Taper unit", quantity, unit: "each" });
const tons = (key: PlanLine["key"], quantity: number): PlanLine => ({
  key,
  item: key === "aggregate" ? "Base aggregate" : "Bedding sand",
  quantity,
  unit: "ton",
});
const pallet = (per: number, lb: number | null): OrderTerms => ({
  orderUnit: "pallet",
  unitsPerOrderUnit: per,
  orderUnitWeightLb: lb,
});

function rounded(line: PlanLine, terms: OrderTerms, density: number | null = null) {
  const result = roundOrderLine(line, terms, density);
  if (!result.ok) throw new Error(result.problem.message);
  return result.line;
}

describe("counted items in whole packs", () => {
  test("62 wall units (spares included) on pallets of 72 at 3,200 lb: 62 ÷ 72 = 0.86 → 1 pallet, 72 units, 3,200 lb", () => {
    const line = rounded(wallUnits(62), pallet(72, 3200));
    expect(line).toMatchObject({
      orderQuantity: 1,
      orderUnit: "pallet",
      suppliedQuantity: 72,
      weightLb: 3200,
      planQuantity: 62,
    });
  });

  test("145 units on pallets of 72: 145 ÷ 72 = 2.01 → 3 pallets (216 units), 3 × 3,200 = 9,600 lb", () => {
    expect(rounded(wallUnits(145), pallet(72, 3200))).toMatchObject({
      orderQuantity: 3,
      suppliedQuantity: 216,
      weightLb: 9600,
    });
  });

  test("exactly 144 units on pallets of 72 is 2 pallets, not 3 (144 ÷ 72 = 2)", () => {
    expect(rounded(wallUnits(144), pallet(72, 3200)).orderQuantity).toBe(2);
  });

  test("230 pavers in cubes of 120: 230 ÷ 120 = 1.92 → 2 cubes (240 pavers); 2 × 2,650 lb = 5,300 lb", () => {
    const line = rounded(
      { key: "paver", item: "Paver", quantity: 230, unit: "each" },
      { orderUnit: "cube", unitsPerOrderUnit: 120, orderUnitWeightLb: 2650 },
    );
    expect(line).toMatchObject({ orderQuantity: 2, orderUnit: "cube", suppliedQuantity: 240, weightLb: 5300 });
  });

  test("7 cartridges by the cartridge at 0.9 lb: 7, 7 × 0.9 = 6.3 lb; by the case of 12: 7 ÷ 12 → 1 case of 12", () => {
    const cartridges: PlanLine = { key: "adhesive", item: "Adhesive", quantity: 7, unit: "cartridge" };
    expect(rounded(cartridges, { orderUnit: "cartridge", unitsPerOrderUnit: 1, orderUnitWeightLb: 0.9 })).toMatchObject(
      { orderQuantity: 7, suppliedQuantity: 7, weightLb: 6.3 },
    );
    expect(rounded(cartridges, { orderUnit: "case", unitsPerOrderUnit: 12, orderUnitWeightLb: 11 })).toMatchObject({
      orderQuantity: 1,
      suppliedQuantity: 12,
      weightLb: 11,
    });
  });

  test("a count sold each with no weight given keeps the count and an unknown weight", () => {
    expect(
      rounded(
        { key: "steel-ring", item: "Ring", quantity: 1, unit: "each" },
        { orderUnit: "each", unitsPerOrderUnit: 1, orderUnitWeightLb: null },
      ),
    ).toMatchObject({ orderQuantity: 1, weightLb: null });
  });
});

describe("bulk by weight or volume", () => {
  test("2.3 t of base sold in half tons: 2.3 ÷ 0.5 = 4.6 → 5 steps = 2.5 t, 2.5 × 2,000 = 5,000 lb", () => {
    expect(
      rounded(tons("aggregate", 2.3), { orderUnit: "ton", unitsPerOrderUnit: 0.5, orderUnitWeightLb: null }),
    ).toMatchObject({ orderQuantity: 2.5, suppliedQuantity: 2.5, weightLb: 5000 });
  });

  test("2.0 t in half tons stays 2.0 t; 0.3 t in whole tons is 1 t (the yard's smallest sale)", () => {
    expect(
      rounded(tons("aggregate", 2), { orderUnit: "ton", unitsPerOrderUnit: 0.5, orderUnitWeightLb: null })
        .orderQuantity,
    ).toBe(2);
    expect(
      rounded(tons("aggregate", 0.3), { orderUnit: "ton", unitsPerOrderUnit: 1, orderUnitWeightLb: null })
        .orderQuantity,
    ).toBe(1);
  });

  test("0.1 t × 3 of float noise (0.30000000000000004 t) in tenths stays 0.3 t, not 0.4", () => {
    expect(
      rounded(tons("aggregate", 0.1 * 3), { orderUnit: "ton", unitsPerOrderUnit: 0.1, orderUnitWeightLb: null })
        .orderQuantity,
    ).toBe(0.3);
  });

  test("2.3 t of crushed stone by the cubic yard at 1.4 t/yd³ (from memory): 2.3 ÷ 1.4 = 1.64 yd³ → 2 yd³ in half yards, which weigh 2 × 1.4 = 2.8 t = 5,600 lb", () => {
    const line = rounded(
      tons("aggregate", 2.3),
      { orderUnit: "cubic-yard", unitsPerOrderUnit: 0.5, orderUnitWeightLb: null },
      1.4,
    );
    expect(line).toMatchObject({ orderQuantity: 2, orderUnit: "cubic-yard", suppliedQuantity: 2.8, weightLb: 5600 });
    expect(line.working).toContain("1.64 yd³");
  });

  test("0.4 t of bedding sand in 50 lb bags: 0.4 × 2,000 = 800 lb ÷ 50 = 16 bags exactly; 0.41 t: 820 ÷ 50 = 16.4 → 17 bags, 850 lb = 0.425 t", () => {
    const bags: OrderTerms = { orderUnit: "bag", unitsPerOrderUnit: 1, orderUnitWeightLb: 50 };
    expect(rounded(tons("bedding-sand", 0.4), bags)).toMatchObject({ orderQuantity: 16, weightLb: 800 });
    expect(rounded(tons("bedding-sand", 0.41), bags)).toMatchObject({
      orderQuantity: 17,
      weightLb: 850,
      suppliedQuantity: 0.425,
    });
  });
});

describe("terms that cannot round a line say why", () => {
  const message = (line: PlanLine, terms: OrderTerms, density: number | null = null) => {
    const result = roundOrderLine(line, terms, density);
    return result.ok ? "" : result.problem.message;
  };
  test("tons on pallets, units by the ton, part units in a pallet, no step, no density, no bag weight", () => {
    expect(message(tons("aggregate", 2), pallet(40, 3000))).toMatch(/planned in tons .* choose ton, cubic yard or bag/);
    expect(message(wallUnits(60), { orderUnit: "ton", unitsPerOrderUnit: 1, orderUnitWeightLb: null })).toMatch(
      /is counted \(each\) but the catalog sells it by the ton/,
    );
    expect(message(wallUnits(60), pallet(72.5, 3200))).toMatch(/whole number/);
    expect(message(wallUnits(60), pallet(0, 3200))).toMatch(/more than 0/);
    expect(
      message(tons("aggregate", 2), { orderUnit: "cubic-yard", unitsPerOrderUnit: 1, orderUnitWeightLb: null }, null),
    ).toMatch(/no density/);
    expect(
      message(tons("bedding-sand", 2), { orderUnit: "bag", unitsPerOrderUnit: 1, orderUnitWeightLb: null }),
    ).toMatch(/weight of one bag/);
  });
});

test("delivered weight adds the known lines and names the unknown: 3,200 + 5,000 = 8,200 lb, ring unknown", () => {
  const lines = [
    rounded(wallUnits(62), pallet(72, 3200)),
    rounded(tons("aggregate", 2.3), { orderUnit: "ton", unitsPerOrderUnit: 0.5, orderUnitWeightLb: null }),
    rounded(
      { key: "steel-ring", item: "Ring", quantity: 1, unit: "each" },
      { orderUnit: "each", unitsPerOrderUnit: 1, orderUnitWeightLb: null },
    ),
  ];
  expect(deliveredWeight(lines)).toEqual({ weightLb: 8200, unknown: ["Ring"] });
});

describe("states move forward only, one step at a time", () => {
  test("drafted → sent → confirmed → delivered", () => {
    expect(moveSupplierOrder("drafted", "send")).toEqual({ ok: true, to: "sent" });
    expect(moveSupplierOrder("sent", "confirm")).toEqual({ ok: true, to: "confirmed" });
    expect(moveSupplierOrder("confirmed", "deliver")).toEqual({ ok: true, to: "delivered" });
  });
  test("a second send, a confirm before sending, a delivery before confirming and discarding a sent order are refused in words", () => {
    expect(moveSupplierOrder("sent", "send")).toEqual({
      ok: false,
      message: "This order is sent; only a draft can be sent.",
    });
    expect(moveSupplierOrder("drafted", "confirm")).toEqual({
      ok: false,
      message: "This order is a draft; only an order sent can be marked confirmed.",
    });
    expect(moveSupplierOrder("sent", "deliver")).toEqual({
      ok: false,
      message: "This order is sent; only an order confirmed by the supplier can be marked delivered.",
    });
    expect(moveSupplierOrder("sent", "discard").ok).toBe(false);
    expect(moveSupplierOrder("delivered", "confirm").ok).toBe(false);
  });
});

describe("combining", () => {
  test("ISO 8601 weeks (checked against Python's date.isocalendar())", () => {
    expect(isoWeekOf("2026-01-01")).toBe("2026-W01"); // a Thursday: week 1
    expect(isoWeekOf("2027-01-01")).toBe("2026-W53"); // a Friday: the last week of 2026
    expect(isoWeekOf("2024-12-30")).toBe("2025-W01"); // a Monday whose Thursday is in 2025
    expect(isoWeekOf("2021-01-03")).toBe("2020-W53"); // a Sunday
    expect(isoWeekOf("2026-12-07")).toBe("2026-W50"); // Monday
    expect(isoWeekOf("2026-12-13")).toBe("2026-W50"); // Sunday of the same week
    expect(isoWeekOf("2026-12-14")).toBe("2026-W51");
  });

  test("drafts to one supplier in one week group; other weeks, suppliers and sent orders stay apart", () => {
    const groups = findCombinable([
      { id: 3, supplierId: 1, state: "drafted", requestedOn: ["2026-12-11"] },
      { id: 1, supplierId: 1, state: "drafted", requestedOn: ["2026-12-07"] },
      { id: 2, supplierId: 1, state: "drafted", requestedOn: ["2026-12-14"] },
      { id: 4, supplierId: 2, state: "drafted", requestedOn: ["2026-12-08"] },
      { id: 5, supplierId: 1, state: "sent", requestedOn: ["2026-12-09"] },
    ]);
    expect(groups).toEqual([{ supplierId: 1, week: "2026-W50", orderIds: [1, 3] }]);
  });

  test("combining is refused for one order, a sent order, two suppliers or two weeks", () => {
    const a = { id: 1, supplierId: 1, state: "drafted" as const, requestedOn: ["2026-12-07"] };
    expect(checkCombine([a])).toMatch(/at least two/);
    expect(checkCombine([a, { ...a, id: 2, state: "sent" }])).toMatch(/Order 2 is sent; only drafts/);
    expect(checkCombine([a, { ...a, id: 2, state: "delivered", label: "SO-0002" }])).toBe(
      "SO-0002 is delivered; only drafts can be combined.",
    );
    expect(checkCombine([a, { ...a, id: 2, supplierId: 9 }])).toMatch(/same supplier/);
    expect(checkCombine([a, { ...a, id: 2, requestedOn: ["2026-12-14"] }])).toMatch(/2026-W50, 2026-W51/);
    expect(checkCombine([a, { ...a, id: 2, requestedOn: ["2026-12-13"] }])).toBeNull();
  });
});

describe("every line's working and every refusal, word for word", () => {
  const result = (line: PlanLine, terms: OrderTerms, density: number | null = null) =>
    roundOrderLine(line, terms, density);

  test("the working says how each line was rounded, with the figures worked above", () => {
    expect(rounded(wallUnits(62), pallet(72, 3200)).working).toBe("62 each ÷ 72 a pallet, rounded up to whole pallets");
    expect(rounded(wallUnits(62), { orderUnit: "piece", unitsPerOrderUnit: 1, orderUnitWeightLb: 28 })).toEqual({
      key: "wall-unit",
      item: "Taper unit",
      planQuantity: 62,
      planUnit: "each",
      orderQuantity: 62,
      orderUnit: "piece",
      suppliedQuantity: 62,
      // 62 × 28 lb = 1,736 lb.
      weightLb: 1736,
      working: "62 each, as planned",
    });
    expect(
      rounded(tons("aggregate", 2.3), { orderUnit: "ton", unitsPerOrderUnit: 0.5, orderUnitWeightLb: null }).working,
    ).toBe("2.3 t rounded up to a step of 0.5 t");
    expect(
      rounded(tons("aggregate", 2.3), { orderUnit: "cubic-yard", unitsPerOrderUnit: 0.5, orderUnitWeightLb: null }, 1.4)
        .working,
    ).toBe("2.3 t ÷ 1.4 t/yd³ = 1.64 yd³, rounded up to a step of 0.5 yd³");
    expect(
      rounded(tons("bedding-sand", 0.41), { orderUnit: "bag", unitsPerOrderUnit: 1, orderUnitWeightLb: 50 }).working,
    ).toBe("0.41 t × 2,000 lb ÷ 50 lb a bag, rounded up");
  });

  test("a bag, a pail and a cartridge are each ordered as themselves; a bag of wall units is not", () => {
    for (const unit of ["bag", "pail", "cartridge"] as const) {
      const line: PlanLine = { key: "fill", item: "Item", quantity: 3, unit };
      expect(rounded(line, { orderUnit: unit, unitsPerOrderUnit: 1, orderUnitWeightLb: null }).orderQuantity).toBe(3);
    }
    // Edge restraint is planned in pieces: a yard may call them pieces or sell them each, or in bundles.
    const edging: PlanLine = { key: "edge-restraint", item: "Edging", quantity: 7, unit: "piece" };
    expect(rounded(edging, { orderUnit: "each", unitsPerOrderUnit: 1, orderUnitWeightLb: null }).orderQuantity).toBe(7);
    expect(rounded(edging, { orderUnit: "piece", unitsPerOrderUnit: 1, orderUnitWeightLb: null }).orderQuantity).toBe(
      7,
    );
    // 7 ÷ 10 a bundle → 1 bundle of 10.
    expect(rounded(edging, { orderUnit: "bundle", unitsPerOrderUnit: 10, orderUnitWeightLb: 40 })).toMatchObject({
      orderQuantity: 1,
      suppliedQuantity: 10,
      weightLb: 40,
    });
    expect(result(wallUnits(3), { orderUnit: "bag", unitsPerOrderUnit: 1, orderUnitWeightLb: 50 })).toEqual({
      ok: false,
      problem: {
        key: "wall-unit",
        item: "Taper unit",
        message:
          "Taper unit is counted (each) but the catalog sells it by the bag: choose each, pallet, cube, bundle or case.",
      },
    });
  });

  test("each refusal names the item and what to change", () => {
    const message = (line: PlanLine, terms: OrderTerms, density: number | null = null) => {
      const r = result(line, terms, density);
      return r.ok ? "" : r.problem.message;
    };
    expect(message(wallUnits(60), pallet(Number.POSITIVE_INFINITY, 3200))).toBe(
      "Taper unit: units per order unit must be more than 0.",
    );
    const sandBags: PlanLine = { key: "bedding-sand", item: "Sand in bags", quantity: 60, unit: "bag" };
    expect(message(sandBags, pallet(40.5, 3200))).toBe("Sand in bags: a pallet holds a whole number of bags.");
    // Things sold each are counted as pieces in the message, never "eachs".
    expect(message({ ...sandBags, item: "Broad Cap 20", unit: "each" }, pallet(40.5, 3200))).toBe(
      "Broad Cap 20: a pallet holds a whole number of pieces.",
    );
    expect(message(wallUnits(60), { orderUnit: "cubic-yard", unitsPerOrderUnit: 1, orderUnitWeightLb: null })).toBe(
      "Taper unit is counted (each) but the catalog sells it by the cubic yard: choose each, pallet, cube, bundle or case.",
    );
    expect(
      message(tons("aggregate", 2), { orderUnit: "cubic-yard", unitsPerOrderUnit: 1, orderUnitWeightLb: null }, 0),
    ).toBe("Base aggregate: no density is known to turn tons into cubic yards; sell it by the ton.");
    expect(message(tons("bedding-sand", 2), { orderUnit: "bag", unitsPerOrderUnit: 1, orderUnitWeightLb: 0 })).toBe(
      "Bedding sand: give the weight of one bag to order tons in bags.",
    );
    expect(message(tons("aggregate", 2), pallet(40, 3000))).toBe(
      "Base aggregate is planned in tons but the catalog sells it by the pallet: choose ton, cubic yard or bag.",
    );
  });

  test("delivered weight of no lines is 0 lb with nothing unknown; 0.1 + 0.2 t of weights adds without float noise", () => {
    expect(deliveredWeight([])).toEqual({ weightLb: 0, unknown: [] });
    const sand = (quantity: number) =>
      rounded(tons("bedding-sand", quantity), { orderUnit: "ton", unitsPerOrderUnit: 0.05, orderUnitWeightLb: null });
    // 0.05 t = 100 lb and 0.1 t = 200 lb: 300 lb exactly.
    expect(deliveredWeight([sand(0.05), sand(0.1)]).weightLb).toBe(300);
  });
});

describe("every move from every state", () => {
  test("a draft can be discarded or combined; nothing else can, and the refusal says what the order is", () => {
    expect(moveSupplierOrder("drafted", "discard")).toEqual({ ok: true, to: "discarded" });
    expect(moveSupplierOrder("drafted", "combine")).toEqual({ ok: true, to: "combined" });
    expect(moveSupplierOrder("confirmed", "discard")).toEqual({
      ok: false,
      message: "This order is confirmed by the supplier; only a draft can be discarded.",
    });
    expect(moveSupplierOrder("combined", "combine")).toEqual({
      ok: false,
      message: "This order is combined into another order; only a draft can be combined.",
    });
    expect(moveSupplierOrder("discarded", "send")).toEqual({
      ok: false,
      message: "This order is discarded; only a draft can be sent.",
    });
    expect(moveSupplierOrder("delivered", "deliver")).toEqual({
      ok: false,
      message: "This order is delivered; only an order confirmed by the supplier can be marked delivered.",
    });
    // States never go backwards: from each state, exactly the moves listed forward are allowed.
    const allowed: Record<string, string[]> = {
      drafted: ["send", "discard", "combine"],
      sent: ["confirm"],
      confirmed: ["deliver"],
      delivered: [],
      combined: [],
      discarded: [],
    };
    const moves = ["send", "confirm", "deliver", "discard", "combine"] as const;
    for (const [state, list] of Object.entries(allowed)) {
      const ok = moves.filter((move) => moveSupplierOrder(state as "drafted", move).ok);
      expect(ok).toEqual(list);
    }
  });
});

describe("combining, the edges", () => {
  test("drafts with no delivery day, or with days in two weeks, are left out of every group; groups keep ids ascending", () => {
    const groups = findCombinable([
      { id: 9, supplierId: 1, state: "drafted", requestedOn: ["2026-12-08"] },
      { id: 4, supplierId: 1, state: "drafted", requestedOn: ["2026-12-09", "2026-12-10"] },
      { id: 6, supplierId: 1, state: "drafted", requestedOn: [] },
      { id: 7, supplierId: 1, state: "drafted", requestedOn: ["2026-12-11", "2026-12-14"] },
      { id: 8, supplierId: 2, state: "drafted", requestedOn: ["2026-12-15"] },
      { id: 5, supplierId: 2, state: "drafted", requestedOn: ["2026-12-16"] },
      { id: 3, supplierId: 3, state: "drafted", requestedOn: ["2026-12-16"] },
    ]);
    expect(groups).toEqual([
      { supplierId: 1, week: "2026-W50", orderIds: [4, 9] },
      { supplierId: 2, week: "2026-W51", orderIds: [5, 8] },
    ]);
    expect(findCombinable([{ id: 6, supplierId: 1, state: "drafted", requestedOn: [] }])).toEqual([]);
  });

  test("the weeks in a refusal are listed in order; a refusal names a combined or discarded order", () => {
    const a = { id: 1, supplierId: 1, state: "drafted" as const, requestedOn: ["2026-12-21"] };
    expect(checkCombine([a, { ...a, id: 2, requestedOn: ["2026-12-07"] }])).toBe(
      "Only deliveries in the same week can be combined; these fall in 2026-W50, 2026-W52.",
    );
    expect(checkCombine([])).toBe("Choose at least two draft orders to combine.");
    expect(checkCombine([a, { ...a, id: 2, supplierId: 2 }])).toBe("Only orders to the same supplier can be combined.");
    expect(checkCombine([a, { ...a, id: 12, state: "combined" }])).toBe(
      "Order 12 is combined into another order; only drafts can be combined.",
    );
    expect(checkCombine([{ ...a, state: "discarded", label: "SO-0001" }, a])).toBe(
      "SO-0001 is discarded; only drafts can be combined.",
    );
  });
});
