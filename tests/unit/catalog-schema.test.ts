import { expect, test } from "vitest";
import { parseCatalogForm } from "~/lib/catalog/catalog-schema";

function form(fields: Record<string, string>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
}

const GOOD_WALL_UNIT = { kind: "wall-unit", name: "Test Taper", colourName: "Grey", colourHex: "#777777", faceIn: "12", backIn: "8", depthIn: "8", heightIn: "4", price: "4.85", isActive: "on" };

test("a valid wall unit parses, with the price in integer cents", () => {
  const result = parseCatalogForm(form(GOOD_WALL_UNIT));
  expect(result).toMatchObject({ ok: true, value: { faceIn: 12, backIn: 8, priceCents: 485, lengthIn: null, isActive: true } });
});

test.each([
  ["faceIn", "-3", "Face length must be between 2 and 36 in."],
  ["depthIn", "0", "Depth must be between 2 and 24 in."],
  ["heightIn", "abc", "Height must be a number."],
  ["heightIn", "", "Enter the height."],
  ["price", "-1", "Price must be between 0 and 100000 dollars."],
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
