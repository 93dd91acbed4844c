/**
 * Idempotency keys as both services keep them: a retry with the same key and the same request gets
 * the first answer again; the same key on another endpoint or with another body is refused; only a
 * request that ran is remembered (a refused or failed one leaves the key free).
 */
import { createHash } from "node:crypto";
import { canonicalJson } from "./http";

/** What the first request under a key was, to compare a retry with. */
export interface FirstRequest {
  /** The endpoint (method and path, or the endpoint's name). */
  endpoint: string;
  /** A digest of its body that ignores key order. */
  fingerprint: string;
}

/** Compares a request with what its key was first used for: run it, replay the first answer, or refuse. */
export function checkIdempotency(
  previous: FirstRequest | undefined,
  request: FirstRequest,
): "new" | "replay" | "conflict" {
  if (!previous) return "new";
  return previous.endpoint === request.endpoint && previous.fingerprint === request.fingerprint ? "replay" : "conflict";
}

/** SHA-256 of the body's canonical JSON. */
export function fingerprintBody(body: unknown): string {
  return createHash("sha256").update(canonicalJson(body)).digest("hex");
}
