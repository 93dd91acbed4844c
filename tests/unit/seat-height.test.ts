import { expect, test } from "vitest";
import { describeSeat } from "~/lib/design/design-plan";

// Common practice, no source: chair seats and seat walls stand about 18–20 in; a footrest from a chair
// is lower (about 10–16 in); above about 24 in a wall is too tall to sit on.

test("a 33 in wall is too tall to sit on, not a footrest", () => {
  expect(describeSeat(33)).toMatch(/too tall to sit on/);
  expect(describeSeat(33)).not.toMatch(/feet/);
});

test("18 to 20 in is seat height", () => {
  for (const h of [18, 19, 20]) expect(describeSeat(h)).toMatch(/seat height/);
});

test("12 to 15 in is for resting feet on from a chair", () => {
  for (const h of [12, 14, 15.5]) expect(describeSeat(h)).toMatch(/resting feet/);
});

test("a 22 in wall is a high seat, and under 10 in is too low to sit on", () => {
  expect(describeSeat(22)).toMatch(/high seat/);
  expect(describeSeat(8)).toMatch(/too low to sit on/);
});
