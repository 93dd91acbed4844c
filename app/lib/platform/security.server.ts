import { randomFillSync } from "node:crypto";
import { createContext, type MiddlewareFunction } from "react-router";
import { bodyLimitFor, bodyTooLarge } from "~/lib/platform/body-limits.server";
import { env } from "~/lib/platform/env.server";

/** Per-request CSP nonce, read by entry.server to stamp React Router's scripts. */
export const nonceContext = createContext<string>("");

// The one route that other machines post to; its HMAC signature is the proof of origin.
const ORIGIN_EXEMPT_PATHS = new Set(["/api/webhooks/stripe"]);
const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Refuses cross-origin browser writes (ASVS 4.2.2). Browsers always send Origin or
 * Sec-Fetch-Site on a cross-site POST; a request with neither comes from a non-browser client,
 * which carries no ambient cookies of a victim, so it is allowed.
 */
export function isCrossOriginWrite(request: Request): boolean {
  if (SAFE_METHODS.has(request.method)) return false;
  const url = new URL(request.url);
  if (ORIGIN_EXEMPT_PATHS.has(url.pathname)) return false;
  const allowed = new Set([url.origin]);
  if (env.appOrigin) allowed.add(env.appOrigin);
  const origin = request.headers.get("origin");
  if (origin && origin !== "null") return !allowed.has(origin);
  if (origin === "null") return true;
  const site = request.headers.get("sec-fetch-site");
  if (site) return site !== "same-origin" && site !== "none";
  return false;
}

// Nonces come from one CSPRNG buffer refilled 256 at a time: one call into OpenSSL per 256
// responses rather than one per response. Every nonce is 16 fresh random bytes, used once.
const NONCE_BYTES = 16;
const noncePool = Buffer.alloc(NONCE_BYTES * 256);
let nonceOffset = noncePool.length;

/** A fresh CSP nonce: 16 random bytes, base64. */
export function newNonce(): string {
  if (nonceOffset === noncePool.length) {
    randomFillSync(noncePool);
    nonceOffset = 0;
  }
  const nonce = noncePool.toString("base64", nonceOffset, nonceOffset + NONCE_BYTES);
  nonceOffset += NONCE_BYTES;
  return nonce;
}

/** The policy around the nonce, built once per setting (the settings do not change while the server runs). */
let policyParts: { key: string; before: string; after: string } | null = null;

function policyAroundNonce(): { before: string; after: string } {
  const key = `${env.NODE_ENV}|${env.STRIPE_API_BASE ?? ""}`;
  if (policyParts?.key === key) return policyParts;
  const isDev = env.NODE_ENV === "development";
  const checkoutOrigin = env.STRIPE_API_BASE ? new URL(env.STRIPE_API_BASE).origin : "https://checkout.stripe.com";
  // A character no policy contains marks where the nonce goes.
  const NONCE = "\u0000";
  const scriptSrc = isDev ? "'self' 'unsafe-inline' 'unsafe-eval'" : `'self' 'nonce-${NONCE}'`;
  const policy = [
    "default-src 'self'",
    `script-src ${scriptSrc}`,
    // React renders style="" attributes into the server HTML; styles cannot run code.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    `connect-src 'self'${isDev ? " ws: wss:" : ""}`,
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    `form-action 'self' ${checkoutOrigin}`,
    "frame-ancestors 'none'",
  ].join("; ");
  const at = policy.indexOf(NONCE);
  policyParts =
    at === -1 ? { key, before: policy, after: "" } : { key, before: policy.slice(0, at), after: policy.slice(at + 1) };
  return policyParts;
}

/** The Content-Security-Policy for a response; strict in production, relaxed for Vite's dev server. */
export function contentSecurityPolicy(nonce: string): string {
  const { before, after } = policyAroundNonce();
  return after ? `${before}${nonce}${after}` : before;
}

/** Strict-Transport-Security for the configured origin: only when it is https and HSTS_MAX_AGE > 0. */
export function strictTransportSecurity(): string | null {
  if (!env.appOrigin?.startsWith("https:") || env.HSTS_MAX_AGE === 0) return null;
  return `max-age=${env.HSTS_MAX_AGE}`;
}

