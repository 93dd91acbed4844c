import { expect, test } from "vitest";
import { listCautions, listWarnings } from "~/domain/advice";
import { planCaps } from "~/domain/caps";
import { planSteelRing } from "~/domain/liner";
import { computePlan } from "~/domain/plan";
import { planRing, type WallUnitSize } from "~/domain/ring";
import { TYPICAL_PIT } from "./fixtures";

// Illustrative tapered unit: 12 in face, 8 in back, 8 in deep, 4 in high.
const UNIT: WallUnitSize = { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4 };

const codes = (items: { code: string }[]) => items.map((item) => item.code);

test("a typical 14-unit pit with 2 in overhangs and a fitting ring raises no warnings", () => {
  expect(computePlan(TYPICAL_PIT).warnings).toEqual([]);
});

test("a back-limited 12-unit ring warns of open face joints and names the 32 in bowl that closes them (derived here from the formulas)", () => {
  const plan = computePlan({ ...TYPICAL_PIT, ring: { unitCount: 12 }, liner: { kind: "none" } });
  const warning = plan.warnings.find((w) => w.code === "open-face-joints");
  expect(warning?.message).toMatch(/open about 5\/16 in/);
  expect(warning?.message).toMatch(/32 in or more/);
});

test("a 13-unit ring closes its face joints: no open-face-joints warning", () => {
  const plan = computePlan({ ...TYPICAL_PIT, ring: { unitCount: 13 }, liner: { kind: "none" } });
  expect(codes(plan.warnings)).not.toContain("open-face-joints");
});

test("cap overhangs past 3 in outside, short of the outside face, or past 2 in over the fire are flagged (common practice, no source)", () => {
  const deep = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, depthIn: 14 } });
  expect(codes(deep.warnings)).toContain("cap-overhang-outside-large");
  const shallow = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, depthIn: 9 } });
  expect(codes(shallow.warnings)).toContain("cap-overhang-outside-negative");
  const inward = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, innerOverhangIn: 3 } });
  expect(codes(inward.warnings)).toContain("cap-inner-overhang-large");
});

test("a steel ring too big for the bowl is flagged with the ring that clears it: 38 in + 2 × 1/2 in gap = 39 in (common practice, no source)", () => {
  const plan = computePlan({ ...TYPICAL_PIT, liner: { kind: "steel-ring", outsideDiameterIn: 38, heightIn: 10 } });
  const warning = plan.warnings.find((w) => w.code === "liner-does-not-fit");
  expect(warning?.message).toMatch(/needs a bowl of at least 39 in/);
  expect(warning?.message).toMatch(/15 units a course \(40 7\/16 in bowl\)/);
});

test("bowls under 30 in or over 48 in and walls outside 12–20 in are flagged (from memory: bowls 36–44 in, seats 17–20 in)", () => {
  expect(codes(computePlan({ ...TYPICAL_PIT, ring: { unitCount: 11 }, liner: { kind: "none" } }).warnings)).toContain(
    "bowl-small",
  );
  expect(codes(computePlan({ ...TYPICAL_PIT, ring: { unitCount: 18 }, liner: { kind: "none" } }).warnings)).toContain(
    "bowl-large",
  );
  expect(codes(computePlan({ ...TYPICAL_PIT, courses: 2, cap: null }).warnings)).toContain("seat-height");
  expect(codes(computePlan({ ...TYPICAL_PIT, courses: 5 }).warnings)).toContain("seat-height");
  expect(codes(computePlan({ ...TYPICAL_PIT, courses: 4 }).warnings)).not.toContain("seat-height");
});

test("exact bowls warn about their closure units and back trims", () => {
  const plan = computePlan({ ...TYPICAL_PIT, ring: { bowlDiameterIn: 30, fit: "exact" }, liner: { kind: "none" } });
  expect(codes(plan.warnings)).toEqual(expect.arrayContaining(["closure-units", "back-trims"]));
});

