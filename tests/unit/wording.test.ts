import { expect, test } from "vitest";
import { possessive } from "~/lib/format/wording";

// Names ending in s take the apostrophe alone (common house-style practice, e.g. "the Joneses'"; no single source).
test("a name ending in s takes the apostrophe alone", () => {
  expect(possessive("Cinder & Slate Outdoor Works")).toBe("Cinder & Slate Outdoor Works'");
  expect(possessive("Silas Marrowby")).toBe("Silas Marrowby's");
  expect(possessive("Juno Marsh")).toBe("Juno Marsh's");
  expect(possessive("Ilse Marchetti ")).toBe("Ilse Marchetti's");
});

test("the e-mail to an address already in use names the company's workspace with the apostrophe alone", async () => {
  const { render } = await import("@react-email/components");
  const { StaffInviteAddressInUseEmail } = await import("~/emails/staff-invite");
  const text = await render(
    StaffInviteAddressInUseEmail({
      companyName: "Cinder & Slate Outdoor Works",
      name: "Juno Marsh",
      invitedBy: "Silas Marrowby",
    }),
    { plainText: true },
  );
  expect(text).toContain("Cinder & Slate Outdoor Works' Emberwright workspace");
  expect(text).not.toContain("Works's");
});
