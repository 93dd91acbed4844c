import { spawn } from "node:child_process";
import { createRequire } from "node:module";
import { count, eq } from "drizzle-orm";
import fc from "fast-check";
import { RouterContextProvider } from "react-router";
import { expect, test } from "vitest";
import { rateLimits, sessions, users } from "~/db/schema";
import { signInDelayMs } from "~/lib/auth/auth.server";
import { bodyLimitFor, FORM_BODY_LIMIT, JSON_BODY_LIMIT } from "~/lib/platform/body-limits.server";
import { addressBucket, parseTrustProxy, resolveClientAddress } from "~/lib/platform/client-address";
import { db } from "~/lib/platform/db.server";
import { parseEnv } from "~/lib/platform/env.server";
import { createLimiter, spendLimit } from "~/lib/platform/rate-limit.server";
import { applyCachePolicy, securityMiddleware } from "~/lib/platform/security.server";
import { safeRedirectPath } from "~/lib/auth/session.server";
import { MAX_FORM_BYTES } from "~/lib/platform/uploads.server";
import { action as configuratorAction } from "~/routes/configurator";
import { action as loginAction } from "~/routes/login";
import { demoCompany, routeArgs } from "./support/demo";

// The reference for which hop names the client: Express's `trust proxy`, i.e. the proxy-addr
// package (a dependency of express, which @react-router/serve brings in).
const proxyaddr = createRequire(import.meta.url)("proxy-addr") as {
  (req: unknown, trust: ((addr: string, i: number) => boolean) | string[]): string;
  compile(list: string[]): (addr: string, i: number) => boolean;
};
const fakeReq = (socket: string, xff: string | null) => ({
  connection: { remoteAddress: socket },
  socket: { remoteAddress: socket },
  headers: xff === null ? {} : { "x-forwarded-for": xff },
});

const PRODUCTION = {
  NODE_ENV: "production",
  SESSION_SECRET: "s".repeat(40),
  APP_ORIGIN: "https://pits.example.test",
  STRIPE_WEBHOOK_SECRET: "whsec_operator_own",
  STRIPE_SECRET_KEY: "sk_live_operator_own",
  RESEND_API_KEY: "re_operator_own",
};

const statusOf = (result: unknown) =>
  result instanceof Response ? result.status : ((result as { init?: ResponseInit }).init?.status ?? 200);

// ---------------------------------------------------------------- start-up: origin and secrets

test("host-header link poisoning: production refuses to start without APP_ORIGIN, naming it", () => {
  const { APP_ORIGIN: _, ...rest } = PRODUCTION;
  expect(() => parseEnv(rest)).toThrow(/APP_ORIGIN is required in production/);
});

test("forged payment notices: production refuses to start without its own STRIPE_WEBHOOK_SECRET, STRIPE_SECRET_KEY and RESEND_API_KEY, naming each", () => {
  const bare = { NODE_ENV: "production", SESSION_SECRET: "s".repeat(40), APP_ORIGIN: "https://pits.example.test" };
  let message = "";
  try {
    parseEnv(bare);
  } catch (error) {
    message = (error as Error).message;
  }
  for (const name of ["STRIPE_WEBHOOK_SECRET", "STRIPE_SECRET_KEY", "RESEND_API_KEY"])
    expect(message).toMatch(new RegExp(`^  ${name}: `, "m"));
  expect(message).not.toMatch(/APP_ORIGIN:/);
});

test("forged payment notices: the public local webhook secret is refused in production", () => {
  expect(() => parseEnv({ ...PRODUCTION, STRIPE_WEBHOOK_SECRET: "whsec_emberwright_local" })).toThrow(
    /STRIPE_WEBHOOK_SECRET is the public local value/,
  );
});

test("a complete production configuration starts, and APP_ORIGIN is reduced to its origin", () => {
  const env = parseEnv({ ...PRODUCTION, APP_ORIGIN: "https://pits.example.test/some/path/" });
  expect(env.appOrigin).toBe("https://pits.example.test");
  expect(env.trustProxy).toEqual({ kind: "none" });
});

test("development still starts with no settings at all (npm run demo from a fresh clone)", () => {
  const env = parseEnv({});
  expect(env.appOrigin).toBeNull();
  expect(env.STRIPE_WEBHOOK_SECRET).toBe("whsec_emberwright_local");
});

