import { RateLimiterMemory, RateLimiterRes } from "rate-limiter-flexible";

/**
 * In-process limits. One app process serves a company's traffic; a second process would move
 * these to RateLimiterRedis/RateLimiterUnion behind the same functions.
 */
export type LimitVerdict = { ok: true } | { ok: false; retryAfterSeconds: number };

export function createLimiter(points: number, durationSeconds: number) {
  return new RateLimiterMemory({ points, duration: durationSeconds });
}

/** Checks a key without spending a point. */
export async function peekLimit(limiter: RateLimiterMemory, key: string): Promise<LimitVerdict> {
  const res = await limiter.get(key);
  if (res && res.consumedPoints >= limiter.points) {
    return { ok: false, retryAfterSeconds: Math.max(1, Math.ceil(res.msBeforeNext / 1000)) };
  }
  return { ok: true };
}

/** Spends one point; refuses once the window's points are used up. */
export async function spendLimit(limiter: RateLimiterMemory, key: string): Promise<LimitVerdict> {
  try {
    await limiter.consume(key, 1);
    return { ok: true };
  } catch (err) {
    if (err instanceof RateLimiterRes) {
      return { ok: false, retryAfterSeconds: Math.max(1, Math.ceil(err.msBeforeNext / 1000)) };
    }
    throw err;
  }
}

/**
 * The client address for per-address limits. Behind a proxy, the rightmost X-Forwarded-For entry is
 * the one the proxy itself saw (earlier entries are the client's to invent). Without one, every
 * request shares one bucket, so the limit still caps the total.
 */
export function clientAddress(request: Request): string {
  const forwarded = request.headers.get("x-forwarded-for");
  return forwarded?.split(",").at(-1)?.trim() || "local";
}

export function tooManyRequests(retryAfterSeconds: number, message: string): Response {
  return Response.json(
    { errors: [{ path: "", message }] },
    { status: 429, headers: { "Retry-After": String(retryAfterSeconds) } },
  );
}
