import { expect, test } from "vitest";
import { parseEnv } from "~/lib/platform/env.server";

test("development starts with safe defaults: an embedded database file and a dev-only secret", () => {
  const env = parseEnv({ NODE_ENV: "development" });
  expect(env.DATABASE_URL).toBe("file:./data/emberwright.db");
  expect(env.sessionSecrets).toHaveLength(1);
  expect(env.STRIPE_API_BASE).toBeUndefined();
});

test("production refuses to start without SESSION_SECRET and says why", () => {
  expect(() => parseEnv({ NODE_ENV: "production" })).toThrow(
    /SESSION_SECRET is required in production: it signs the sign-in cookie/,
  );
});

test("production refuses a short SESSION_SECRET", () => {
  expect(() => parseEnv({ NODE_ENV: "production", SESSION_SECRET: "short" })).toThrow(/at least 32 characters/);
});

test("SESSION_SECRET takes a comma-separated list so secrets can rotate", () => {
  const a = "a".repeat(32);
  const b = "b".repeat(40);
  const own = {
    APP_ORIGIN: "https://pits.example.test",
    STRIPE_WEBHOOK_SECRET: "whsec_own",
    STRIPE_SECRET_KEY: "sk_live_own",
    RESEND_API_KEY: "re_own",
  };
  expect(parseEnv({ NODE_ENV: "production", SESSION_SECRET: `${a}, ${b}`, ...own }).sessionSecrets).toEqual([a, b]);
});

test("a malformed URL setting is named in the error", () => {
  expect(() => parseEnv({ STRIPE_API_BASE: "not a url" })).toThrow(/STRIPE_API_BASE/);
});
