import { expect, test } from "vitest";
import { hashPassword, verifyPassword } from "~/lib/auth/password.server";

test("passwords are hashed with argon2id at OWASP's minimum: m=19 MiB, t=2, p=1 (OWASP Password Storage Cheat Sheet)", async () => {
  const phc = await hashPassword("correct horse battery staple");
  expect(phc).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
});

test("the same password hashes differently each time (a fresh salt)", async () => {
  expect(await hashPassword("same")).not.toBe(await hashPassword("same"));
});

test("verification accepts the right password and refuses a wrong one or a malformed hash", async () => {
  const phc = await hashPassword("fire-ring-42");
  expect(await verifyPassword(phc, "fire-ring-42")).toBe(true);
  expect(await verifyPassword(phc, "fire-ring-43")).toBe(false);
  expect(await verifyPassword("not-a-hash", "fire-ring-42")).toBe(false);
});
