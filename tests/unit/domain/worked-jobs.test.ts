import { expect, test } from "vitest";
import { computePlan, type Plan } from "~/domain/plan";
import { PATIO, SUPPLY_PRICES, TYPICAL_PIT } from "./fixtures";

/*
 * Three jobs worked by hand (with a calculator, from the formulas in shared trade notes, not from
 * the engine), every quantity and labour line pinned. Factors are the defaults, each with its source:
 *  - spares: wall units +5 % (at least 1), caps +1, firebrick +5 %, border +5 % (at least 1): common practice, no
 * source
 *  - base 6 in deep, 6 in past the outside corners, patio base 4 in and max(4, 6) = 6 in past the
 *    paver edge (ICPI Tech Spec 2); loose 1.25 × compacted, +10 %, 1.4 t/yd³ (from memory);
 *    1 yd³ = 46,656 in³, 1 ft² = 144 in², 1 ft³ = 1728 in³, 1 gal = 231 in³ (NIST SP 811)
 *  - adhesive: 2 beads along every piece, top course and caps glued, 165 in a cartridge (derived
 *    from 10.1 fl oz and a 3/8 in bead) at 85 % yield (common practice, no source)
 *  - steel ring gap ≥ 1/2 in, raised on gravel when more than 1 in under the caps, 1/8 in under the
 *    caps; firebrick rows 4½ + 1/16 in, rips of 1 in or more; fill bags 0.5 ft³ (common practice / from memory)
 *  - labour: set-up 2 h; base 0.15 h/ft²; spoil 1.25 swell × 1.5 h/yd³; carry 1 h/t at 142 lb/ft³;
 *    first course 5 min, other units 3 min; saw 0.5 min a pass + cut face / 40 in² a minute, one
 *    pass up to 5 in deep; marking 2 min and setting 5 min a cap; ring 0.5 h; firebrick 2 min;
 *    patio 0.12 h/ft² (from memory or common practice, no source). Every task rounds to 0.01 h.
 */

const byKey = (plan: Plan) => Object.fromEntries(plan.materials.map((m) => [m.key, m.quantity]));
const hours = (plan: Plan) => Object.fromEntries(plan.labour.tasks.map((t) => [t.task, t.hours]));

