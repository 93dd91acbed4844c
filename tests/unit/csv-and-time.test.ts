import { expect, test } from "vitest";
import { escapeCsvField, toCsv } from "~/lib/format/csv";
import { describeAge, nextDay, startOfZonedDay, zonedDay } from "~/lib/format/zoned-time";

test("a CSV field with a comma, a quote or a line break is quoted with its quotes doubled (RFC 4180 §2.6–2.7)", () => {
  expect(escapeCsvField("plain")).toBe("plain");
  expect(escapeCsvField("Smith, Jo")).toBe('"Smith, Jo"');
  expect(escapeCsvField('the "big" one')).toBe('"the ""big"" one"');
  expect(escapeCsvField("two\nlines")).toBe('"two\nlines"');
  expect(escapeCsvField(null)).toBe("");
  expect(escapeCsvField(12.5)).toBe("12.5");
});

test("text starting with = + - @, a tab or a CR gets a leading quote so spreadsheets keep it as text (OWASP, CSV Injection)", () => {
  for (const start of ["=", "+", "-", "@", "\t", "\r"]) {
    expect(escapeCsvField(`${start}SUM(A1)`).replace(/^"/, "")).toMatch(/^'/);
  }
  expect(escapeCsvField("=1+2")).toBe("'=1+2");
  expect(escapeCsvField("a=b")).toBe("a=b");
  // Numbers we write ourselves are data, not formulas.
  expect(escapeCsvField(-5)).toBe("-5");
});

test("a CSV document ends every record, header included, with CRLF (RFC 4180 §2.1)", () => {
  expect(toCsv(["a", "b"], [["1", "x,y"]])).toBe('a,b\r\n1,"x,y"\r\n');
});

test("local midnight in Chicago is 05:00 UTC in summer and 06:00 UTC in winter (IANA tz database: CDT UTC−5, CST UTC−6)", () => {
  expect(startOfZonedDay("2026-07-01", "America/Chicago")).toBe("2026-07-01T05:00:00.000Z");
  expect(startOfZonedDay("2026-12-02", "America/Chicago")).toBe("2026-12-02T06:00:00.000Z");
  // 8 March 2026 is the day clocks go forward in the US: midnight is still CST.
  expect(startOfZonedDay("2026-03-08", "America/Chicago")).toBe("2026-03-08T06:00:00.000Z");
  expect(startOfZonedDay("2026-03-09", "America/Chicago")).toBe("2026-03-09T05:00:00.000Z");
  expect(startOfZonedDay("2026-12-02", "America/Denver")).toBe("2026-12-02T07:00:00.000Z");
});

test("the day after the last of a month or a year rolls over", () => {
  expect(nextDay("2026-02-28")).toBe("2026-03-01");
  expect(nextDay("2026-12-31")).toBe("2027-01-01");
  expect(nextDay("2028-02-28")).toBe("2028-02-29");
});

test("an instant's local day in the company's zone can differ from its UTC day", () => {
  expect(zonedDay(new Date("2026-12-02T03:00:00Z"), "America/Chicago")).toBe("2026-12-01");
  expect(zonedDay(new Date("2026-12-02T03:00:00Z"), "UTC")).toBe("2026-12-02");
});

test("ages read in the largest whole unit", () => {
  const now = new Date("2026-12-02T12:00:00Z");
  expect(describeAge("2026-12-02T11:59:40Z", now)).toBe("just now");
  expect(describeAge("2026-12-02T11:48:00Z", now)).toBe("12 min");
  expect(describeAge("2026-12-02T07:00:00Z", now)).toBe("5 h");
  expect(describeAge("2026-11-29T12:00:00Z", now)).toBe("3 d");
  expect(describeAge("2026-10-14T12:00:00Z", now)).toBe("7 wk");
});