// ---------------------------------------------------------------- client address

test("spoofed X-Forwarded-For: without TRUST_PROXY the socket's address is the client, whatever the header says", () => {
  const none = parseTrustProxy(undefined);
  expect(resolveClientAddress("192.0.2.10", "203.0.113.99", none)).toBe("192.0.2.10");
  expect(resolveClientAddress("::ffff:192.0.2.10", "203.0.113.99, 198.51.100.1", none)).toBe("192.0.2.10");
});

test("TRUST_PROXY=true (believe any header) is refused with a message naming the setting", () => {
  expect(() => parseEnv({ TRUST_PROXY: "true" })).toThrow(
    /TRUST_PROXY: TRUST_PROXY=true would believe any X-Forwarded-For/,
  );
  expect(() => parseEnv({ TRUST_PROXY: "10.0.0.1, not-an-address" })).toThrow(
    /TRUST_PROXY: "not-an-address" is not an IP address/,
  );
});

test("with a trusted proxy, the client address matches Express's trust proxy (proxy-addr) for hop counts and address lists (fast-check)", () => {
  const ipv4 = fc
    .tuple(fc.constantFrom(10, 127, 192, 198, 203), fc.nat(255), fc.nat(255), fc.nat(255))
    .map((p) => p.join("."));
  const lists = [["loopback"], ["10.0.0.0/8"], ["127.0.0.1", "10.1.2.3"], ["192.0.0.0/8", "loopback"]];
  fc.assert(
    fc.property(
      ipv4,
      fc.array(ipv4, { maxLength: 5 }),
      fc.nat(4),
      fc.nat(lists.length - 1),
      (socket, chain, hops, which) => {
        const xff = chain.length ? chain.join(", ") : null;
        if (hops > 0)
          expect(resolveClientAddress(socket, xff, parseTrustProxy(String(hops)))).toBe(
            proxyaddr(fakeReq(socket, xff), (_a, i) => i < hops),
          );
        const list = lists[which]!;
        expect(resolveClientAddress(socket, xff, parseTrustProxy(list.join(",")))).toBe(
          proxyaddr(fakeReq(socket, xff), proxyaddr.compile(list)),
        );
      },
    ),
    { numRuns: 300 },
  );
});

test("IPv6 clients share a bucket per /64, so one subscriber cannot mint fresh buckets", () => {
  expect(addressBucket("2001:db8:1:2::1")).toBe("2001:db8:1:2::/64");
  expect(addressBucket("2001:0db8:0001:0002:ffff:0:0:9")).toBe("2001:db8:1:2::/64");
  expect(addressBucket("192.0.2.7")).toBe("192.0.2.7");
  expect(addressBucket(null)).toBe("unknown");
});

// ---------------------------------------------------------------- shared limits

test("rate limits hold under concurrency: 40 parallel spends on one key let exactly the window's points through", async () => {
  const limiter = createLimiter("test:parallel", 7, 60);
  const verdicts = await Promise.all(Array.from({ length: 40 }, () => spendLimit(limiter, "k")));
  expect(verdicts.filter((v) => v.ok)).toHaveLength(7);
  const [row] = await db.select().from(rateLimits).where(eq(rateLimits.key, "test:parallel|k"));
  expect(row?.points).toBe(40);
});

test("rate limits are shared by every process: spends from another process on the same database count here", async () => {
  const limiter = createLimiter("test:two-processes", 10, 60);
  // A second Node process, its own libSQL connection, the same file and the same function.
  const child = spawn(
    "node_modules/.bin/tsx",
    ["tests/unit/support/spend-limit-child.ts", "test:two-processes", "10", "60", "k", "6"],
    {
      env: { ...process.env, NODE_ENV: "test" },
      stdio: ["ignore", "pipe", "inherit"],
    },
  );
  let out = "";
  child.stdout.on("data", (c) => (out += c));
  const here = Promise.all(Array.from({ length: 6 }, () => spendLimit(limiter, "k")));
  await new Promise((resolve) => child.on("exit", resolve));
  const okHere = (await here).filter((v) => v.ok).length;
  expect(Number(out.trim()) + okHere).toBe(10);
}, 30_000);