test("job A, the typical pit: 3 courses of 14 (12/8/8/4 units), 12 caps from 16 × 12 blanks, a 35 in steel ring", () => {
  const plan = computePlan(TYPICAL_PIT, { supplyPrices: { ...SUPPLY_PRICES, fillPerBagCents: 650 } });
  // a = max(8/(2 tan(π/14)), 12/(2 tan(π/14)) − 8) = max(17.525, 18.2877) = 18.2877 (face-limited);
  // corner radius √(26.2877² + 6²) = 26.9638.
  // Wall: 42 laid + ceil(2.1) = 3 → 45.  Caps: a2 = 28.2877; 11 caps are 16.417 in outside, over
  // 16 − 2 × 1/4; 12 are 14.965 in → 12 caps; 14 (the wall's count) would waste 37.6 % against 26.6 %:
  // over 10 points more, so 12; +1 spare → 13.
  // Ring: gap (36.575 − 35)/2 = 0.788 ≥ 1/2. Lined height 12 − 1/8 = 11.875; the ring's top sits
  // 1.875 in under it → a 1.875 in bed. Inside polygon 14 × 18.2877² × tan(π/14) = 1068.7 in²;
  // fill (1068.7 − π·17.5²) × 10 + 1068.7 × 1.875 = 3069.4 in³ = 1.776 ft³ → ceil(3.55) = 4 bags.
  // Base: r = 32.9638, π r² = 3413.7 in² = 23.706 ft², × 6 = 0.4390 yd³ → × 1.25 × 1.1 × 1.4 = 0.845 t → 0.9 t.
  // Glue: 2 layers × 14 × 10 in × 2 beads = 560 in ÷ (165 × 0.85 = 140.25) = 3.99 → 4 cartridges.
  expect(byKey(plan)).toEqual({ "wall-unit": 45, cap: 13, "steel-ring": 1, fill: 4, aggregate: 0.9, adhesive: 4 });
  expect(plan.liner).toMatchObject({ kind: "steel-ring", fits: true, bedDepthIn: 1.875 });
  // What the order says, from the same working: 0.4390 yd³ to two places, 1.776 ft³ to one, 560 in of bead.
  expect(plan.materials.map((m) => [m.key, m.item, m.unit, m.note])).toEqual([
    ["wall-unit", "Wall units", "each", "3 courses of 14, plus 3 spare"],
    ["cap", "Cap blanks", "each", "12 caps cut from 16 in × 12 in blanks, plus 1 spare"],
    ["steel-ring", "Steel ring insert", "each", undefined],
    ["fill", "Pea gravel", "bag", "1.8 ft³: a 1 7/8 in bed under the ring and the gap round it"],
    ["aggregate", "Base aggregate", "ton", "0.44 yd³ compacted"],
    ["adhesive", "Heat-rated masonry adhesive, 10.1 fl oz", "cartridge", "top course and caps: 560 in of bead"],
  ]);
  // Labour: base 23.706 × 0.15 = 3.556 → 3.56; spoil 0.4390 × 1.25 × 1.5 = 0.823 → 0.82;
  // carry (45 × 26.30 + 13 × 39.44 lb = 1696 lb) = 0.848 t → 0.85; first course 14 × 5 min = 1.17;
  // courses 28 × 3 min = 1.40; saw 24 side cuts × (0.5 + 12.423 × 2.5 / 40 = 1.2765 min) = 0.51;
  // mark 12 × 2 min = 0.40; caps 12 × 5 min = 1.00; ring 0.50. Total 12.21 h.
  expect(hours(plan)).toEqual({
    setup: 2,
    base: 3.56,
    spoil: 0.82,
    carry: 0.85,
    "first-course": 1.17,
    courses: 1.4,
    "saw-cuts": 0.51,
    "mark-caps": 0.4,
    caps: 1,
    liner: 0.5,
  });
  expect(plan.labour.hours).toBe(12.21);
  expect(plan.labour.sawCuts).toBe(24);
  // The labour lines say what they count: 23.706 ft², 0.4390 × 1.25 = 0.549 yd³ loose, 1696 lb
  // (a unit (12 + 8)/2 × 8 × 4 = 320 in³ and a blank 16 × 12 × 2.5 = 480 in³ at 142 lb/ft³: 26.30 and 39.44 lb).
  expect(plan.labour.tasks.map((t) => t.label)).toEqual([
    "Layout, set-up and clean-up",
    "Excavate and compact the base (23.7 ft²)",
    "Haul away the dug soil (0.55 yd³ loose)",
    "Unload and carry units, caps and brick to the pit (1,696 lb)",
    "Set and level the first course (14 units)",
    "Stack and glue the upper courses (28 units)",
    "Wet-saw cuts (24)",
    "Mark the cap blanks (12)",
    "Glue and set the caps (12)",
    "Lay the gravel bed, set the steel ring and backfill",
  ]);
  expect(plan.labour.wallUnitLb).toBeCloseTo(26.296, 3);
  expect(plan.labour.capBlankLb).toBeCloseTo(39.444, 3);
  expect(plan.labour.carriedLb).toBeCloseTo(1696.11, 2);
  expect(plan.labour.sawGroups).toHaveLength(1);
  expect(plan.labour.sawGroups[0]).toMatchObject({ what: "cap side cuts", count: 24, depthIn: 2.5, passes: 1 });
  expect(plan.labour.sawGroups[0]!.lengthIn).toBeCloseTo(12.423, 3);
  expect(plan.labour.sawGroups[0]!.minutesEach).toBeCloseTo(1.2765, 4);
  // Price lines: 45 × $6.50, 13 × $22, $220, 4 × $6.50, 0.9 t × $45, 4 × $9 (the fixture's invented prices).
  expect(plan.price?.breakdown.lines.map((l) => l.totalCents)).toEqual([29_250, 28_600, 22_000, 2_600, 4_050, 3_600]);
  expect(plan.price?.breakdown.materialsCents).toBe(90_100);
  expect(plan.price?.breakdown.labourCents).toBe(91_575); // 12.21 h × $75
  expect(plan.unpricedItems).toEqual([]);
});

