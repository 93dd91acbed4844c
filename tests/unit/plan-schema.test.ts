import fc from "fast-check";
import { expect, test } from "vitest";
import { computePlan, PlanGeometryError, type PlanInput } from "~/domain/plan";
import { formatPlanErrors, isCatalogRef, planRequestSchema } from "~/lib/design/plan-schema";

const VALID = {
  ring: { unitCount: 14 },
  wallUnit: { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4, priceCents: 650, name: "Tapered 12/8" },
  courses: 3,
  cap: { lengthIn: 16, depthIn: 12, thicknessIn: 2.5, innerOverhangIn: 2 },
  jointIn: 0.1875,
  liner: { kind: "steel-ring", outsideDiameterIn: 36, heightIn: 10 },
  patio: { outsideRadiusIn: 96, border: { widthIn: 6, lengthIn: 12 }, paver: { lengthIn: 8, widthIn: 4 } },
  site: { setbackFt: 30 },
};

function errorsFor(body: unknown) {
  const result = planRequestSchema.safeParse(body);
  if (result.success) throw new Error("expected the body to be refused");
  return formatPlanErrors(result.error);
}

const paths = (body: unknown) => errorsFor(body).map((e) => e.path);

test("a complete inline request is accepted as it is", () => {
  const result = planRequestSchema.safeParse(VALID);
  expect(result.success).toBe(true);
  expect(result.data).toEqual(VALID);
});

test("a bowl target with its fit is accepted, and so is a plan without caps, liner or patio", () => {
  const body = { ring: { bowlDiameterIn: 36, fit: "at-least" }, wallUnit: VALID.wallUnit, courses: 3, cap: null };
  expect(planRequestSchema.parse(body)).toEqual(body);
});

test("negative sizes are refused naming the field and the allowed range", () => {
  expect(errorsFor({ ...VALID, cap: { ...VALID.cap, depthIn: -1 } })).toEqual([
    { path: "cap.depthIn", message: "Cap depth must be between 4 and 36 in." },
  ]);
  expect(paths({ ...VALID, wallUnit: { ...VALID.wallUnit, heightIn: -4 } })).toEqual(["wallUnit.heightIn"]);
});

test("numbers sent as strings are refused, never coerced", () => {
  expect(errorsFor({ ...VALID, courses: "3" })).toEqual([{ path: "courses", message: "Courses must be a number." }]);
  expect(errorsFor({ ...VALID, wallUnit: { ...VALID.wallUnit, faceIn: "12" } })).toEqual([
    { path: "wallUnit.faceIn", message: "Face length must be a number of inches." },
  ]);
  expect(paths({ ...VALID, patio: { ...VALID.patio, paver: { lengthIn: "8", widthIn: 4 } } })).toEqual([
    "patio.paver.lengthIn",
  ]);
});

test("huge and non-finite numbers are refused", () => {
  expect(errorsFor({ ...VALID, wallUnit: { ...VALID.wallUnit, faceIn: 1e308 } })[0]).toEqual({
    path: "wallUnit.faceIn",
    message: "Face length must be between 2 and 36 in.",
  });
  expect(paths({ ...VALID, patio: { ...VALID.patio, outsideRadiusIn: 601 } })).toEqual(["patio.outsideRadiusIn"]);
  expect(paths({ ...VALID, courses: Number.POSITIVE_INFINITY })).toEqual(["courses"]);
  expect(paths({ ...VALID, jointIn: Number.NaN })).toEqual(["jointIn"]);
  expect(paths({ ...VALID, site: { setbackFt: 501 } })).toEqual(["site.setbackFt"]);
});

test("whole-number fields refuse fractions: courses 1–12, units per course 3–200", () => {
  expect(errorsFor({ ...VALID, courses: 2.5 })).toEqual([
    { path: "courses", message: "Courses must be a whole number from 1 to 12." },
  ]);
  expect(errorsFor({ ...VALID, ring: { unitCount: 201 } })).toEqual([
    { path: "ring.unitCount", message: "Units per course must be a whole number from 3 to 200." },
  ]);
});

test("a back longer than the face is refused on wallUnit.backIn", () => {
  expect(errorsFor({ ...VALID, wallUnit: { ...VALID.wallUnit, backIn: 13 } })).toEqual([
    {
      path: "wallUnit.backIn",
      message: "Back length must not be longer than the face length: the narrow end faces the fire.",
    },
  ]);
});

test("unknown keys are refused one by one, at any depth", () => {
  expect(errorsFor({ ...VALID, foo: 1, wallUnit: { ...VALID.wallUnit, colour: "red" } })).toEqual([
    { path: "wallUnit.colour", message: 'Unknown field "colour".' },
    { path: "foo", message: 'Unknown field "foo".' },
  ]);
  const proto = JSON.parse('{"__proto__": {"admin": true}}');
  expect(paths({ ...VALID, ...proto })).toEqual(["__proto__"]);
});

test("missing fields are named", () => {
  expect(errorsFor({ ring: { unitCount: 14 } })).toEqual([
    { path: "wallUnit", message: "Wall unit is required." },
    { path: "courses", message: "Courses is required." },
    { path: "cap", message: "Cap is required: give the cap blank, a catalog id, or null for no caps." },
  ]);
  expect(paths({ ...VALID, liner: { kind: "steel-ring", outsideDiameterIn: 36 } })).toEqual(["liner.heightIn"]);
  expect(errorsFor({ ...VALID, ring: { bowlDiameterIn: 36 } })).toEqual([
    { path: "ring.fit", message: "Ring fit must be at-least, nearest or exact. It is required with bowlDiameterIn." },
  ]);
  expect(paths({ ...VALID, ring: {} })).toEqual(["ring"]);
  expect(paths({ ...VALID, ring: { unitCount: 14, bowlDiameterIn: 36, fit: "exact" } })).toEqual(["ring"]);
});

