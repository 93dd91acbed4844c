import { z } from "zod";
import { parseTrustProxy, type TrustProxy } from "~/lib/platform/client-address";

/**
 * Every setting the server reads, parsed once. Development and tests get local defaults so
 * `npm run demo` works from a clean clone; production refuses to start without its own origin and
 * secrets, and names every one that is missing.
 */
const DEV_SESSION_SECRET = "dev-only-emberwright-session-secret-change-me";
// The local stand-ins accept these; a production server must never.
export const LOCAL_SECRETS = {
  STRIPE_WEBHOOK_SECRET: "whsec_emberwright_local",
  STRIPE_SECRET_KEY: "sk_test_emberwright_local",
  RESEND_API_KEY: "re_local_fake_key",
} as const;

const REQUIRED_IN_PRODUCTION: Record<"APP_ORIGIN" | keyof typeof LOCAL_SECRETS, string> = {
  APP_ORIGIN:
    "APP_ORIGIN is required in production: every link in e-mails and every payment return address is built from it, never from the request's Host. Set it to the public origin, e.g. https://pits.example.com.",
  STRIPE_WEBHOOK_SECRET:
    "STRIPE_WEBHOOK_SECRET is required in production: it proves a payment notice came from the payment service. Use the signing secret (whsec_…) of your webhook endpoint.",
  STRIPE_SECRET_KEY:
    "STRIPE_SECRET_KEY is required in production: the payment service's secret key (sk_live_… or sk_test_…).",
  RESEND_API_KEY: "RESEND_API_KEY is required in production: the e-mail service's API key (re_…).",
};

const origin = z.url({
  protocol: /^https?$/,
  error: "must be an http:// or https:// origin such as https://pits.example.com",
});

export const envSchema = z
  .object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    DATABASE_URL: z.string().min(1).default("file:./data/emberwright.db"),
    DATABASE_AUTH_TOKEN: z.string().optional(),
    // Comma-separated: the first signs new cookies, the rest still verify (rotation).
    SESSION_SECRET: z.string().optional(),
    UPLOADS_DIR: z.string().min(1).default("./data/uploads"),
    APP_ORIGIN: origin.optional(),
    // Which proxies may tell the client's address in X-Forwarded-For: unset (none), a hop count,
    // or a list of addresses and subnets.
    TRUST_PROXY: z.string().optional(),
    // Strict-Transport-Security max-age in seconds when APP_ORIGIN is https; 0 sends none.
    HSTS_MAX_AGE: z.coerce.number().int().min(0).max(63_072_000).default(31_536_000),
    EMAIL_FROM: z.string().min(3).default("Emberwright <requests@emberwright.test>"),
    RESEND_API_KEY: z.string().optional(),
    RESEND_BASE_URL: z.url().optional(),
    STRIPE_SECRET_KEY: z.string().optional(),
    STRIPE_WEBHOOK_SECRET: z.string().optional(),
    STRIPE_API_BASE: z.url().optional(),
    OUTBOX_WORKER: z.enum(["on", "off"]).default("on"),
    // Requests and bookings one address may send one company in 10 minutes (honest households send one or two).
    PUBLIC_FORM_LIMIT: z.coerce.number().int().min(1).max(100_000).default(10),
  })
  .transform((env, ctx) => {
    const secrets = (env.SESSION_SECRET ?? "")
      .split(",")
      .map((s) => s.trim())
      .filter(Boolean);
    let problems = 0;
    const problem = (path: string, message: string) => {
      problems += 1;
      ctx.addIssue({ code: "custom", path: [path], message });
    };
    if (env.NODE_ENV === "production") {
      if (secrets.length === 0) {
        problem(
          "SESSION_SECRET",
          "SESSION_SECRET is required in production: it signs the sign-in cookie. Set it to a long random string (e.g. `openssl rand -hex 32`).",
        );
      } else if (secrets.some((s) => s.length < 32)) {
        problem("SESSION_SECRET", "SESSION_SECRET must be at least 32 characters in production.");
      }
      for (const [name, message] of Object.entries(REQUIRED_IN_PRODUCTION)) {
        const value = env[name as keyof typeof REQUIRED_IN_PRODUCTION]?.trim();
        if (!value) problem(name, message);
        else if (value === LOCAL_SECRETS[name as keyof typeof LOCAL_SECRETS]) {
          problem(name, `${name} is the public local value; production needs its own.`);
        }
      }
    }
    let trustProxy: TrustProxy = { kind: "none" };
    try {
      trustProxy = parseTrustProxy(env.TRUST_PROXY);
    } catch (error) {
      problem("TRUST_PROXY", (error as Error).message);
    }
    if (problems > 0) return z.NEVER;
    return {
      ...env,
      STRIPE_WEBHOOK_SECRET: env.STRIPE_WEBHOOK_SECRET || LOCAL_SECRETS.STRIPE_WEBHOOK_SECRET,
      STRIPE_SECRET_KEY: env.STRIPE_SECRET_KEY || LOCAL_SECRETS.STRIPE_SECRET_KEY,
      RESEND_API_KEY: env.RESEND_API_KEY || LOCAL_SECRETS.RESEND_API_KEY,
      // Only the origin part: a trailing slash or path in the setting must not leak into links.
      appOrigin: env.APP_ORIGIN ? new URL(env.APP_ORIGIN).origin : null,
      trustProxy,
      sessionSecrets: secrets.length ? secrets : [DEV_SESSION_SECRET],
    };
  });

export type Env = z.output<typeof envSchema>;

/** Parses an environment record; throws an Error whose message names every bad variable. */
export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = envSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join(".") || "env"}: ${i.message}`);
    throw new Error(`Emberwright cannot start; fix these settings:\n${lines.join("\n")}`);
  }
  return result.data;
}

export const env = parseEnv(process.env);
