// @vitest-environment happy-dom
import { cleanup, render, screen } from "@testing-library/react";
import { renderToString } from "react-dom/server";
import { afterEach, expect, test } from "vitest";
import { PitPreview } from "~/components/pit-preview";
import { formatLength } from "~/domain/units";
import type { PitSceneInput } from "~/domain/pit-layout";

afterEach(() => {
  cleanup();
  window.history.replaceState(null, "", "/");
});

// 14 units of 12/8/8 at a = 18.288 in: a 36 9/16 in bowl (see the ring tests).
const INPUT: PitSceneInput = {
  wallUnit: { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4, colourHex: "#978873" },
  ring: { unitCount: 14, courses: 3, edgeDistanceIn: 18.2877, runningBondDeg: 180 / 14, closure: null },
  caps: null,
  liner: { kind: "none" },
  patio: null,
  basePadRadiusIn: 38.7,
};

const preview = () => (
  <PitPreview
    input={INPUT}
    caption="14 units a course, 3 courses"
    unit="in"
    formatLength={(n) => formatLength(n, "in")}
  />
);

test("on the server the preview is the plan drawing with its caption: no canvas, no 3D code", () => {
  const html = renderToString(preview());
  expect(html).toContain('role="img"');
  expect(html).toContain("Bowl 36 9/16 in");
  expect(html).toContain("14 units a course, 3 courses");
  expect(html).not.toContain("<canvas");
});

test("without WebGL (happy-dom has none) the plan stays, with a short note, and the 3D toggle is off", async () => {
  render(preview());
  // The browser is asked in its first idle moment, not while the page hydrates.
  expect(await screen.findByText("3D preview unavailable on this device; showing the plan")).toBeTruthy();
  expect(screen.getByRole("img", { name: /bowl diameter 36 9\/16 in/ })).toBeTruthy();
  expect(screen.getByRole("button", { name: "3D view" }).hasAttribute("disabled")).toBe(true);
  expect(screen.getByRole("button", { name: "Plan view" }).getAttribute("aria-pressed")).toBe("true");
  expect(screen.getByRole("button", { name: "Reset view" }).hasAttribute("disabled")).toBe(true);
});

test("?preview=2d forces the plan without the 'unavailable' note", () => {
  window.history.replaceState(null, "", "/c/cinder-slate?preview=2d");
  render(preview());
  expect(screen.queryByText(/3D preview unavailable/)).toBeNull();
  expect(screen.getByRole("img", { name: /bowl diameter/ })).toBeTruthy();
  expect(screen.getByRole("button", { name: "Plan view" }).getAttribute("aria-pressed")).toBe("true");
  expect(screen.getByText("14 units a course, 3 courses")).toBeTruthy();
});