test("job B, an exact 40 in bowl: 4 courses of 14 whole units and a closure, 13 caps, firebrick with a ripped top row", () => {
  const plan = computePlan({
    ...TYPICAL_PIT,
    ring: { bowlDiameterIn: 40, fit: "exact" },
    courses: 4,
    cap: { ...TYPICAL_PIT.cap!, innerOverhangIn: 1 },
    liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5 },
  });
  // a = 20: each unit spans 2 atan(12 / 56) = 24.19°; 14 whole leave 21.35°, a closure 10.554 in at
  // the face and 7.539 at the back (over half a unit: one closure). Backs: 20 × 12 / 28 = 8.571 > 8,
  // so no trims. 15 pieces × 4 courses = 60 + 3 spares = 63.
  expect(plan.ring).toMatchObject({ unitCount: 14, unitsPerCourse: 15, totalUnits: 60, backTrimPerSideIn: 0 });
  // Caps: a1 = 19, a2 = 31; 12 caps are 2 × 31 × tan 15° − 0.194 = 16.42 in, over 15.5; 13 → 15.089.
  // 15 (the wall's pieces) wastes more than 10 points over 13's 24.2 %: 13 caps, 14 blanks.
  // Firebrick: 12 a row (13 would reach past the 20 in circle); lined 16 − 1/8 = 15.875; rows of
  // 4.5625: 3 whole (13.6875) and a rip of 15.875 − 13.6875 − 0.0625 = 2.125 in → 48 bricks, 12 rips;
  // + ceil(2.4) = 3 spares = 51. V at the back 2 × 13.362 × tan 15° − 9 = 1.340 in.
  // Mortar 12 × (4 × 9 × 2.5 × 1/16 + (3 × 4.5 + 2.125) × 2.5 × (1/16 + 0.670)) = 410.8 in³ ÷ (231 × 0.5) → 4 pails.
  // Sand: (15 × 20² × tan(π/15) − 12 × 13.362² × tan 15°) × 15.875 = 1243.9 in³ = 0.720 ft³ → 2 bags.
  // Base: corner radius √(28² + 6²) = 28.636 + 6 = 34.636; 26.172 ft² × 0.5 ft = 0.4847 yd³ → 0.933 t → 1.0 t.
  // Glue: 2 layers × (14 × 10 + (10.554 + 7.539)/2) × 2 = 596.2 in ÷ 140.25 = 4.25 → 5 cartridges.
  expect(byKey(plan)).toEqual({
    "wall-unit": 63,
    cap: 14,
    firebrick: 51,
    "refractory-mortar": 4,
    fill: 2,
    aggregate: 1,
    adhesive: 5,
  });
  expect(plan.liner).toMatchObject({ kind: "firebrick", bricksPerRow: 12, fullRows: 3, rippedRows: 1, ripCuts: 12 });
  // The order's notes: one closure a course × 4 courses; 410.8 in³ of mortar; 0.720 ft³ of sand; 0.4847 yd³; 596.2 in
  // of bead.
  expect(plan.materials.map((m) => [m.key, m.item, m.unit, m.note])).toEqual([
    ["wall-unit", "Wall units", "each", "4 courses of 15, 4 of them cut down as closure units, plus 3 spare"],
    ["cap", "Cap blanks", "each", "13 caps cut from 16 in × 12 in blanks, plus 1 spare"],
    ["firebrick", "Firebrick", "each", "4 rows of 12 on edge, the top row ripped to 2 1/8 in, plus 3 spare"],
    ["refractory-mortar", "Refractory mortar, 1 gal pail", "pail", "1/16 in joints, 411 in³; not ordinary mortar"],
    ["fill", "Sand", "bag", "0.7 ft³ between the firebrick and the wall"],
    ["aggregate", "Base aggregate", "ton", "0.48 yd³ compacted"],
    ["adhesive", "Heat-rated masonry adhesive, 10.1 fl oz", "cartridge", "top course and caps: 596 in of bead"],
  ]);
  // Labour: base 26.172 × 0.15 = 3.93; spoil 0.4847 × 1.875 = 0.91; carry (63 × 26.30 + 14 × 39.44
  // + 51 × 8.32 lb = 2633 lb) = 1.32; first 15 × 5 min = 1.25; courses 45 × 3 min = 2.25;
  // saw 26 side cuts × 1.2724 + 8 closure cuts × (0.5 + 8 × 4 / 40 = 1.3) + 12 rips × (0.5 + 9 × 2.5 / 40
  // = 1.0625) = 56.23 min = 0.94; mark 13 × 2 min = 0.43; caps 13 × 5 min = 1.08; brick 48 × 2 min = 1.60.
  expect(hours(plan)).toEqual({
    setup: 2,
    base: 3.93,
    spoil: 0.91,
    carry: 1.32,
    "first-course": 1.25,
    courses: 2.25,
    "saw-cuts": 0.94,
    "mark-caps": 0.43,
    caps: 1.08,
    liner: 1.6,
  });
  expect(plan.labour.hours).toBe(15.71);
  expect(plan.labour.sawCuts).toBe(26 + 8 + 12);
  // Lines: 26.172 ft², 0.4847 × 1.25 = 0.606 yd³ loose, 2633 lb; closure cuts 8 in deep through 4 in,
  // firebrick rips 9 in through 2.5 in; every cut one pass (under the 5 in saw depth).
  expect(plan.labour.tasks.map((t) => t.label)).toEqual([
    "Layout, set-up and clean-up",
    "Excavate and compact the base (26.2 ft²)",
    "Haul away the dug soil (0.61 yd³ loose)",
    "Unload and carry units, caps and brick to the pit (2,633 lb)",
    "Set and level the first course (15 units)",
    "Stack and glue the upper courses (45 units)",
    "Wet-saw cuts (46)",
    "Mark the cap blanks (13)",
    "Glue and set the caps (13)",
    "Line the bowl with firebrick (48)",
  ]);
  expect(plan.labour.sawGroups.map((g) => [g.what, g.count, g.depthIn, g.passes])).toEqual([
    ["cap side cuts", 26, 2.5, 1],
    ["closure cuts", 8, 4, 1],
    ["firebrick rips", 12, 2.5, 1],
  ]);
  expect(plan.labour.sawGroups[1]).toMatchObject({ lengthIn: 8, minutesEach: 1.3 });
  expect(plan.labour.sawGroups[2]!.lengthIn).toBeCloseTo(9, 9);
  expect(plan.labour.sawGroups[2]!.minutesEach).toBeCloseTo(1.0625, 9);
});

