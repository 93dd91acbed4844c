// @vitest-environment happy-dom
import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, expect, test } from "vitest";
import { PitPlanSvg } from "~/components/pit-plan-svg";
import { formatLength } from "~/domain/units";
import { planRing } from "~/domain/ring";
import type { PitSceneInput } from "~/domain/pit-layout";

afterEach(cleanup);

// 14 units of 12/8/8: a 36.575 in (36 9/16 in) bowl, 52.575 in outside (derived here from the
// regular-polygon formulas; see the ring tests).
const ring = planRing({
  target: { unitCount: 14 },
  wallUnit: { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4 },
  courses: 3,
});
const INPUT: PitSceneInput = {
  wallUnit: { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4, colourHex: "#978873" },
  ring: {
    unitCount: 14,
    courses: 3,
    edgeDistanceIn: ring.edgeDistanceIn,
    runningBondDeg: ring.runningBondDeg,
    closure: null,
  },
  caps: {
    count: 12,
    innerWidthIn: 8.38,
    outerWidthIn: 14.811,
    innerEdgeDistanceIn: ring.edgeDistanceIn - 2,
    outerEdgeDistanceIn: ring.edgeDistanceIn + 10,
    thicknessIn: 2.5,
    colourHex: "#d6c9b7",
  },
  liner: { kind: "steel-ring", outsideDiameterIn: 36, heightIn: 10 },
  patio: null,
  basePadRadiusIn: ring.outsideCornerRadiusIn + 6,
};
// A 7 ft patio of 6 × 12 in border units; the counts are the engine's for this ring (app/domain/patio.ts).
const PATIO = {
  outsideRadiusIn: 84,
  borderWidthIn: 6,
  borderInnerEdgeDistanceIn: 78,
  borderWholeCount: 40,
  borderClosureCount: 1,
  borderUnitAngleDeg: (2 * Math.atan(12 / (2 * 78)) * 180) / Math.PI,
  borderUnitLengthIn: 12,
  lastBorderUnitLengthIn: 2 * 78 * Math.tan((2 * Math.PI - 40 * 2 * Math.atan(12 / 156)) / 2),
  borderColourHex: "#8c7f70",
  fieldColourHex: "#c9bca9",
};

const inches = (n: number) => formatLength(n, "in");

test("the plan renders as one labelled image whose name gives the 36 9/16 in bowl and 52 9/16 in outside diameter", () => {
  render(<PitPlanSvg input={INPUT} unit="in" formatLength={inches} />);
  const figure = screen.getByRole("img");
  expect(figure.getAttribute("aria-label")).toContain("bowl diameter 36 9/16 in");
  expect(figure.getAttribute("aria-label")).toContain("outside diameter 52 9/16 in");
  expect(figure.querySelector("title")?.textContent).toBe("Fire pit plan");
  expect(figure.getAttribute("viewBox")).toMatch(/^-?[\d.]+ -?[\d.]+ [\d.]+ [\d.]+$/);
  expect(figure.getAttribute("width")).toBe("100%");
});

test("the bowl and outside diameters are printed on their dimension lines", () => {
  render(<PitPlanSvg input={INPUT} unit="in" formatLength={inches} />);
  expect(screen.getByText("Bowl 36 9/16 in")).toBeTruthy();
  expect(screen.getByText("Outside 52 9/16 in")).toBeTruthy();
});

test("14 wall units and 12 caps are drawn as outlines", () => {
  const { container } = render(<PitPlanSvg input={INPUT} unit="in" formatLength={inches} />);
  // Wall units are ink-stroked paths filled with the unit colour; caps carry a lighter fill.
  expect(container.querySelectorAll('path[fill="#978873"]')).toHaveLength(14);
  expect(container.querySelectorAll('path[fill="#d6c9b7"]')).toHaveLength(12);
});

test("with a patio, its outside radius and field radius are labelled, and the label names the patio radius", () => {
  render(<PitPlanSvg input={{ ...INPUT, patio: PATIO }} unit="in" formatLength={inches} />);
  expect(screen.getByText("Patio R 84 in")).toBeTruthy();
  expect(screen.getByText("Field R 78 in")).toBeTruthy();
  expect(screen.getByRole("img").getAttribute("aria-label")).toContain("patio radius 84 in");
});

test("without a patio, no patio radius is shown", () => {
  render(<PitPlanSvg input={INPUT} unit="in" formatLength={inches} />);
  expect(screen.queryByText(/Patio R/)).toBeNull();
});

test("in millimetres the labels use the app's formatter: a 36.575 in bowl is 929 mm (1 in = 25.4 mm, NIST SP 811)", () => {
  render(<PitPlanSvg input={INPUT} unit="mm" formatLength={(n) => formatLength(n, "mm")} />);
  expect(screen.getByRole("img", { name: /bowl diameter 929 mm/ })).toBeTruthy();
});

test("without a formatter the plan falls back to the chosen unit", () => {
  render(<PitPlanSvg input={INPUT} unit="mm" />);
  expect(screen.getByText("Bowl 929 mm")).toBeTruthy();
});
