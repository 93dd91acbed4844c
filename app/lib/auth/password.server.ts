import { hash, verify, type Options } from "@node-rs/argon2";

// OWASP Password Storage Cheat Sheet minimum for argon2id: m = 19 MiB, t = 2, p = 1.
// `Algorithm` is a const enum, unusable under verbatimModuleSyntax: 2 is its Argon2id member.
const ARGON2_OPTIONS: Options = {
  algorithm: 2,
  memoryCost: 19456,
  timeCost: 2,
  parallelism: 1,
};

/** Hashes a password with argon2id (PHC string, salt included). */
export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2_OPTIONS);
}

/** Verifies a password against a PHC string; false for any malformed hash. */
export async function verifyPassword(phc: string, password: string): Promise<boolean> {
  try {
    return await verify(phc, password);
  } catch {
    return false;
  }
}

let dummyHash: Promise<string> | null = null;

/** Spends the same work as a real check, so an unknown e-mail answers in a similar time. */
export async function burnPasswordCheck(password: string): Promise<void> {
  dummyHash ??= hashPassword("emberwright-timing-equaliser");
  await verifyPassword(await dummyHash, password);
}