test("one bot on one contractor's form does not close another contractor's form (limits per company and address)", async () => {
  await demoCompany();
  const post = (slug: string) =>
    configuratorAction(
      routeArgs(
        new Request(`http://localhost/c/${slug}`, {
          method: "POST",
          body: new FormData(),
          headers: { "X-Forwarded-For": "203.0.113.50" },
        }),
        { companySlug: slug },
      ),
    );
  const statuses: number[] = [];
  for (let i = 0; i < 11; i++) statuses.push(statusOf(await post("cinder-slate")));
  expect(statuses.slice(0, 10).every((s) => s !== 429)).toBe(true);
  expect(statuses[10]).toBe(429);
  expect(statusOf(await post("north-ridge"))).not.toBe(429);
}, 60_000);

test("spoofed X-Forwarded-For from an untrusted peer does not buy fresh buckets on the request form", async () => {
  await demoCompany();
  const statuses: number[] = [];
  for (let i = 0; i < 11; i++) {
    const request = new Request("http://localhost/c/cinder-slate", {
      method: "POST",
      body: new FormData(),
      headers: { "X-Forwarded-For": `198.18.0.${i}` },
    });
    // The peer is not a trusted proxy (the test settings trust loopback only).
    statuses.push(
      statusOf(await configuratorAction(routeArgs(request, { companySlug: "cinder-slate" }, "192.0.2.200"))),
    );
  }
  expect(statuses[10]).toBe(429);
});

// ---------------------------------------------------------------- sign-in

const signIn = (email: string, password: string, address: string, redirectTo = "") =>
  loginAction(
    routeArgs(
      new Request("http://localhost/login", {
        method: "POST",
        body: new URLSearchParams({ email, password, redirectTo }),
        headers: { "X-Forwarded-For": address },
      }),
    ),
  ) as Promise<Response | { init: ResponseInit }>;

test("account lock-out from many addresses: 12 failures from 12 addresses do not stop the owner signing in from theirs", async () => {
  await demoCompany();
  for (let i = 0; i < 12; i++)
    expect(statusOf(await signIn("estimator@cinder-slate.test", `wrong-${i}`, `203.0.113.${100 + i}`))).toBe(401);
  const started = performance.now();
  const owner = await signIn("estimator@cinder-slate.test", "ember-demo-2026", "198.51.100.20");
  const waited = performance.now() - started;
  expect(statusOf(owner)).toBe(302);
  // Slowed, not blocked: 12 recent failures wait signInDelayMs(12) before the password is checked.
  expect(signInDelayMs(12)).toBeGreaterThan(0);
  expect(waited).toBeGreaterThanOrEqual(signInDelayMs(12) - 20);
}, 30_000);

test("password guessing from one address is refused at the 11th failure on that account, before any hashing", async () => {
  await demoCompany();
  const statuses: number[] = [];
  for (let i = 0; i < 11; i++)
    statuses.push(statusOf(await signIn("crew@cinder-slate.test", `guess-${i}`, "203.0.113.7")));
  expect(statuses.slice(0, 10)).toEqual(Array(10).fill(401));
  expect(statuses[10]).toBe(429);
});

test("the slowdown grows with failures and stays bounded", () => {
  expect(signInDelayMs(0)).toBe(0);
  expect(signInDelayMs(9)).toBe(0);
  expect(signInDelayMs(10)).toBeGreaterThan(0);
  expect(signInDelayMs(12)).toBeGreaterThan(signInDelayMs(11));
  expect(signInDelayMs(10_000)).toBe(5_000);
});

// ---------------------------------------------------------------- redirectTo

const ATTACKS = [
  "/\t/evil.example",
  "/\n/evil.example",
  "/\r\n/evil.example",
  "//evil.example",
  "/\\evil.example",
  "/\\/evil.example",
  "https://evil.example",
  "javascript:alert(1)",
  "/\u0000x",
  "/app\u0085x",
  " /app",
  "evil.example",
];

test.each(ATTACKS)("open redirect after sign-in: %j goes to the default page", (target) => {
  expect(safeRedirectPath(target, "/app")).toBe("/app");
});

test("same-origin paths survive, normalised so they are always safe in a Location header", () => {
  expect(safeRedirectPath("/app/inbox?status=new#top", "/app")).toBe("/app/inbox?status=new#top");
  expect(safeRedirectPath("/app/\uff0eevil", "/app")).toBe("/app/%EF%BC%8Eevil");
  expect(safeRedirectPath("/a/../b", "/app")).toBe("/b");
});

