import { eq } from "drizzle-orm";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { z } from "zod";
import { users } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { burnPasswordCheck, verifyPassword } from "~/lib/auth/password.server";
import { countSpent, createLimiter, peekLimit, spendLimit } from "~/lib/platform/rate-limit.server";

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

/*
 * Sign-in limits (ASVS 2.2.1). Failures are counted per address and per account-and-address, so a
 * guesser is stopped at their own address while the account's owner, from theirs, still gets in.
 * Failures on one account from everywhere never lock it: past a threshold each further attempt on
 * that account waits a little longer before its password is checked (at most a few seconds).
 */
const perAccountAddressMinute = createLimiter("sign-in:account+address:minute", 10, 60);
const perAccountAddressHour = createLimiter("sign-in:account+address:hour", 100, 60 * 60);
const perAddressMinute = createLimiter("sign-in:address:minute", 30, 60);
const accountFailures = createLimiter("sign-in:account:failures", Number.MAX_SAFE_INTEGER, 15 * 60);

/** Failures on an account (from any address) in 15 minutes before attempts start to slow down. */
export const SLOWDOWN_AFTER_FAILURES = 10;
export const MAX_SLOWDOWN_MS = 5_000;

/** The wait before checking a password on an account with this many recent failures. */
export function signInDelayMs(recentFailures: number): number {
  if (recentFailures < SLOWDOWN_AFTER_FAILURES) return 0;
  return Math.min(MAX_SLOWDOWN_MS, 250 * 2 ** Math.min(recentFailures - SLOWDOWN_AFTER_FAILURES, 5));
}

const signInFormSchema = z.object({
  email: z.email().max(254),
  password: z.string().min(1).max(200),
});

export type SignedIn = { id: number; role: string; companyId: number };

/** Checks an e-mail and password from `address` (a bucket from clientAddress); throws SignInError. */
export async function verifySignIn(form: FormData, address: string): Promise<SignedIn> {
  const parsed = signInFormSchema.safeParse({
    email: String(form.get("email") ?? "")
      .trim()
      .toLowerCase(),
    password: String(form.get("password") ?? ""),
  });
  if (!parsed.success) throw new SignInError(SIGN_IN_FAILED, 400);
  const { email, password } = parsed.data;
  const limits = [
    [perAccountAddressMinute, `${email}|${address}`],
    [perAccountAddressHour, `${email}|${address}`],
    [perAddressMinute, address],
  ] as const;

  // Checked before any hashing, so a flood costs the server nothing.
  for (const [limiter, key] of limits) {
    const verdict = await peekLimit(limiter, key);
    if (!verdict.ok) {
      throw new SignInError("Too many sign-in attempts. Wait a minute and try again.", 429, verdict.retryAfterSeconds);
    }
  }
  const delay = signInDelayMs((await countSpent(accountFailures, email)).spent);
  if (delay > 0) await new Promise((resolve) => setTimeout(resolve, delay));

  const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  const isValid =
    user?.passwordHash && user.isActive
      ? await verifyPassword(user.passwordHash, password)
      : (await burnPasswordCheck(password), false);

  if (!user || !isValid) {
    for (const [limiter, key] of limits) await spendLimit(limiter, key);
    await spendLimit(accountFailures, email);
    throw new SignInError(SIGN_IN_FAILED, 401);
  }
  return { id: user.id, role: user.role, companyId: user.companyId };
}

/*
 * The password strategy. The client's address comes from the socket (or a trusted proxy), which a
 * Request does not carry (remix-auth hands its strategy a fresh copy of the request), so each sign-in
 * gets an authenticator whose strategy closes over the address; both are small plain objects.
 */
/** Signs in with the posted e-mail and password through remix-auth's form strategy; throws SignInError. */
export function authenticateWithPassword(request: Request, address: string): Promise<SignedIn> {
  const authenticator = new Authenticator<SignedIn>();
  authenticator.use(new FormStrategy(({ form }) => verifySignIn(form, address)), "password");
  return authenticator.authenticate("password", request);
}
