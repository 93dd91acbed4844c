import { z } from "zod";

/**
 * Every setting the server reads, parsed once. Development gets safe defaults so `npm run demo`
 * works from a clean clone; production refuses to start without a real SESSION_SECRET.
 */
const DEV_SESSION_SECRET = "dev-only-emberwright-session-secret-change-me";

export const envSchema = z
  .object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    DATABASE_URL: z.string().min(1).default("file:./data/emberwright.db"),
    DATABASE_AUTH_TOKEN: z.string().optional(),
    // Comma-separated: the first signs new cookies, the rest still verify (rotation).
    SESSION_SECRET: z.string().optional(),
    UPLOADS_DIR: z.string().min(1).default("./data/uploads"),
    APP_ORIGIN: z.url().optional(),
    EMAIL_FROM: z.string().min(3).default("Emberwright <requests@emberwright.test>"),
    RESEND_API_KEY: z.string().default("re_local_fake_key"),
    RESEND_BASE_URL: z.url().optional(),
    STRIPE_SECRET_KEY: z.string().default("sk_test_emberwright_local"),
    STRIPE_WEBHOOK_SECRET: z.string().default("whsec_emberwright_local"),
    STRIPE_API_BASE: z.url().optional(),
    OUTBOX_WORKER: z.enum(["on", "off"]).default("on"),
    // Requests and bookings one address may send in 10 minutes (honest households send one or two).
    PUBLIC_FORM_LIMIT: z.coerce.number().int().min(1).max(100_000).default(10),
  })
  .transform((env, ctx) => {
    const secrets = (env.SESSION_SECRET ?? "")
      .split(",")
      .map((s) => s.trim())
      .filter(Boolean);
    if (env.NODE_ENV === "production") {
      if (secrets.length === 0) {
        ctx.addIssue({
          code: "custom",
          path: ["SESSION_SECRET"],
          message:
            "SESSION_SECRET is required in production: it signs the sign-in cookie. Set it to a long random string (e.g. `openssl rand -hex 32`).",
        });
        return z.NEVER;
      }
      if (secrets.some((s) => s.length < 32)) {
        ctx.addIssue({
          code: "custom",
          path: ["SESSION_SECRET"],
          message: "SESSION_SECRET must be at least 32 characters in production.",
        });
        return z.NEVER;
      }
    }
    return { ...env, sessionSecrets: secrets.length ? secrets : [DEV_SESSION_SECRET] };
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
