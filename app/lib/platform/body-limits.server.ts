import { MAX_FORM_BYTES } from "~/lib/platform/uploads.server";

/**
 * How many bytes of request body each kind of route may read. The server (server.mjs) refuses a
 * larger declared Content-Length with 413 before reading anything, and stops a chunked body the
 * moment it passes the cap; the root middleware repeats the Content-Length check for any other
 * way the app is served. The route, never the client's Content-Type, decides the kind.
 */
export const JSON_BODY_LIMIT = 64 * 1024;
export const FORM_BODY_LIMIT = 16 * 1024;
// Staff forms carry notes of up to 2,000 characters in any script: up to 9 bytes each URL-encoded.
export const WORKSPACE_FORM_LIMIT = 64 * 1024;
// The request form: its photos (count × size) plus room for the text fields and multipart framing.
export const LEAD_FORM_LIMIT = MAX_FORM_BYTES;

export type BodyLimit = { bytes: number; kind: "json" | "webhook" | "form" | "workspace-form" | "lead-form" };

// React Router's data requests add ".data" (or "/_.data" after a trailing slash) to the route's path.
const stripDataSuffix = (pathname: string) => pathname.replace(/(?:\/_)?\.data$/, "");

export function bodyLimitFor(pathname: string): BodyLimit {
  const path = stripDataSuffix(pathname);
  if (path === "/api/webhooks/stripe") return { bytes: JSON_BODY_LIMIT, kind: "webhook" };
  if (path.startsWith("/api/")) return { bytes: JSON_BODY_LIMIT, kind: "json" };
  // The configurator's own form post, and the upload endpoint its enhanced form posts to.
  if (/^\/c\/[^/]+(?:\/request)?\/?$/.test(path)) return { bytes: LEAD_FORM_LIMIT, kind: "lead-form" };
  // Staff photo uploads (the site visit, a job's build photos) take the same photos as the request form.
  if (/^\/app\/(?:leads\/\d+\/visit|jobs\/\d+\/photos)\/?$/.test(path))
    return { bytes: LEAD_FORM_LIMIT, kind: "lead-form" };
  if (path === "/app" || path.startsWith("/app/")) return { bytes: WORKSPACE_FORM_LIMIT, kind: "workspace-form" };
  return { bytes: FORM_BODY_LIMIT, kind: "form" };
}

/** The 413 answer, sent before any of the body is read. */
export function bodyTooLarge(limit: BodyLimit): Response {
  const size =
    limit.bytes >= 1024 * 1024
      ? `${Math.round(limit.bytes / (1024 * 1024))} MB`
      : `${Math.round(limit.bytes / 1024)} kB`;
  return Response.json(
    { errors: [{ path: "", message: `The request is too large: this form or API accepts at most ${size}.` }] },
    { status: 413 },
  );
}