test("the setback caution quotes International Fire Code §307.4.2 (25 ft) and defers to the local fire authority", () => {
  const [setback] = listCautions({ linerKind: "none", requiredSetbackFt: 25 });
  expect(setback.code).toBe("setback");
  expect(setback.message).toMatch(/§307\.4\.2/);
  expect(setback.message).toMatch(/at least 25 ft/);
  expect(setback.message).toMatch(/local fire authority/);
});

test("a site closer than the company's required setback gets its own caution; the company's figure is used", () => {
  const close = listCautions({ linerKind: "steel-ring", requiredSetbackFt: 30, siteSetbackFt: 26 });
  expect(codes(close)).toContain("setback-too-close");
  expect(close[0].message).toMatch(/at least 30 ft/);
  expect(codes(listCautions({ linerKind: "steel-ring", requiredSetbackFt: 25, siteSetbackFt: 26 }))).not.toContain(
    "setback-too-close",
  );
});

test("the liner caution is always shown, and is stronger when the bowl has no liner (interFIRE, Spalling of Concrete)", () => {
  const none = listCautions({ linerKind: "none", requiredSetbackFt: 25 }).find((c) => c.code === "line-the-bowl");
  const lined = listCautions({ linerKind: "firebrick", requiredSetbackFt: 25 }).find((c) => c.code === "line-the-bowl");
  expect(none?.message).toMatch(/no liner/);
  expect(lined?.message).not.toMatch(/no liner/);
});

test("cautions cite their sources: IFC §307.5 4-A extinguisher, ANSI Z21.97 and NFPA 54 for gas, 811, OSHA 29 CFR 1926.1153 and 1926.702(i)", () => {
  const all = listCautions({ linerKind: "none", requiredSetbackFt: 25 });
  const text = (code: string) => all.find((c) => c.code === code)?.message ?? "";
  expect(text("attend-fire")).toMatch(/4-A.*§307\.5/);
  expect(text("gas-appliances")).toMatch(/ANSI Z21\.97.*NFPA 54/);
  expect(text("gas-appliances")).toMatch(/outdoors only/);
  expect(text("call-before-digging")).toMatch(/811/);
  expect(text("wet-cutting")).toMatch(/1926\.1153.*1926\.702\(i\)/);
  expect(text("burning-rules")).toMatch(/burn ban.*seasoned.*wooden deck.*branches/s);
});

test("every caution has a stable kebab-case code, once, and is aimed at the homeowner, the crew or both", () => {
  const all = listCautions({ linerKind: "none", requiredSetbackFt: 25, siteSetbackFt: 10 });
  expect(new Set(codes(all)).size).toBe(all.length);
  for (const caution of all) {
    expect(caution.code).toMatch(/^[a-z]+(-[a-z0-9]+)*$/);
    expect(["homeowner", "crew", "both"]).toContain(caution.audience);
  }
  expect(all.find((c) => c.code === "wet-cutting")?.audience).toBe("crew");
  expect(all.find((c) => c.code === "attend-fire")?.audience).toBe("homeowner");
});

const warningText = (plan: ReturnType<typeof computePlan>, code: string) =>
  plan.warnings.find((w) => w.code === code)?.message;

test("closure and back-trim warnings say what to cut: an exact 40 in bowl needs one 10 9/16 in closure a course; an exact 30 in bowl two of 7 3/4 in and 1/16 in off each back corner, 2 × 11 × 3 = 66 cuts (worked in the quantities and worked-job tests)", () => {
  const forty = computePlan({ ...TYPICAL_PIT, ring: { bowlDiameterIn: 40, fit: "exact" }, liner: { kind: "none" } });
  expect(warningText(forty, "closure-units")).toBe(
    "An exact bowl needs one closure unit in every course, cut along two radial lines to 10 9/16 in at the face. A whole-unit ring avoids these cuts.",
  );
  const thirty = computePlan({ ...TYPICAL_PIT, ring: { bowlDiameterIn: 30, fit: "exact" }, liner: { kind: "none" } });
  expect(warningText(thirty, "closure-units")).toMatch(
    /^An exact bowl needs two closure units in every course, cut along two radial lines to 7 3\/4 in at the face\./,
  );
  expect(warningText(thirty, "back-trims")).toBe(
    "So the face joints close at this bowl size, every unit needs 1/16 in trimmed off each back corner (66 extra cuts).",
  );
});

