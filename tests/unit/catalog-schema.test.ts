import { expect, test } from "vitest";
import { parseCatalogForm } from "~/lib/catalog/catalog-schema";
import Fraction from "fraction.js";

function form(fields: Record<string, string>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
}

const GOOD_WALL_UNIT = {
  kind: "wall-unit",
  name: "Test Taper",
  colourName: "Grey",
  colourHex: "#777777",
  faceIn: "12",
  backIn: "8",
  depthIn: "8",
  heightIn: "4",
  price: "4.85",
  isActive: "on",
};

test("a valid wall unit parses, with the price in integer cents", () => {
  const result = parseCatalogForm(form(GOOD_WALL_UNIT));
  expect(result).toMatchObject({
    ok: true,
    value: { faceIn: 12, backIn: 8, priceCents: 485, lengthIn: null, isActive: true },
  });
});

test.each([
  // The millimetre bounds are the inch bounds × 25.4 exactly (NIST SP 811), rounded to whole mm.
  ["faceIn", "-3", "Face length must be between 2 and 36 in (51–914 mm)."],
  ["depthIn", "0", "Depth must be between 2 and 24 in (51–610 mm)."],
  ["heightIn", "abc", "Height must be a length, like 12 1/4, 12-1/4, 49/4, 12.25 or 311 mm."],
  ["heightIn", "3 17/16", "Height must be a length, like 12 1/4, 12-1/4, 49/4, 12.25 or 311 mm."],
  ["faceIn", "1000 mm", "Face length must be between 2 and 36 in (51–914 mm)."],
  ["heightIn", "", "Enter the height."],
  ["price", "-1", "Cost must be between 0 and 100000 dollars."],
  ["name", "x", "Name must be 2 to 80 characters."],
  ["colourHex", "red", "Colour must be a hex value like #8a8178."],
])("a bad %s (%s) is refused with a message naming the field", (field, value, message) => {
  const result = parseCatalogForm(form({ ...GOOD_WALL_UNIT, [field]: value }));
  expect(result.ok).toBe(false);
  if (!result.ok) expect(result.errors[field]).toBe(message);
});

test("a wall unit whose back is longer than its face is refused on the back length", () => {
  const result = parseCatalogForm(form({ ...GOOD_WALL_UNIT, backIn: "13" }));
  expect(result.ok).toBe(false);
  if (!result.ok) expect(result.errors.backIn).toMatch(/must not be longer than the face \(12 in\)/);
});

test("a cap needs its own dimensions, not a wall unit's", () => {
  const result = parseCatalogForm(form({ kind: "cap", name: "Cap 16", price: "9.50", lengthIn: "16", depthIn: "12" }));
  expect(result.ok).toBe(false);
  if (!result.ok) expect(Object.keys(result.errors)).toEqual(["thicknessIn"]);
});

test("an unknown kind is refused", () => {
  const result = parseCatalogForm(form({ ...GOOD_WALL_UNIT, kind: "brick-oven" }));
  expect(result.ok).toBe(false);
  if (!result.ok) expect(result.errors.kind).toBe("Choose what kind of item this is.");
});

test("sizes typed as tape readings, improper fractions or millimetres are stored in inches (fraction.js as the reference; 25.4 mm per inch, NIST SP 811)", () => {
  const result = parseCatalogForm(
    form({ ...GOOD_WALL_UNIT, faceIn: "311 mm", backIn: "7-1/2", depthIn: "49/8", heightIn: "3 1/2" }),
  );
  expect(result.ok).toBe(true);
  if (!result.ok) return;
  expect(result.value.faceIn).toBeCloseTo(311 / 25.4, 12); // 12.244 in
  expect(result.value.backIn).toBe(new Fraction("7 1/2").valueOf());
  expect(result.value.depthIn).toBe(new Fraction(49, 8).valueOf()); // 6.125
  expect(result.value.heightIn).toBe(3.5);
});

test("a length at the very top of its range is accepted however it is typed (36 in = 914.4 mm)", () => {
  const result = parseCatalogForm(form({ ...GOOD_WALL_UNIT, faceIn: "914.4 mm", backIn: "36" }));
  expect(result.ok).toBe(true);
});