/** Sets the security headers on any response; keeps ones a route set on purpose. */
export function applySecurityHeaders(headers: Headers, nonce: string): void {
  headers.set("Content-Security-Policy", contentSecurityPolicy(nonce));
  setCommonHeaders(headers);
}

function setCommonHeaders(headers: Headers): void {
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "strict-origin-when-cross-origin");
  headers.set("X-Frame-Options", "DENY");
  headers.set("Cross-Origin-Opener-Policy", "same-origin");
  headers.set("Permissions-Policy", "camera=(), microphone=(), geolocation=()");
  const hsts = strictTransportSecurity();
  if (hsts) headers.set("Strict-Transport-Security", hsts);
}

/**
 * For answers the app's middleware never saw (the framework's own 400 for a malformed Origin, a
 * 413 or 500 from the server itself): the same headers, and a policy that allows nothing, since
 * such an answer is never a page with scripts.
 */
export function applyBaselineHeaders(headers: Headers): void {
  if (!headers.has("Content-Security-Policy")) {
    headers.set(
      "Content-Security-Policy",
      "default-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'",
    );
  }
  setCommonHeaders(headers);
  if (!headers.has("Cache-Control")) headers.set("Cache-Control", "no-store");
}

// Answers that carry customer details (names, addresses, photos, prices, tokens): never stored by
// the browser or any cache in between, whatever the route set.
const PRIVATE_PATHS = [
  /^\/app(?:[/.]|$)/,
  /^\/my(?:[/.]|$)/,
  /^\/welcome\//,
  /^\/photos\//,
  /^\/api\/leads(?:[/.]|$)/,
  /^\/c\/[^/]+\/(?:sent|consult)\//,
  /^\/login(?:[/.]|$)/,
];

/** `Cache-Control: private, no-store` on private paths and signed-in requests, and wherever a route set none. */
export function applyCachePolicy(request: Request, headers: Headers): void {
  applyCachePolicyFor(new URL(request.url).pathname, request.headers.get("cookie"), headers);
}

/** The same policy from a path and the request's Cookie header. */
export function applyCachePolicyFor(path: string, cookie: string | null | undefined, headers: Headers): void {
  const signedIn = /(?:^|;\s*)ew_session=/.test(cookie ?? "");
  if (signedIn || PRIVATE_PATHS.some((re) => re.test(path)) || !headers.has("Cache-Control")) {
    headers.set("Cache-Control", "private, no-store");
  }
}

/**
 * Root middleware: origin check for writes, the body cap for the route's kind, a nonce, the
 * security headers and the cache policy on every answer.
 */
export const securityMiddleware: MiddlewareFunction<Response> = async ({ request, context }, next) => {
  if (isCrossOriginWrite(request)) {
    const response = Response.json(
      { errors: [{ path: "", message: "Cross-site requests are not accepted." }] },
      { status: 403 },
    );
    applySecurityHeaders(response.headers, "");
    return response;
  }
  // Every form and API here takes POST: another write method is refused before any action reads it.
  if (!SAFE_METHODS.has(request.method) && request.method !== "POST") {
    const response = Response.json(
      { errors: [{ path: "", message: `${request.method} is not accepted here: use GET to read and POST to send.` }] },
      { status: 405, headers: { Allow: "GET, HEAD, OPTIONS, POST" } },
    );
    applySecurityHeaders(response.headers, "");
    return response;
  }
  const path = new URL(request.url).pathname;
  if (!SAFE_METHODS.has(request.method)) {
    const limit = bodyLimitFor(path);
    const declared = Number(request.headers.get("content-length") ?? "0");
    if (declared > limit.bytes) {
      const response = bodyTooLarge(limit);
      applyBaselineHeaders(response.headers);
      return response;
    }
  }
  const nonce = newNonce();
  context.set(nonceContext, nonce);
  const response = await next();
  applySecurityHeaders(response.headers, nonce);
  applyCachePolicyFor(path, request.headers.get("cookie"), response.headers);
  return response;
};