test("open face joints: 11 tapered units open 11/16 in, 2 × 21.623 × tan(π/11) − 12 = 0.698 in, and name the 32 in bowl that closes them; 12 square-ended units open 4 5/16 in and are told no ring closes them (regular-polygon chord)", () => {
  const eleven = computePlan({ ...TYPICAL_PIT, ring: { unitCount: 11 }, liner: { kind: "none" } });
  expect(warningText(eleven, "open-face-joints")).toBe(
    "The backs of these units meet first, so each joint on the outside face stays open about 11/16 in. Rings with a bowl of 32 in or more close them.",
  );
  // a = 12/(2 tan 15°) = 22.392; 2 × 30.392 × tan 15° − 12 = 4.287 in.
  const square = computePlan({
    ...TYPICAL_PIT,
    wallUnit: { faceIn: 12, backIn: 12, depthIn: 8, heightIn: 4 },
    ring: { unitCount: 12 },
    liner: { kind: "none" },
  });
  expect(warningText(square, "open-face-joints")).toBe(
    "The backs of these units meet first, so each joint on the outside face stays open about 4 5/16 in. Units with square ends always leave open joints on a curve: fill them or choose tapered units.",
  );
});

test("cap overhang warnings give the figures: 14 in blanks reach 14 − 8 − 2 = 4 in out at the middle; 9 in blanks stop 1 in short; 10 1/2 in blanks reach 1/2 in at the middle but a wall corner (26.964 in out) shows by 26.964 − 26.788 = 3/16 in (common practice, no source)", () => {
  const deep = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, depthIn: 14 } });
  expect(warningText(deep, "cap-overhang-outside-large")).toMatch(
    /^The caps overhang the outside of the wall by up to .* at their corners \(4 in at the middle\); 1 to 2 in is usual and 3 in the most you allow\. Rip the blanks narrower to bring it in\.$/,
  );
  const shallow = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, depthIn: 9 } });
  expect(warningText(shallow, "cap-overhang-outside-negative")).toBe(
    "The caps stop 1 in short of the wall's outside face, leaving the top of the wall showing. Use deeper caps or a smaller inner overhang.",
  );
  const mid = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, depthIn: 10.5 } });
  expect(mid.warnings).toEqual([
    {
      code: "cap-overhang-outside-negative",
      message:
        "The caps overhang the wall by 1/2 in at their middle, but where a cap's middle passes a wall unit's outside corner the corner shows by up to 3/16 in. Use deeper caps or a smaller inner overhang.",
    },
  ]);
});

test("caps with no inner overhang fall short of the wall's back at their corners: 14 caps (the wall's count) have 8.156 in inner edges, corners at √(18.288² + 4.078²) = 18.737 in, 0.449 in (7/16) past the 18.288 in back face (Pythagoras)", () => {
  const plan = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, innerOverhangIn: 0 } });
  expect(warningText(plan, "cap-inner-overhang-short")).toBe(
    "At their inner corners the straight caps fall 7/16 in short of the wall's back face, so the top of the wall shows toward the fire there. Give the caps a little more inner overhang.",
  );
  const inward = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, innerOverhangIn: 3 } });
  expect(warningText(inward, "cap-inner-overhang-large")).toMatch(
    /^The caps reach 3 in over the fire at the middle of the wall's back faces, up to .* where they pass a back corner\. Cap edges in the flame crack and spall; keep the inner overhang to 2 in or less\.$/,
  );
});