test("a newline in redirectTo with the right password signs in to the default page: no 500, one session row", async () => {
  await demoCompany();
  const [owner] = await db.select().from(users).where(eq(users.email, "owner@north-ridge.test"));
  const before = (await db.select({ n: count() }).from(sessions).where(eq(sessions.userId, owner!.id)))[0]!.n;
  const response = await signIn("owner@north-ridge.test", "ember-demo-2026", "198.51.100.77", "/app\n/evil.example");
  expect(response).toBeInstanceOf(Response);
  expect((response as Response).status).toBe(302);
  expect((response as Response).headers.get("Location")).toBe("/app");
  const after = (await db.select({ n: count() }).from(sessions).where(eq(sessions.userId, owner!.id)))[0]!.n;
  expect(after - before).toBe(1);
});

// ---------------------------------------------------------------- body caps and headers

test("the body cap by route kind: JSON APIs and the webhook 64 kB, sign-in and plain forms 16 kB, the request form its photos", () => {
  expect(bodyLimitFor("/api/plan").bytes).toBe(JSON_BODY_LIMIT);
  expect(bodyLimitFor("/api/webhooks/stripe").bytes).toBe(64 * 1024);
  expect(bodyLimitFor("/login").bytes).toBe(FORM_BODY_LIMIT);
  expect(bodyLimitFor("/login.data").bytes).toBe(16 * 1024);
  expect(bodyLimitFor("/c/cinder-slate/consult/abc").bytes).toBe(16 * 1024);
  expect(bodyLimitFor("/c/cinder-slate").bytes).toBe(MAX_FORM_BYTES);
  expect(bodyLimitFor("/c/cinder-slate.data").bytes).toBe(MAX_FORM_BYTES);
  // The upload endpoint the enhanced request form posts to takes the same photos; its neighbours do not.
  expect(bodyLimitFor("/c/cinder-slate/request").bytes).toBe(MAX_FORM_BYTES);
  expect(bodyLimitFor("/c/cinder-slate/sent/abc").bytes).toBe(16 * 1024);
});

async function throughMiddleware(request: Request) {
  let reached = false;
  const response = await securityMiddleware(
    { request, context: new RouterContextProvider(), params: {}, unstable_pattern: "" } as never,
    async () => {
      reached = true;
      return new Response("ok");
    },
  );
  return { response: response as Response, reached };
}

test("unbounded request bodies: a 10 MB sign-in post is refused with 413 before the route reads anything", async () => {
  const request = new Request("http://localhost/login", {
    method: "POST",
    headers: {
      "Content-Length": String(10 * 1024 * 1024),
      "Content-Type": "application/x-www-form-urlencoded",
      "Sec-Fetch-Site": "same-origin",
    },
  });
  const { response, reached } = await throughMiddleware(request);
  expect(response.status).toBe(413);
  expect(reached).toBe(false);
  expect(response.headers.get("X-Content-Type-Options")).toBe("nosniff");
});

test("unbounded request bodies: a 100 kB JSON body to the plan API is refused with 413", async () => {
  const request = new Request("http://localhost/api/plan", {
    method: "POST",
    headers: { "Content-Length": String(100 * 1024), "Content-Type": "application/json" },
  });
  expect((await throughMiddleware(request)).response.status).toBe(413);
});

test("cached customer details: private pages and signed-in answers are private, no-store, whatever the route set", () => {
  const headers = (path: string, set?: string, cookie?: string) => {
    const h = new Headers(set ? { "Cache-Control": set } : {});
    applyCachePolicy(new Request(`http://localhost${path}`, { headers: cookie ? { Cookie: cookie } : {} }), h);
    return h.get("Cache-Control");
  };
  expect(headers("/app/inbox.data")).toBe("private, no-store");
  expect(headers("/photos/7", "private, max-age=3600")).toBe("private, no-store");
  expect(headers("/c/cinder-slate/sent/abc")).toBe("private, no-store");
  expect(headers("/my")).toBe("private, no-store");
  expect(headers("/api/catalog/cinder-slate", "public, max-age=60", "ew_session=abc")).toBe("private, no-store");
  // A public catalog for anonymous visitors may be cached as its route says.
  expect(headers("/api/catalog/cinder-slate", "public, max-age=60")).toBe("public, max-age=60");
});
