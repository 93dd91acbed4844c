import { RouterContextProvider } from "react-router";
import { expect, test } from "vitest";
import { healthWithHeaders } from "~/lib/platform/health.server";
import { newNonce, securityMiddleware } from "~/lib/platform/security.server";
import { loader as healthLoader } from "~/routes/api/health";

// CSP Level 3, "nonce-source": a nonce should be at least 128 bits from a cryptographically secure
// source and unique per response (https://www.w3.org/TR/CSP3/#security-nonces).
test("nonces are 16 random bytes, base64, never repeated, also across refills of the random buffer", () => {
  const seen = new Set<string>();
  for (let i = 0; i < 2_000; i++) {
    const nonce = newNonce();
    expect(Buffer.from(nonce, "base64")).toHaveLength(16);
    expect(nonce).toMatch(/^[A-Za-z0-9+/]{22}==$/);
    seen.add(nonce);
  }
  // 2,000 draws of 128 bits: a repeat would mean reused bytes, not chance (birthday bound ~2^-107).
  expect(seen.size).toBe(2_000);
});

async function throughRouter(cookie?: string): Promise<Response> {
  const request = new Request("http://localhost/api/health", { headers: cookie ? { Cookie: cookie } : {} });
  return (await securityMiddleware(
    { request, context: new RouterContextProvider(), params: {}, unstable_pattern: "" } as never,
    async () => (await healthLoader()) as Response,
  )) as Response;
}

const shape = (response: Response) => {
  const headers = Object.fromEntries(response.headers);
  // The nonce differs per answer by design; everything else must match.
  headers["content-security-policy"] = headers["content-security-policy"]!.replace(/'nonce-[^']+'/, "'nonce-…'");
  return { status: response.status, headers };
};

test("the server's own /api/health answer has the route's status, JSON and headers", async () => {
  for (const cookie of [undefined, "ew_session=abc"]) {
    const early = await healthWithHeaders(cookie);
    const routed = await throughRouter(cookie);
    expect(shape(early)).toEqual(shape(routed));
    expect(await early.json()).toEqual({ ok: true, db: true });
    expect(await routed.json()).toEqual({ ok: true, db: true });
  }
  expect((await healthWithHeaders("ew_session=abc")).headers.get("Cache-Control")).toBe("private, no-store");
  expect((await healthWithHeaders(undefined)).headers.get("Cache-Control")).toBe("no-store");
});
