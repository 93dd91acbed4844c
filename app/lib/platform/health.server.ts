import { pingDatabase } from "~/lib/platform/db.server";
import { applyCachePolicyFor, applySecurityHeaders, newNonce } from "~/lib/platform/security.server";

/** What the health check asks: the database answers a trivial query. */
export { pingDatabase };

export const HEALTH_PATH = "/api/health";

/** The health answer as its route gives it: 200 `{ ok, db }` when the database answers, else 503. */
export async function healthResponse(): Promise<Response> {
  try {
    await pingDatabase();
    return Response.json({ ok: true, db: true }, { headers: { "Cache-Control": "no-store" } });
  } catch {
    return Response.json({ ok: false, db: false }, { status: 503, headers: { "Cache-Control": "no-store" } });
  }
}

/**
 * The health answer with the headers the root middleware puts on the route's answer (security
 * headers with a fresh nonce, the cache policy for the path and the request's cookie), for the
 * server to give without going through the router: load balancers ask for it many times a second.
 */
export async function healthWithHeaders(cookie: string | null | undefined): Promise<Response> {
  const response = await healthResponse();
  applySecurityHeaders(response.headers, newNonce());
  applyCachePolicyFor(HEALTH_PATH, cookie, response.headers);
  return response;
}
