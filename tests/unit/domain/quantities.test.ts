import fc from "fast-check";
import { expect, test } from "vitest";
import { DEFAULT_FACTORS, resolveFactors } from "~/domain/factors";
import { planFirebrick, planSteelRing } from "~/domain/liner";
import { computePlan } from "~/domain/plan";
import { countSpares, listMaterials, roundUpTenth } from "~/domain/quantities";
import { SUPPLY_PRICES, TYPICAL_PIT } from "./fixtures";

const quantity = (plan: ReturnType<typeof computePlan>, key: string) =>
  plan.materials.find((m) => m.key === key)?.quantity ?? 0;

test("a 10.1 fl oz cartridge holds 18.23 in³ and lays about 165 in of 3/8 in bead (NIST SP 811: 1 US fl oz = 231/128 in³)", () => {
  const cartridgeIn3 = (10.1 * 231) / 128;
  expect(cartridgeIn3).toBeCloseTo(18.23, 2);
  const beadIn = cartridgeIn3 / (Math.PI * (3 / 16) ** 2);
  expect(Math.abs(beadIn - DEFAULT_FACTORS.adhesiveBeadInPerCartridge)).toBeLessThan(1);
});

test("three courses with caps glue two layers: 2 × 14 units × 10 in × 2 beads = 560 in, 4 cartridges (derived here)", () => {
  const plan = computePlan(TYPICAL_PIT);
  expect(plan.adhesive.gluedLayers).toBe(2);
  expect(plan.adhesive.beadIn).toBe(560);
  expect(plan.adhesive.cartridges).toBe(4);
  expect(quantity(plan, "adhesive")).toBe(4);
});

test("a single course without caps needs no glue (the first course sits on the base)", () => {
  const plan = computePlan({ ...TYPICAL_PIT, courses: 1, cap: null });
  expect(plan.adhesive.cartridges).toBe(0);
  expect(plan.materials.some((m) => m.key === "adhesive")).toBe(false);
});

test("wall units carry 5 % spares, at least one: 42 laid + 3 (common practice, no source)", () => {
  expect(quantity(computePlan(TYPICAL_PIT), "wall-unit")).toBe(45);
  expect(countSpares(10, 5, 1)).toBe(1);
  expect(countSpares(100, 5, 1)).toBe(5);
});

test("caps carry one spare blank: 12 caps, 13 blanks (common practice, no source)", () => {
  expect(quantity(computePlan(TYPICAL_PIT), "cap")).toBe(13);
});

test("the base is a 6 in compacted disc reaching 6 in past the outside corners; 1 yd³ = 46,656 in³ (NIST SP 811)", () => {
  const plan = computePlan(TYPICAL_PIT);
  const radiusIn = plan.ring.outsideCornerRadiusIn + 6;
  const compactedYd3 = (Math.PI * radiusIn ** 2 * 6) / 46_656;
  expect(plan.base.radiusIn).toBeCloseTo(radiusIn, 12);
  expect(plan.base.compactedYd3).toBeCloseTo(compactedYd3, 12);
  expect(plan.base.looseYd3).toBeCloseTo(compactedYd3 * 1.25, 12);
  expect(plan.base.tons).toBeCloseTo(compactedYd3 * 1.25 * 1.1 * 1.4, 12);
  expect(quantity(plan, "aggregate")).toBe(roundUpTenth(plan.base.tons));
});

test("bulk tons round up to the next tenth without float noise", () => {
  expect(roundUpTenth(0.30000000000000004)).toBe(0.3);
  expect(roundUpTenth(0.31)).toBe(0.4);
  expect(roundUpTenth(2)).toBe(2);
});

test("company factors override the defaults: 8 in of base and 2 cap spares", () => {
  const plan = computePlan(TYPICAL_PIT, { factors: { baseDepthIn: 8, capSpares: 2 } });
  expect(plan.base.compactedYd3).toBeCloseTo((Math.PI * plan.base.radiusIn ** 2 * 8) / 46_656, 12);
  expect(quantity(plan, "cap")).toBe(14);
});

