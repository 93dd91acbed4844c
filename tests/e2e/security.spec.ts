import { expect, test, type APIResponse } from "@playwright/test";

function expectSecurityHeaders(response: APIResponse, label: string) {
  const h = response.headers();
  const csp = h["content-security-policy"] ?? "";
  expect(csp, `${label}: CSP`).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+'/);
  expect(csp, `${label}: no inline-script exception`).not.toMatch(/script-src[^;]*'unsafe-inline'/);
  expect(csp, `${label}: framing`).toContain("frame-ancestors 'none'");
  expect(h["x-content-type-options"], `${label}: nosniff`).toBe("nosniff");
  expect(h["referrer-policy"], `${label}: referrer policy`).toBe("strict-origin-when-cross-origin");
}

test("every kind of response carries the security headers: page, data request, resource route, redirect, 404, photo route", async ({ request }) => {
  const cases: [string, string][] = [
    ["page", "/"],
    ["configurator page", "/c/cinder-slate"],
    ["data request", "/c/cinder-slate.data"],
    ["resource route", "/api/health"],
    ["JSON catalog", "/api/catalog/cinder-slate"],
    ["redirect to sign-in", "/app/catalog"],
    ["not found", "/no-such-page"],
    ["photo route", "/photos/999999"],
  ];
  for (const [label, url] of cases) expectSecurityHeaders(await request.get(url, { maxRedirects: 0 }), label);
});

test("the page's scripts carry the same nonce as its policy", async ({ request }) => {
  const response = await request.get("/");
  const nonce = /'nonce-([^']+)'/.exec(response.headers()["content-security-policy"]!)![1];
  const html = await response.text();
  const scriptNonces = [...html.matchAll(/<script[^>]*nonce="([^"]+)"/g)].map((m) => m[1]);
  expect(scriptNonces.length).toBeGreaterThan(0);
  expect(new Set(scriptNonces)).toEqual(new Set([nonce]));
  expect(html).not.toMatch(/<script(?![^>]*nonce=)[^>]*>/);
});

const ACTIONS = ["/login", "/logout", "/c/cinder-slate", "/app/catalog/new", "/app/settings", "/app/schedule", "/app/consult-hours", "/api/plan", "/my", "/welcome/abc"];

for (const url of ACTIONS) {
  test(`a cross-origin POST to ${url} is refused with 403 (ASVS 4.2.2)`, async ({ request }) => {
    const response = await request.post(url, { headers: { Origin: "https://elsewhere.example" }, form: { a: "b" }, maxRedirects: 0 });
    expect(response.status()).toBe(403);
  });
}

test("the webhook is the one exception: a cross-origin POST gets past the origin check and fails on its missing signature (400)", async ({ request }) => {
  const response = await request.post("/api/webhooks/stripe", { headers: { Origin: "https://elsewhere.example" }, data: "{}" });
  expect(response.status()).toBe(400);
});

test("sign-in: the 11th failure within a minute on one account answers 429 with Retry-After", async ({ request, baseURL }) => {
  // An account no other journey fails to sign in to, from an address of its own.
  const email = `owner@north-ridge.test`;
  const statuses: number[] = [];
  let retryAfter: string | undefined;
  for (let i = 0; i < 11; i++) {
    const response = await request.post("/login", { headers: { Origin: baseURL!, "X-Forwarded-For": "198.51.100.7" }, form: { email, password: `wrong-${i}` }, maxRedirects: 0 });
    statuses.push(response.status());
    retryAfter = response.headers()["retry-after"];
  }
  expect(statuses.slice(0, 10)).toEqual(Array(10).fill(401));
  expect(statuses[10]).toBe(429);
  expect(Number(retryAfter)).toBeGreaterThan(0);
});

test("sign-in gives no hint whether an account exists: same status, same words, similar time", async ({ request, baseURL }) => {
  let n = 0;
  const attempt = async (email: string) => {
    const started = performance.now();
    n += 1;
    const headers = { Origin: baseURL!, "X-Forwarded-For": `198.51.100.${100 + n}` };
    const response = await request.post("/login", { headers, form: { email, password: "definitely-wrong" }, maxRedirects: 0 });
    return { ms: performance.now() - started, status: response.status(), text: await response.text() };
  };
  const known: number[] = [];
  const unknown: number[] = [];
  // Warm both paths (the stand-in hash for unknown accounts is made on first use).
  await attempt("estimator@cinder-slate.test");
  await attempt("warm-up@nowhere.test");
  for (let i = 0; i < 7; i++) {
    const a = await attempt("estimator@cinder-slate.test");
    const b = await attempt(`nobody-${i}@nowhere.test`);
    expect(a.status).toBe(401);
    expect(b.status).toBe(401);
    expect(a.text.includes("That e-mail and password do not match an account.")).toBe(true);
    expect(b.text.includes("That e-mail and password do not match an account.")).toBe(true);
    known.push(a.ms);
    unknown.push(b.ms);
  }
  const median = (xs: number[]) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)]!;
  const ratio = median(unknown) / median(known);
  // Both run one argon2id verification (about 15–20 ms here); skipping it for a missing account
  // would answer about ten times faster. The wide band absorbs a busy two-core machine.
  expect(ratio).toBeGreaterThan(0.33);
  expect(ratio).toBeLessThan(3);
});

test("a request body over the upload limit is refused with 413 before it is read", async ({ request, baseURL }) => {
  const big = Buffer.alloc(62 * 1024 * 1024, 0x41);
  const response = await request.post("/c/cinder-slate", {
    headers: { Origin: baseURL!, "X-Forwarded-For": "10.66.0.1" },
    multipart: { customerName: "Big Body", photos: { name: "huge.jpg", mimeType: "image/jpeg", buffer: big } },
    maxRedirects: 0,
  });
  expect(response.status()).toBe(413);
});