test("liner and size warnings in words: a 13 in ring stands above 12 − 1/8 = 11 7/8 in; two courses without caps stand 8 in; 18 units make a 12/tan 10° − 16 = 52 1/16 in bowl; 11 units a 27 1/4 in one (from memory: bowls 36–44 in, walls 12–18 in, seats 17–20 in)", () => {
  const tall = computePlan({ ...TYPICAL_PIT, liner: { kind: "steel-ring", outsideDiameterIn: 35, heightIn: 13 } });
  expect(warningText(tall, "liner-too-tall")).toBe(
    "The 13 in steel ring stands above the top of the block (11 7/8 in under the caps), so the caps would rest on the ring. Add a course or choose a lower ring.",
  );
  const low = computePlan({ ...TYPICAL_PIT, courses: 2, cap: null, liner: { kind: "none" } });
  expect(warningText(low, "seat-height")).toBe(
    "The wall stands 8 in with its caps. Walls of 12 to 18 in are usual, and 17 to 20 in makes a comfortable seat.",
  );
  const big = computePlan({ ...TYPICAL_PIT, ring: { unitCount: 18 }, liner: { kind: "none" } });
  expect(warningText(big, "bowl-large")).toBe(
    "A 52 1/16 in bowl is large: 36 to 44 in is usual, and a big fire is harder to keep in hand.",
  );
  const small = computePlan({ ...TYPICAL_PIT, ring: { unitCount: 11 }, liner: { kind: "none" } });
  expect(warningText(small, "bowl-small")).toBe(
    "The fire's opening of 27 1/4 in is small for a wood fire: 36 to 44 in is usual, and small bowls push flames onto the walls.",
  );
});

test("firebrick in a bowl too small for it is said so; a lined bowl is judged by the opening inside the firebrick", () => {
  // An exact 12 in bowl (a = 6): three 9 in bricks would put their outer corners at
  // √((9/(2 tan 60°) + 2.5)² + 4.5²) = √(5.098² + 4.5²) = 6.80 in, past the 6 in bowl (Pythagoras).
  const small = computePlan({
    ...TYPICAL_PIT,
    ring: { bowlDiameterIn: 12, fit: "exact" },
    cap: null,
    liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5 },
  });
  expect(warningText(small, "liner-does-not-fit")).toBe(
    "This bowl (12 in) is too small to line with these firebricks on edge.",
  );
  const lined = computePlan({
    ...TYPICAL_PIT,
    ring: { bowlDiameterIn: 34, fit: "exact" },
    liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5 },
  });
  expect(warningText(lined, "bowl-small")).toBe(
    "The fire's opening (27 11/16 in inside the firebrick) is small for a wood fire: 36 to 44 in is usual, and small bowls push flames onto the walls.",
  );
});