test("every material quantity stays the same or grows with a bigger ring and with more courses (property)", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 8, max: 40 }),
      fc.integer({ min: 1, max: 11 }),
      fc.constantFrom("steel-ring", "firebrick", "none"),
      (unitCount, courses, linerKind) => {
        const liner =
          linerKind === "steel-ring"
            ? { kind: "steel-ring" as const, outsideDiameterIn: 24, heightIn: 10 }
            : linerKind === "firebrick"
              ? { kind: "firebrick" as const, lengthIn: 9, widthIn: 4.5, heightIn: 2.5 }
              : { kind: "none" as const };
        const base = { ...TYPICAL_PIT, liner };
        const small = computePlan({ ...base, ring: { unitCount }, courses });
        const bigger = computePlan({ ...base, ring: { unitCount: unitCount + 1 }, courses });
        const taller = computePlan({ ...base, ring: { unitCount }, courses: courses + 1 });
        // Left out: a larger ring may match its unit count with more, narrower caps or not; and a
        // larger bowl takes more firebrick a row, which can leave less sand behind it and narrower
        // V-joints (less mortar) between the bricks.
        for (const line of small.materials.filter((m) => !["cap", "fill", "refractory-mortar"].includes(m.key))) {
          expect(quantity(bigger, line.key), `${line.key} with more units`).toBeGreaterThanOrEqual(line.quantity);
          expect(quantity(taller, line.key), `${line.key} with more courses`).toBeGreaterThanOrEqual(line.quantity);
        }
      },
    ),
  );
});

test("an exact-bowl ring orders its closure units as whole units", () => {
  const plan = computePlan({ ...TYPICAL_PIT, ring: { bowlDiameterIn: 34, fit: "exact" } });
  expect(plan.ring.totalUnits).toBe(14 * 3);
  expect(plan.materials[0].note).toMatch(/6 of them cut down as closure units/);
});

test("an unpriced refractory mortar and sand are named and left out, as the other sundries are; the job is still priced", () => {
  const plan = computePlan(
    {
      ...TYPICAL_PIT,
      ring: { bowlDiameterIn: 40, fit: "exact" },
      courses: 4,
      liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5, priceCents: 310 },
    },
    { supplyPrices: SUPPLY_PRICES },
  );
  expect(plan.price).not.toBeNull();
  expect(plan.unpricedItems).toEqual(["Refractory mortar, 1 gal pail", "Sand"]);
});

test("glue notes say which layers: the top 2 courses without caps (2 × 14 × 10 × 2 = 560 in), or the caps alone (280 in, 2 cartridges of 140.25 in) (common practice, no source)", () => {
  const twoCourses = computePlan({ ...TYPICAL_PIT, cap: null }, { factors: { gluedCourses: 2 } });
  expect(twoCourses.materials.find((m) => m.key === "adhesive")?.note).toBe("top 2 courses: 560 in of bead");
  const capsOnly = computePlan(TYPICAL_PIT, { factors: { gluedCourses: 0 } });
  expect(capsOnly.materials.find((m) => m.key === "adhesive")).toMatchObject({
    quantity: 2,
    note: "caps: 280 in of bead",
  });
  const topOnly = computePlan({ ...TYPICAL_PIT, cap: null });
  expect(topOnly.materials.find((m) => m.key === "adhesive")?.note).toBe("top course: 280 in of bead");
});

test("bead that fills a whole number of cartridges exactly orders that many: 560 in at 140 in a cartridge (100 % yield) is 4, not 5", () => {
  const plan = computePlan(TYPICAL_PIT, { factors: { adhesiveBeadInPerCartridge: 140, adhesiveYieldPct: 100 } });
  expect([plan.adhesive.beadIn, plan.adhesive.beadPerCartridgeIn, plan.adhesive.cartridges]).toEqual([560, 140, 4]);
});

