import { expect, test } from "vitest";
import { displayName, mailboxAddress, senderHeaders } from "~/lib/platform/email-headers";
import { parseMailbox } from "../../fakes/email/validate";

const SENDING = "Emberwright <requests@emberwright.test>";
const company = { name: "Cinder & Slate Outdoor Works", email: "office@cinder-slate.test" };

test("a homeowner's mail comes from the company's name on the product's sending address, and replies go to the company", () => {
  const headers = senderHeaders({ sendingFrom: SENDING, company, to: "juno@example.test" });
  // RFC 5322 3.2.3: "&" is atext, so these words need no quoting.
  expect(headers).toEqual({
    from: "Cinder & Slate Outdoor Works <requests@emberwright.test>",
    replyTo: "office@cinder-slate.test",
  });
  // Read back by the mail service stand-in's own address parser: the name and address come apart as sent.
  expect(parseMailbox(headers.from)).toEqual({
    name: "Cinder & Slate Outdoor Works",
    address: "requests@emberwright.test",
  });
});

test("the office's own copy carries the company's name but no Reply-To pointing at itself", () => {
  expect(senderHeaders({ sendingFrom: SENDING, company, to: "Office@Cinder-Slate.test" })).toEqual({
    from: "Cinder & Slate Outdoor Works <requests@emberwright.test>",
  });
});

test("mail not about a company keeps the sending setting as it is", () => {
  expect(senderHeaders({ sendingFrom: SENDING, company: null, to: "juno@example.test" })).toEqual({ from: SENDING });
  expect(mailboxAddress("requests@emberwright.test")).toBe("requests@emberwright.test");
});

test("names with specials become one quoted-string, with backslash and quote escaped (RFC 5322 3.2.4)", () => {
  // "," "." and "(" are specials (RFC 5322 3.2.3), not atext: unquoted they would split or comment the name.
  expect(displayName("Hearth, Stone & Co.")).toBe('"Hearth, Stone & Co."');
  expect(displayName('Dana "Flint" Works')).toBe('"Dana \\"Flint\\" Works"');
  expect(displayName("Back\\slash (Pits)")).toBe('"Back\\\\slash (Pits)"');
  const from = senderHeaders({
    sendingFrom: SENDING,
    company: { ...company, name: "Hearth, Stone & Co." },
    to: "a@example.test",
  }).from;
  expect(from).toBe('"Hearth, Stone & Co." <requests@emberwright.test>');
  expect(parseMailbox(from)?.name).toBe("Hearth, Stone & Co.");
});

test("a company name cannot add a header line or a second address", () => {
  const from = senderHeaders({
    sendingFrom: SENDING,
    company: { ...company, name: "Evil\r\nBcc: victim@example.test <x@y.test>" },
    to: "a@example.test",
  }).from;
  expect(from).not.toMatch(/[\r\n]/);
  // One mailbox only: the address part is still the product's sending address.
  expect(parseMailbox(from)?.address).toBe("requests@emberwright.test");
  expect(from.match(/</g)).toHaveLength(1);
});

test("non-ASCII names are kept for the service to encode (RFC 2047 is its job on the wire)", () => {
  expect(displayName("Jäger Steinbau")).toBe('"Jäger Steinbau"');
  expect(displayName("   ")).toBe("");
  expect(senderHeaders({ sendingFrom: SENDING, company: { ...company, name: " " }, to: "a@example.test" }).from).toBe(
    "requests@emberwright.test",
  );
});