test("every caution goes to who acts on it: drainage, wet cutting and lifting to the crew; attending, burning rules, hot caps and gas to the homeowner; distances, the liner, base and cure, and 811 to both (common practice, no source)", () => {
  const all = listCautions({
    linerKind: "steel-ring",
    requiredSetbackFt: 30,
    site: { structureFt: 29, propertyLineFt: 9, branchesFt: 9 },
    limits: { requiredPropertyLineFt: 10, requiredBranchClearanceFt: 10 },
    fireOpeningIn: 36.5,
  });
  expect(all.map((c) => [c.code, c.audience])).toEqual([
    ["setback", "both"],
    ["setback-too-close", "both"],
    ["property-line-too-close", "both"],
    ["branches-too-close", "both"],
    ["recreational-fire-size", "both"],
    ["line-the-bowl", "both"],
    ["drainage", "crew"],
    ["base-and-cure", "both"],
    ["attend-fire", "homeowner"],
    ["burning-rules", "homeowner"],
    ["hot-caps-and-ash", "homeowner"],
    ["gas-appliances", "homeowner"],
    ["call-before-digging", "both"],
    ["wet-cutting", "crew"],
    ["heavy-lifting", "crew"],
  ]);
  const text = (code: string) => all.find((c) => c.code === code)?.message ?? "";
  expect(text("setback")).toMatch(
    /^Keep the fire at least 30 ft from buildings, fences, decks and anything that burns, 10 ft from the property line and 10 ft from overhanging branches and wires\. .*Check with your local fire authority and codes\.$/,
  );
  expect(text("setback-too-close")).toBe(
    "The spot chosen is 29 ft from the nearest building or combustible, closer than the 30 ft required. Move the pit, or confirm with your local fire authority before building.",
  );
  expect(text("property-line-too-close")).toBe(
    "The spot chosen is 9 ft from the property line, closer than the 10 ft asked for. Move the pit, or confirm the local rule with your town before building.",
  );
  expect(text("branches-too-close")).toBe(
    "Overhanging branches or wires are 9 ft from the fire, closer than the 10 ft asked for. Move the pit, or have the branches cut back before the first fire.",
  );
  // IFC §202: a recreational fire is at most 3 ft across and 2 ft high.
  expect(text("recreational-fire-size")).toMatch(
    /^The fire's opening is about 37 in across\. The International Fire Code \(§202\) treats a fire up to 3 ft across and 2 ft high as a recreational fire;.*permit.*Check with your local fire authority and codes\.$/,
  );
  expect(text("drainage")).toMatch(/dense-graded base.*open-graded stone \(clean gravel\).*drain to daylight/);
  expect(text("base-and-cure")).toMatch(/frost depth.*cure \(commonly about 7 days\).*first few fires small/);
  expect(text("hot-caps-and-ash")).toMatch(/children and pets.*spark screen.*metal can with a tight lid/);
  expect(text("heavy-lifting")).toBe("Caps and large wall units are heavy: lift them with two people.");
  expect(text("wet-cutting")).toMatch(/respirator of APF 10 or more \(Table 1\)\.$/);
});

test("distances exactly at the company's figures raise no caution, nor does a 36 in opening (IFC §202: up to 3 ft is a recreational fire)", () => {
  const at = listCautions({
    linerKind: "none",
    requiredSetbackFt: 30,
    site: { structureFt: 30, propertyLineFt: 10, branchesFt: 10 },
    limits: { requiredPropertyLineFt: 10, requiredBranchClearanceFt: 10 },
    fireOpeningIn: 36,
  });
  for (const code of ["setback-too-close", "property-line-too-close", "branches-too-close", "recreational-fire-size"])
    expect(codes(at)).not.toContain(code);
});