/*
 * Back trims shorten every unit's bead. An exact 30 in bowl of 12/8/8 units (a = 15): each unit
 * spans 2·atan(12/46) = 29.242°; 12 fit, leaving 9.098°, a 3.66 in face (under half a unit), so 11
 * whole units and two closures of (9.098 + 29.242)/2 = 19.170° each: face 2 × 23 × tan 9.585° =
 * 7.768 in, back 2 × 15 × tan 9.585° = 5.066 in. Backs: 15 × 12 / 23 = 7.826 in against 8, a trim of
 * 0.087 in a side, so a whole unit's mean is (12 + 8 − 0.174)/2 = 9.913 in.
 * A course: (11 × 9.913 + 2 × (7.768 + 5.066)/2) × 2 beads = 243.75 in; top course and caps: 487.5 in.
 */
test("back-trimmed units lay less bead: an exact 30 in bowl glues 487.5 in (worked by hand, above)", () => {
  const plan = computePlan({ ...TYPICAL_PIT, ring: { bowlDiameterIn: 30, fit: "exact" }, liner: { kind: "none" } });
  expect(plan.ring.backTrimPerSideIn).toBeCloseTo(0.087, 3);
  expect(plan.adhesive.beadIn).toBeCloseTo(487.5, 0);
  expect(plan.adhesive.cartridges).toBe(4);
});

test("a steel ring on the floor: the fill is the gap round it, (1068.7 − π·17.5²) in² × 11 in = 1172.5 in³ = 0.68 ft³, two 1/2 ft³ bags (regular-polygon area; NIST SP 811)", () => {
  // Lined 12 − 1/8 = 11.875 in; an 11 in ring sits 0.875 in under it, within the 1 in raise limit: no bed.
  const plan = computePlan({ ...TYPICAL_PIT, liner: { kind: "steel-ring", outsideDiameterIn: 35, heightIn: 11 } });
  expect(plan.materials.find((m) => m.key === "fill")).toEqual({
    key: "fill",
    item: "Pea gravel",
    quantity: 2,
    unit: "bag",
    note: "0.7 ft³ between the ring and the wall",
  });
});

test("the order's rounding at exact multiples and its edges, from given liner figures: 2 ft³ is 4 bags of 1/2 ft³, 346.5 in³ of mortar is 3 pails at 50 % of 231 in³, no fill line for no fill, no rip note without a rip", () => {
  const plan = computePlan(TYPICAL_PIT);
  const factors = resolveFactors();
  const order = (liner: Parameters<typeof listMaterials>[0]["liner"]) =>
    listMaterials({
      ring: plan.ring,
      wallUnit: TYPICAL_PIT.wallUnit,
      caps: plan.caps,
      liner,
      patio: null,
      base: plan.base,
      adhesive: plan.adhesive,
      factors,
    });
  const ring = planSteelRing({ bowlDiameterIn: 40, insert: { outsideDiameterIn: 36, heightIn: 10 }, minGapIn: 0.5 });
  expect(order({ ...ring, fillFt3: 2 }).find((m) => m.key === "fill")?.quantity).toBe(4);
  expect(order({ ...ring, fillFt3: 0 }).some((m) => m.key === "fill")).toBe(false);
  // 9.125 in lined: two whole rows of 4 1/2 + 1/16 in and nothing left to rip; 12 a row in a 40 in bowl.
  const bricks = planFirebrick({
    bowlDiameterIn: 40,
    linedHeightIn: 9.125,
    brick: { lengthIn: 9, widthIn: 4.5, heightIn: 2.5 },
    jointIn: 1 / 16,
  });
  const lines = order({ ...bricks, mortarIn3: 346.5 });
  expect(lines.find((m) => m.key === "firebrick")?.note).toBe("2 rows of 12 on edge, plus 2 spare");
  expect(lines.find((m) => m.key === "refractory-mortar")?.quantity).toBe(3);
});
