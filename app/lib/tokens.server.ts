import { createHash, randomBytes } from "node:crypto";

/** A URL-safe random token (256 bits) and the SHA-256 hex that is stored in its place. */
export function createToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** A short unguessable reference for public links (128 bits). */
export function createRef(): string {
  return randomBytes(16).toString("base64url");
}