test("the lifting caution gives the weights (26.3 lb units and 39.4 lb blanks at 142 lb/ft³, as worked in job A) and leaves the cap out without caps; straight cuts only drop the handheld-saw respirator sentence (OSHA 29 CFR 1926.1153 Table 1)", () => {
  const weighed = listCautions({
    linerKind: "none",
    requiredSetbackFt: 25,
    weights: { wallUnitLb: 26.3, capBlankLb: 39.4, lbPerFt3: 142 },
    handheldCuts: false,
  });
  const text = (code: string) => weighed.find((c) => c.code === code)?.message ?? "";
  expect(text("heavy-lifting")).toBe(
    "Each wall unit weighs about 26 lb and each cap blank about 39 lb (at about 142 lb/ft³ of concrete; check the supplier's figure). Lift anything over about 50 lb with two people, bend the knees and keep the back straight.",
  );
  expect(text("wet-cutting")).toBe(
    "Cut block, caps and pavers wet, on a stationary masonry saw with its water feed running, to keep silica dust down (OSHA 29 CFR 1926.1153, Table 1). Keep the blade guard on (29 CFR 1926.702(i)) and wear eye and hearing protection.",
  );
  const noCaps = listCautions({
    linerKind: "none",
    requiredSetbackFt: 25,
    weights: { wallUnitLb: 26.3, capBlankLb: null, lbPerFt3: 142 },
  });
  expect(noCaps.find((c) => c.code === "heavy-lifting")?.message).toMatch(
    /^Each wall unit weighs about 26 lb \(at about 142 lb\/ft³/,
  );
});

// Warnings at their edges: the limits are the engine's stated ones (ADVICE_LIMITS: bowls under 30 in
// or over 48 in, walls under 12 in or over 20 in, 1/16 in face joints, 2 in inward overhang; common
// practice or from memory, as noted there); a value exactly at a limit is within it.
test("a bowl of exactly 30 in or 48 in and a wall of exactly 12 in or 20 in raise no size warning", () => {
  const sized = (ring: { bowlDiameterIn: number; fit: "exact" }, courses = 3) =>
    codes(computePlan({ ...TYPICAL_PIT, ring, courses, cap: null, liner: { kind: "none" } }).warnings);
  expect(sized({ bowlDiameterIn: 30, fit: "exact" })).not.toContain("bowl-small");
  expect(sized({ bowlDiameterIn: 29.9, fit: "exact" })).toContain("bowl-small");
  expect(sized({ bowlDiameterIn: 48, fit: "exact" })).not.toContain("bowl-large");
  expect(sized({ bowlDiameterIn: 48.1, fit: "exact" })).toContain("bowl-large");
  // 3 courses of 4 in without caps: 12 in; 5 courses: 20 in.
  expect(sized({ bowlDiameterIn: 36, fit: "exact" }, 3)).not.toContain("seat-height");
  expect(sized({ bowlDiameterIn: 36, fit: "exact" }, 5)).not.toContain("seat-height");
});

test("warnings without company limits use the engine's own, and a one-course wall has no bond to warn of", () => {
  const ring = planRing({ target: { bowlDiameterIn: 34, fit: "exact" }, wallUnit: UNIT, courses: 1 });
  expect(ring.bondOffsetIn).toBeNull();
  // One course of 4 in: closures and a low wall, nothing about the bond.
  expect(codes(listWarnings({ ring, caps: null, liner: null }))).toEqual(["closure-units", "seat-height"]);
  const limits = { capMaxOuterOverhangIn: 3, minBondOffsetIn: 3 };
  expect(codes(listWarnings({ ring, caps: null, liner: null, limits }))).toEqual(["closure-units", "seat-height"]);
});

test("joints set too close between courses are said with the figures: an exact 34 in bowl's nearest joints are 3.971 in apart, said to the nearest 1/16 in as 4 in, under a 5 in limit", () => {
  const ring = planRing({ target: { bowlDiameterIn: 34, fit: "exact" }, wallUnit: UNIT, courses: 2 });
  const warning = listWarnings({
    ring,
    caps: null,
    liner: null,
    limits: { capMaxOuterOverhangIn: 3, minBondOffsetIn: 5 },
  }).find((w) => w.code === "bond-offset-small");
  expect(warning?.message).toBe(
    "Even with the closures of alternate courses set apart, some joints fall only 4 in from the joints below; at least 5 in is usual. A whole-unit ring or a different bowl size lays a better bond.",
  );
});

test("face joints open less than a sanded joint are not flagged: 12 units of 12/7.75/8 meet at the back and open 2 × 22.462 × tan 15° − 12 = 0.037 in at the face (derived here from the formulas)", () => {
  const unit = { faceIn: 12, backIn: 7.75, depthIn: 8, heightIn: 4 };
  const ring = planRing({ target: { unitCount: 12 }, wallUnit: unit, courses: 3 });
  expect(ring.limitedBy).toBe("back");
  expect(ring.faceGapIn).toBeCloseTo(0.0372, 4);
  expect(codes(listWarnings({ ring, caps: null, liner: null }))).not.toContain("open-face-joints");
});

test("caps flush with the wall's face at their middle still show the wall's corners: the message says 0 in at the middle, not that the caps stop short", () => {
  const plan = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, outerOverhangIn: 0 } });
  const warning = plan.warnings.find((w) => w.code === "cap-overhang-outside-negative");
  expect(warning?.message).toMatch(
    /^The caps overhang the wall by 0 in at their middle, but where a cap's middle passes/,
  );
});

