import { randomBytes } from "node:crypto";

const ALPHABET = "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz";

/** A random id in the service's style: prefix plus base62 characters (`pi_3Xk…`). */
export function makeId(prefix: string, length = 24): string {
  const bytes = randomBytes(length);
  let out = prefix;
  // 256 % 62 leaves a slight bias; irrelevant for ids that only need to be unique.
  for (const byte of bytes) out += ALPHABET[byte % ALPHABET.length];
  return out;
}

/** Reads an own property only, so ids taken from a URL (`__proto__`, `constructor`) never hit the prototype. */
export function getOwn<T>(map: Record<string, T>, key: string): T | undefined {
  return Object.hasOwn(map, key) ? map[key] : undefined;
}

export function nowSeconds(): number {
  return Math.floor(Date.now() / 1000);
}
