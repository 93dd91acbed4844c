import { expect, test } from "vitest";
import { leadFormSchema } from "~/lib/leads/lead-schema";
import { formatPhone } from "~/lib/format/phone";

// Reference: ITU-T E.164 (a "+", the country code, then the national number) and the NANP plan
// (area code, exchange, line; 555-0100 to 555-0199 are set aside for fiction). libphonenumber-js,
// a port of Google's libphonenumber, holds the numbering plans.
const FORM = {
  customerName: "Ines Calloway",
  email: "ines.calloway@example.test",
  street: "4 Cobble Row",
  town: "Millbrook Falls",
  buildWindow: "not-sure",
  consent: "on",
};

const phoneOf = (phone: string) => leadFormSchema.safeParse({ ...FORM, phone });

test("a North American number typed any common way is stored in E.164", () => {
  for (const typed of ["(970) 555-0123", "970.555.0123", "970 555 0123", "+1 970-555-0123", "1 970 555 0123"]) {
    const parsed = phoneOf(typed);
    expect(parsed.success, typed).toBe(true);
    expect(parsed.data?.phone, typed).toBe("+19705550123");
  }
});

test("a number from another country keeps its country code", () => {
  // +44 20 7946 0958: a London number from Ofcom's range set aside for drama (020 7946 0000–0999).
  expect(phoneOf("+44 20 7946 0958").data?.phone).toBe("+442079460958");
});

test("words, too few digits and an area code that does not exist are refused with a message naming the field", () => {
  for (const typed of ["call me", "555 0123", "", "(055) 555-0123", "+1 970 555 01234567"]) {
    const parsed = phoneOf(typed);
    expect(parsed.success, typed).toBe(false);
    const issue = parsed.error?.issues.find((i) => i.path[0] === "phone");
    expect(issue?.message, typed).toMatch(/phone number with its area code/);
  }
});

test("a stored number is shown the way people write it", () => {
  expect(formatPhone("+19705550123")).toBe("(970) 555-0123");
  expect(formatPhone("+442079460958")).toBe("+44 20 7946 0958");
});

test("every phone number in the demo data is a valid number in E.164, in the 555-01xx range set aside for fiction", async () => {
  const { isValidPhoneNumber } = await import("libphonenumber-js/max");
  const { DEMO_COMPANIES, DEMO_LEADS } = await import("../../scripts/seed-data");
  const numbers = [
    ...DEMO_COMPANIES.flatMap((c) => [c.phone, ...c.suppliers.map((s) => s.phone)]),
    ...Object.values(DEMO_LEADS).flatMap((leads) => leads.map((l) => l.phone)),
  ];
  expect(numbers.length).toBeGreaterThan(20);
  for (const n of numbers) {
    expect(n, n).toMatch(/^\+1\d{3}5550[1]\d{2}$/);
    expect(isValidPhoneNumber(n), n).toBe(true);
    // Shown formatted, not as stored.
    expect(formatPhone(n)).toMatch(/^\(\d{3}\) 555-01\d{2}$/);
  }
});
