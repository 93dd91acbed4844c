import { expect, test } from "vitest";
import { listCautions } from "~/domain/advice";
import { computePlan } from "~/domain/plan";
import { TYPICAL_PIT } from "./fixtures";

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
  expect(codes(computePlan({ ...TYPICAL_PIT, ring: { unitCount: 11 }, liner: { kind: "none" } }).warnings)).toContain("bowl-small");
  expect(codes(computePlan({ ...TYPICAL_PIT, ring: { unitCount: 18 }, liner: { kind: "none" } }).warnings)).toContain("bowl-large");
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
  expect(codes(listCautions({ linerKind: "steel-ring", requiredSetbackFt: 25, siteSetbackFt: 26 }))).not.toContain("setback-too-close");
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