test("a body that is not an object is refused at the root", () => {
  for (const body of ["hello", null, 42, [VALID]]) expect(paths(body)).toEqual([""]);
});

test("catalog ids need a company; with one they are accepted", () => {
  const byId = { ...VALID, wallUnit: { id: 3 }, cap: { id: 7, innerOverhangIn: 2 }, liner: { id: 9 } };
  expect(errorsFor(byId)).toEqual([
    { path: "company", message: "Company is required when a part is given by catalog id (wallUnit, cap, liner)." },
  ]);
  const parsed = planRequestSchema.parse({ ...byId, company: "stone-and-flame" });
  expect(isCatalogRef(parsed.wallUnit)).toBe(true);
  expect(parsed.cap).toEqual({ id: 7, innerOverhangIn: 2 });
});

test("a catalog reference takes no inline sizes and a positive whole id", () => {
  expect(paths({ ...VALID, company: "acme", wallUnit: { id: 3, faceIn: 12 } })).toEqual(["wallUnit.faceIn"]);
  expect(paths({ ...VALID, company: "acme", wallUnit: { id: -3 } })).toEqual(["wallUnit.id"]);
  expect(paths({ ...VALID, company: "acme", patio: { ...VALID.patio, border: { id: 1.5 } } })).toEqual([
    "patio.border.id",
  ]);
});

test("the company is a lowercase kebab-case slug", () => {
  expect(paths({ ...VALID, company: "Stone And Flame" })).toEqual(["company"]);
  expect(planRequestSchema.safeParse({ ...VALID, company: "stone-and-flame-2" }).success).toBe(true);
});

test("an unknown liner kind is refused on liner.kind", () => {
  expect(errorsFor({ ...VALID, liner: { kind: "gas" } })).toEqual([
    { path: "liner.kind", message: "Liner kind must be none, steel-ring or firebrick." },
  ]);
});

test("random hostile bodies never crash the schema: each is accepted or refused with named fields (property)", () => {
  fc.assert(
    fc.property(
      fc.oneof(
        fc.jsonValue(),
        fc.record({ ring: fc.jsonValue(), wallUnit: fc.jsonValue(), courses: fc.jsonValue(), cap: fc.jsonValue() }),
      ),
      (body) => {
        const result = planRequestSchema.safeParse(body);
        if (!result.success) {
          const errors = formatPlanErrors(result.error);
          expect(errors.length).toBeGreaterThan(0);
          for (const e of errors) {
            expect(typeof e.path).toBe("string");
            expect(e.message.length).toBeGreaterThan(0);
          }
        }
      },
    ),
  );
});

const inchesIn = (min: number, max: number) => fc.double({ min, max, noNaN: true });

test("every inline request the schema accepts is planned or refused with a PlanGeometryError, never another error (property)", () => {
  const request = fc.record({
    ring: fc.oneof(
      fc.record({ unitCount: fc.integer({ min: 3, max: 200 }) }),
      fc.record({ bowlDiameterIn: inchesIn(12, 120), fit: fc.constantFrom("at-least", "nearest", "exact") }),
    ),
    wallUnit: fc
      .record({
        faceIn: inchesIn(2, 36),
        share: fc.double({ min: 0.06, max: 1, noNaN: true }),
        depthIn: inchesIn(2, 24),
        heightIn: inchesIn(1, 12),
      })
      .map(({ share, ...u }) => ({ ...u, backIn: Math.max(2, u.faceIn * share) }))
      .filter((u) => u.backIn <= u.faceIn),
    courses: fc.integer({ min: 1, max: 12 }),
    cap: fc.option(
      fc.record({
        lengthIn: inchesIn(4, 48),
        depthIn: inchesIn(4, 36),
        thicknessIn: inchesIn(0.5, 8),
        innerOverhangIn: inchesIn(0, 6),
      }),
      { nil: null },
    ),
    jointIn: inchesIn(0, 0.75),
    liner: fc.constantFrom(
      { kind: "none" },
      { kind: "steel-ring", outsideDiameterIn: 36, heightIn: 10 },
      { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5 },
    ),
    patio: fc.option(
      fc.record({
        outsideRadiusIn: inchesIn(24, 600),
        border: fc.record({ widthIn: inchesIn(2, 36), lengthIn: inchesIn(2, 36) }),
        paver: fc.record({ lengthIn: inchesIn(2, 36), widthIn: inchesIn(2, 36) }),
      }),
      { nil: null },
    ),
  });
  fc.assert(
    fc.property(request, (body) => {
      const parsed = planRequestSchema.safeParse(body);
      if (!parsed.success) return;
      try {
        const plan = computePlan(parsed.data as PlanInput);
        expect(Number.isFinite(plan.ring.bowlDiameterIn)).toBe(true);
        for (const line of plan.materials) expect(Number.isFinite(line.quantity)).toBe(true);
      } catch (error) {
        expect(error).toBeInstanceOf(PlanGeometryError);
      }
    }),
    { numRuns: 300 },
  );
});
