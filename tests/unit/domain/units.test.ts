import fc from "fast-check";
import Fraction from "fraction.js";
import { expect, test } from "vitest";
import {
  IN_TO_MM,
  formatInches,
  formatLength,
  formatLengthInput,
  formatMm,
  inToMm,
  mmToIn,
  parseLength,
} from "~/domain/units";

test("one inch is exactly 25.4 mm (NIST SP 811, appendix B)", () => {
  expect(IN_TO_MM).toBe(25.4);
  expect(inToMm(1)).toBe(25.4);
  expect(mmToIn(25.4)).toBe(1);
});

test("25 ft is 7620 mm (NIST SP 811: 1 ft = 12 in = 304.8 mm)", () => {
  expect(inToMm(25 * 12)).toBeCloseTo(7620, 9);
});

test("a 36.575 in bowl reads 36 9/16 in on a tape (nearest 1/16 in)", () => {
  expect(formatInches(36.575)).toBe("36 9/16 in");
});

test("whole inches print without a fraction", () => {
  expect(formatInches(32)).toBe("32 in");
  expect(formatInches(31.97)).toBe("32 in");
});

test("fractions below one inch print alone and reduce to lowest terms", () => {
  expect(formatInches(0.1875)).toBe("3/16 in");
  expect(formatInches(0.5)).toBe("1/2 in");
  expect(formatInches(12.625)).toBe("12 5/8 in");
});

test("negative lengths keep their sign and tiny values print as zero", () => {
  expect(formatInches(-36.575)).toBe("-36 9/16 in");
  expect(formatInches(-0.01)).toBe("0 in");
  expect(formatMm(-0.01)).toBe("0 mm");
});

test("millimetres print whole: 36.575 in is 929 mm (NIST SP 811 factor)", () => {
  expect(formatMm(36.575)).toBe("929 mm");
  expect(formatLength(36.575, "mm")).toBe("929 mm");
  expect(formatLength(36.575, "in")).toBe("36 9/16 in");
});

test("tape readings parse in every common spelling", () => {
  expect(parseLength("36")).toBe(36);
  expect(parseLength("36.5")).toBe(36.5);
  expect(parseLength("36 9/16")).toBe(36.5625);
  expect(parseLength("36-9/16 in")).toBe(36.5625);
  expect(parseLength('36 9/16"')).toBe(36.5625);
  expect(parseLength("9/16")).toBe(0.5625);
  expect(parseLength("3 ft")).toBe(36);
});

test("metric lengths parse to inches with the exact factor (NIST SP 811)", () => {
  expect(parseLength("930 mm")).toBeCloseTo(930 / 25.4, 12);
  expect(parseLength("93 cm")).toBeCloseTo(930 / 25.4, 12);
  expect(parseLength("0.93 m")).toBeCloseTo(930 / 25.4, 12);
});

test("unreadable lengths parse to null", () => {
  for (const text of ["", "abc", "36 in in", "9/0", "36 17/16", "1/2/3", "36.5 1/2", "--3"]) {
    expect(parseLength(text), text).toBeNull();
  }
});

test("formatting then parsing returns the length rounded to 1/16 in (round trip property)", () => {
  fc.assert(
    fc.property(fc.double({ min: -600, max: 600, noNaN: true }), (lengthIn) => {
      const parsed = parseLength(formatInches(lengthIn));
      expect(parsed).not.toBeNull();
      expect(Math.abs((parsed as number) - lengthIn)).toBeLessThanOrEqual(1 / 32 + 1e-9);
    }),
  );
});

test("millimetre round trip stays within half a millimetre (property)", () => {
  fc.assert(
    fc.property(fc.double({ min: 0, max: 600, noNaN: true }), (lengthIn) => {
      const parsed = parseLength(formatMm(lengthIn)) as number;
      expect(Math.abs(inToMm(parsed) - inToMm(lengthIn))).toBeLessThanOrEqual(0.5 + 1e-9);
    }),
  );
});

test("tape readings written with odd spacing still parse; a whole fraction (16/16) is not a proper fraction (common practice, no source)", () => {
  // As people type them: a stray space at either end, two spaces, spaces around the hyphen or the slash.
  expect(parseLength(" 36 in ")).toBe(36);
  expect(parseLength("36  9/16")).toBe(36.5625);
  expect(parseLength("36 - 9/16")).toBe(36.5625);
  expect(parseLength("36- 9/16")).toBe(36.5625);
  expect(parseLength("36 9 / 16")).toBe(36.5625);
  expect(parseLength("36 11/16")).toBe(36.6875);
  expect(parseLength("15/16")).toBe(0.9375);
  expect(parseLength(".75")).toBe(0.75);
  expect(parseLength(".625 in")).toBe(0.625);
  expect(parseLength("-2 ft")).toBe(-24);
  expect(parseLength("36 16/16")).toBeNull();
});

test("negative millimetres keep their sign (NIST SP 811 factor)", () => {
  expect(formatMm(-36.575)).toBe("-929 mm");
  expect(formatLength(-1, "mm")).toBe("-25 mm");
});

test("every spelling of twelve and a quarter inches parses to fraction.js's value for 49/4", () => {
  const reference = new Fraction(49, 4).valueOf(); // fraction.js, the reference library
  for (const text of ["12 1/4", "12-1/4", "49/4", "12.25", "12 1/4 in", '12 1/4"', "12.25 inches"]) {
    expect(parseLength(text), text).toBe(reference);
  }
});

test("millimetres convert at exactly 25.4 mm per inch (NIST SP 811 B.8): 311 mm is 311/25.4 in and 25.4 mm is one inch", () => {
  expect(parseLength("311 mm")).toBe(new Fraction(311).div(new Fraction("25.4")).valueOf());
  expect(parseLength("311mm")).toBe(parseLength("311 mm"));
  expect(parseLength("25.4 mm")).toBe(1);
  expect(parseLength("304.8 mm")).toBe(12);
});

test("a bare number in a field measured in feet is feet; a typed unit wins (NIST SP 811: 1 ft = 12 in)", () => {
  expect(parseLength("10 1/2", "ft")).toBe(126);
  expect(parseLength("10.5 ft", "ft")).toBe(126);
  expect(parseLength("18 in", "ft")).toBe(18);
  expect(parseLength("3.048 m", "ft")).toBeCloseTo(120, 12);
});

test("a length shown back in a form reads as a tape reading when it falls on a 1/64 in mark, else as a decimal (fraction.js toFraction)", () => {
  expect(formatLengthInput(12.25)).toBe(new Fraction(49, 4).toFraction(true)); // "12 1/4"
  expect(formatLengthInput(0.0625)).toBe("1/16");
  expect(formatLengthInput(36)).toBe("36");
  expect(formatLengthInput(311 / 25.4)).toBe("12.2441");
});

test("a length shown in a form parses back to itself to within 1/10,000 in (round trip property)", () => {
  fc.assert(
    fc.property(fc.double({ min: 0, max: 600, noNaN: true }), (lengthIn) => {
      const parsed = parseLength(formatLengthInput(lengthIn));
      expect(parsed).not.toBeNull();
      expect(Math.abs((parsed as number) - lengthIn)).toBeLessThanOrEqual(0.00005 + 1e-9);
    }),
  );
});