test("the inward overhang is flagged at the middle past 2 in, or at a back corner past 2 1/2 in, either alone (common practice, no source)", () => {
  // 14 units of 12/8/8 (a = 18.288 in): back corners sit a/cos(π/14) − a = 0.470 in beyond the middle of the back.
  const middle = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, innerOverhangIn: 2.02 } });
  expect(middle.caps!.overhangRange.innerMaxIn).toBeLessThan(2.5);
  expect(codes(middle.warnings)).toContain("cap-inner-overhang-large");
  // A wall whose back corners stand 1 in past the middle of its backs: 2 in at the middle, 3 in at a corner.
  const ring = planRing({ target: { unitCount: 14 }, wallUnit: UNIT, courses: 3 });
  const caps = planCaps({
    edgeDistanceIn: ring.edgeDistanceIn,
    wallDepthIn: 8,
    cap: TYPICAL_PIT.cap!,
    jointIn: 3 / 16,
    spares: 1,
    wallBackCornerRadiusIn: ring.edgeDistanceIn + 1,
  });
  expect(caps.overhangRange.innerMaxIn).toBeCloseTo(3, 9);
  expect(codes(listWarnings({ ring, caps, liner: null }))).toContain("cap-inner-overhang-large");
});

test("a small opening inside a steel ring says so, and a ring no whole-unit ring clears is said without a suggestion", () => {
  // A 28 in ring in an exact 30 in bowl: 28 + 2 × 1/2 in = 29 in needed, so it fits, and the fire is 28 in across.
  const small = computePlan({
    ...TYPICAL_PIT,
    ring: { bowlDiameterIn: 30, fit: "exact" },
    liner: { kind: "steel-ring", outsideDiameterIn: 28, heightIn: 8 },
  });
  expect(small.warnings.find((w) => w.code === "bowl-small")?.message).toBe(
    "The fire's opening (28 in inside the ring) is small for a wood fire: 36 to 44 in is usual, and small bowls push flames onto the walls.",
  );
  const ring = planRing({ target: { unitCount: 14 }, wallUnit: UNIT, courses: 3 });
  const liner = planSteelRing({
    bowlDiameterIn: ring.bowlDiameterIn,
    insert: { outsideDiameterIn: 800, heightIn: 10 },
    minGapIn: 0.5,
    linedHeightIn: 12,
    wallSides: 14,
    raiseOverIn: 1,
  });
  expect(
    listWarnings({ ring, caps: null, liner, ringForLiner: null }).find((w) => w.code === "liner-does-not-fit")?.message,
  ).toBe("The 800 in steel ring needs a bowl of at least 801 in; this bowl is 36 9/16 in.");
});

test("the setback caution adds the company's property-line and branch distances when it has them", () => {
  const message = (limits?: { requiredPropertyLineFt?: number; requiredBranchClearanceFt?: number }) =>
    listCautions({ linerKind: "none", requiredSetbackFt: 25, limits })[0]!.message;
  expect(message()).toMatch(
    /^Keep the fire at least 25 ft from buildings, fences, decks and anything that burns\. The International/,
  );
  expect(message({ requiredPropertyLineFt: 10, requiredBranchClearanceFt: 21 })).toMatch(
    /^Keep the fire at least 25 ft from buildings, fences, decks and anything that burns, 10 ft from the property line and 21 ft from overhanging branches and wires\. /,
  );
});
