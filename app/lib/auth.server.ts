import { eq } from "drizzle-orm";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { z } from "zod";
import { users } from "~/db/schema";
import { db } from "~/lib/db.server";
import { burnPasswordCheck, verifyPassword } from "~/lib/password.server";
import { clientAddress, createLimiter, peekLimit, spendLimit } from "~/lib/rate-limit.server";

export const SIGN_IN_FAILED = "That e-mail and password do not match an account.";

/** Thrown by the sign-in strategy; the message is safe to show (it never says which part was wrong). */
export class SignInError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
  }
}

// The 11th failure within a minute on one account is refused; ASVS 2.2.1 caps an hour at 100.
const perAccountMinute = createLimiter(10, 60);
const perAccountHour = createLimiter(100, 60 * 60);
const perAddressMinute = createLimiter(30, 60);

const signInFormSchema = z.object({
  email: z.email().max(254),
  password: z.string().min(1).max(200),
});

export type SignedIn = { id: number; role: string; companyId: number };

async function verifySignIn(form: FormData, request: Request): Promise<SignedIn> {
  const parsed = signInFormSchema.safeParse({
    email: String(form.get("email") ?? "").trim().toLowerCase(),
    password: String(form.get("password") ?? ""),
  });
  if (!parsed.success) throw new SignInError(SIGN_IN_FAILED, 400);
  const { email, password } = parsed.data;
  const address = clientAddress(request);
  const keys = [
    [perAccountMinute, email],
    [perAccountHour, email],
    [perAddressMinute, address],
  ] as const;

  // Checked before any hashing, so a flood costs the server nothing.
  for (const [limiter, key] of keys) {
    const verdict = await peekLimit(limiter, key);
    if (!verdict.ok) {
      throw new SignInError(
        "Too many sign-in attempts. Wait a minute and try again.",
        429,
        verdict.retryAfterSeconds,
      );
    }
  }

  const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  const isValid =
    user?.passwordHash && user.isActive
      ? await verifyPassword(user.passwordHash, password)
      : (await burnPasswordCheck(password), false);

  if (!user || !isValid) {
    for (const [limiter, key] of keys) await spendLimit(limiter, key);
    throw new SignInError(SIGN_IN_FAILED, 401);
  }
  return { id: user.id, role: user.role, companyId: user.companyId };
}

export const authenticator = new Authenticator<SignedIn>();
authenticator.use(new FormStrategy(({ form, request }) => verifySignIn(form, request)), "password");
