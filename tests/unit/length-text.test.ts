import { expect, test } from "vitest";
import { formatAreaFt2, speakLengths, summaryInUnit } from "~/lib/format/length-text";

// 1 in = 25.4 mm exactly and 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959; NIST SP 811 B.8).

test("inches stay as they are when inches are chosen", () => {
  expect(speakLengths("The caps reach 2 1/2 in over the fire.", "in")).toBe("The caps reach 2 1/2 in over the fire.");
});

test("a whole, a mixed and a bare fraction of an inch become whole millimetres", () => {
  expect(speakLengths("The wall stands 33 in with its caps.", "mm")).toBe("The wall stands 838 mm with its caps."); // 33 × 25.4 = 838.2
  expect(speakLengths("A 36 9/16 in bowl.", "mm")).toBe("A 929 mm bowl."); // 36.5625 × 25.4 = 928.69
  expect(speakLengths("open about 1/16 in.", "mm")).toBe("open about 2 mm."); // 1.5875
});

test("a range says the unit once", () => {
  expect(speakLengths("36 to 44 in is usual", "mm")).toBe("914 to 1118 mm is usual"); // 914.4, 1117.6
  expect(speakLengths("Walls of 12 to 18 in are usual", "mm")).toBe("Walls of 305 to 457 mm are usual"); // 304.8, 457.2
});

test("feet become metres to a tenth and square feet become square metres", () => {
  expect(speakLengths("Keep the fire at least 25 ft from buildings; local rules range from 10 to 50 ft.", "mm")).toBe(
    "Keep the fire at least 7.6 m from buildings; local rules range from 3 to 15.2 m.",
  ); // 7.62, 3.048, 15.24
  expect(formatAreaFt2(100, "mm")).toBe("9.3 m²"); // 9.290304
  expect(formatAreaFt2(57.4, "in")).toBe("57 ft²");
});

test("words that merely start with 'in' and counts of things are left alone", () => {
  expect(speakLengths("16 units in each course, 2 inside, 14 units a course", "mm")).toBe(
    "16 units in each course, 2 inside, 14 units a course",
  );
  expect(speakLengths("section §307.4.2 of the code", "mm")).toBe("section §307.4.2 of the code");
});

test("a design summary stored in inches is said in millimetres and metres line by line, and left alone in inches", () => {
  const stored = [
    { label: "Bowl", value: "36 9/16 in across inside, 14 units a course" },
    { label: "Patio", value: "8 ft radius, Flagstone with a Soldier edge" },
    { label: "Site", value: "30 ft to the nearest building" },
  ];
  expect(summaryInUnit(stored, "mm")).toEqual([
    { label: "Bowl", value: "929 mm across inside, 14 units a course" }, // 36.5625 × 25.4 = 928.69
    { label: "Patio", value: "2.4 m radius, Flagstone with a Soldier edge" }, // 8 × 0.3048 = 2.4384
    { label: "Site", value: "9.1 m to the nearest building" }, // 30 × 0.3048 = 9.144
  ]);
  expect(summaryInUnit(stored, "in")).toEqual(stored);
});
