import { expect, test } from "vitest";
import { contentSecurityPolicy, isCrossOriginWrite } from "~/lib/platform/security.server";

const post = (headers: Record<string, string>, path = "/login") =>
  new Request(`http://localhost:3000${path}`, { method: "POST", headers });

test("a POST from the app's own origin is allowed (ASVS 4.2.2)", () => {
  expect(isCrossOriginWrite(post({ Origin: "http://localhost:3000" }))).toBe(false);
  expect(isCrossOriginWrite(post({ "Sec-Fetch-Site": "same-origin" }))).toBe(false);
});

test("a POST from another origin, or flagged cross-site by the browser, is refused (ASVS 4.2.2)", () => {
  expect(isCrossOriginWrite(post({ Origin: "http://evil.test" }))).toBe(true);
  expect(isCrossOriginWrite(post({ Origin: "null" }))).toBe(true);
  expect(isCrossOriginWrite(post({ "Sec-Fetch-Site": "cross-site" }))).toBe(true);
  expect(isCrossOriginWrite(post({ "Sec-Fetch-Site": "same-site" }))).toBe(true);
});

test("the payment webhook is exempt: its signature is the proof", () => {
  expect(isCrossOriginWrite(post({ Origin: "http://evil.test" }, "/api/webhooks/stripe"))).toBe(false);
});

test("reads are never refused", () => {
  expect(isCrossOriginWrite(new Request("http://localhost:3000/", { headers: { Origin: "http://evil.test" } }))).toBe(
    false,
  );
});

test("the production policy allows scripts only with the request's nonce and forbids framing", () => {
  const csp = contentSecurityPolicy("abc123");
  expect(csp).toContain("frame-ancestors 'none'");
  expect(csp).toMatch(/script-src 'self' 'nonce-abc123'(;|$)/);
  expect(csp).not.toMatch(/script-src[^;]*unsafe-inline/);
});