test("job C, 15 grand units (12/8.75/9/6), 12 caps from 18 × 12 blanks, no liner, a 16 ft patio of 9 × 6 pavers and a 12 × 6 border", () => {
  const plan = computePlan({
    ...TYPICAL_PIT,
    ring: { unitCount: 15 },
    wallUnit: { faceIn: 12, backIn: 8.75, depthIn: 9, heightIn: 6 },
    cap: { lengthIn: 18, depthIn: 12, thicknessIn: 2.5, innerOverhangIn: 1 },
    liner: { kind: "none" },
    patio: { ...PATIO, paver: { lengthIn: 9, widthIn: 6 } },
  });
  // a = max(8.75/(2 tan 12°), 12/(2 tan 12°) − 9) = max(20.583, 19.228) = 20.583 (back-limited);
  // corner √(29.583² + 6²) = 30.185. 45 units + 3 spares = 48. Caps: a2 = 31.583; 12 → 16.731 in
  // (11 would be 18.36); 15 (the wall's count) wastes too much more: 12 caps, 13 blanks.
  // Border: square ends would open 12 × 6 / 90 = 0.8 in; tapered, 2 atan(12/192) = 7.153°, 50 units
  // and a 3.966 in closure (over a third): 51, + ceil(2.55) = 3 spares = 54.
  // Pavers: stack grid of 9 × 6 cells between radius 29.583 and 90: 348 whole and 120 cut,
  // × 1.05 = 491.4 → 492. Bedding: (π 96² − π 29.583²) × 1 in = 26,203 in³ = 0.5616 yd³ × 1.35 = 0.758 t → 0.8 t.
  // Joint sand 181.97 ft² × 1 lb ÷ 50 → 4 bags. Edge 2π × 96 = 603.2 in: 7 pieces of 8 ft, 51 spikes.
  // Base: pit disc r = 36.185 (4113.4 in²) × 6 in + patio disc to 96 + 6 = 102 in less the pit disc
  // (32,685 in² − 4113.4 = 28,572 in²) × 4 in = 138,969 in³ = 2.9786 yd³ → × 1.925 = 5.734 t → 5.8 t.
  // Glue: 2 layers × 15 × 10.375 × 2 = 622.5 in ÷ 140.25 = 4.44 → 5.
  expect(byKey(plan)).toEqual({
    "wall-unit": 48,
    cap: 13,
    aggregate: 5.8,
    adhesive: 5,
    paver: 492,
    "border-unit": 54,
    "bedding-sand": 0.8,
    "joint-sand": 4,
    "edge-restraint": 7,
    "edge-spike": 51,
  });
  expect(plan.base.patioRadiusIn).toBe(102);
  // The two base areas: the pit's disc 4113.4 in² = 28.566 ft², the patio's ring 28,572 in² = 198.42 ft².
  expect(plan.base.pitAreaFt2).toBeCloseTo(28.566, 2);
  expect(plan.base.patioAreaFt2).toBeCloseTo(198.42, 1);
  // The order's notes. Paver waste: the field is π × 90² less the pit's footprint, the circle through
  // the middles of its faces (π × 29.583² = 2749.4 in²), so 22,697 in² ÷ 54 in² = 420.3 pavers; 492 is 17 % over.
  // Edge 603.2 in = 50.3 ft; spikes at the default 12 in spacing (common practice, no source).
  expect(plan.materials.map((m) => [m.key, m.item, m.unit, m.note])).toEqual([
    ["wall-unit", "Wall units", "each", "3 courses of 15, plus 3 spare"],
    ["cap", "Cap blanks", "each", "12 caps cut from 18 in × 12 in blanks, plus 1 spare"],
    ["aggregate", "Base aggregate", "ton", "2.98 yd³ compacted under the pit and the patio"],
    ["adhesive", "Heat-rated masonry adhesive, 10.1 fl oz", "cartridge", "top course and caps: 623 in of bead"],
    ["paver", "Patio pavers", "each", "348 whole, 120 cut, 5 % spare: 17 % over the area"],
    ["border-unit", "Border units", "each", "51 in the course, plus 3 spare"],
    ["bedding-sand", "Bedding sand", "ton", undefined],
    ["joint-sand", "Joint sand", "bag", undefined],
    ["edge-restraint", "Edge restraint, 8 ft", "piece", "50.3 ft round the patio"],
    ["edge-spike", "Edge spikes", "each", "one every 12 in"],
  ]);
  expect(plan.patio).toMatchObject({
    borderLayout: "tapered",
    borderWholeCount: 50,
    borderClosureCount: 1,
    wholePaverCount: 348,
    cutPaverCount: 120,
  });
  // Labour: base 28.566 ft² × 0.15 = 4.28; spoil (4113.4 × 6 + 28,572 × 5) in³ = 3.591 yd³ × 1.875 = 6.73;
  // carry (48 × 46.04 + 13 × 44.38 lb = 2787 lb) = 1.39; first 15 × 5 min = 1.25; courses 30 × 3 min = 1.50;
  // saw 24 × 1.2765 min = 0.51; mark 0.40; caps 1.00; patio 181.97 ft² × 0.12 = 21.84. Total 40.90 h.
  expect(hours(plan)).toEqual({
    setup: 2,
    base: 4.28,
    spoil: 6.73,
    carry: 1.39,
    "first-course": 1.25,
    courses: 1.5,
    "saw-cuts": 0.51,
    "mark-caps": 0.4,
    caps: 1,
    patio: 21.84,
  });
  expect(plan.labour.hours).toBe(40.9);
  // Lines: 28.566 ft², 3.591 × 1.25 = 4.489 yd³ loose, 2787 lb (a unit (12 + 8.75)/2 × 9 × 6 =
  // 560.25 in³ = 46.04 lb, a blank 18 × 12 × 2.5 = 540 in³ = 44.38 lb), 181.97 ft² of patio.
  expect(plan.labour.tasks.map((t) => t.label)).toEqual([
    "Layout, set-up and clean-up",
    "Excavate and compact the base (28.6 ft²)",
    "Haul away the dug soil (4.49 yd³ loose)",
    "Unload and carry units, caps and brick to the pit (2,787 lb)",
    "Set and level the first course (15 units)",
    "Stack and glue the upper courses (30 units)",
    "Wet-saw cuts (24)",
    "Mark the cap blanks (12)",
    "Glue and set the caps (12)",
    "Patio: base, bedding, border and field (182 ft²)",
  ]);
  expect(plan.labour.wallUnitLb).toBeCloseTo(46.039, 3);
  expect(plan.labour.capBlankLb).toBeCloseTo(44.375, 3);
});
