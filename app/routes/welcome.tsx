import { and, eq, gt, isNull } from "drizzle-orm";
import { data, Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/welcome";
import { fieldErrors } from "~/lib/form-fields";
import { PublicShell } from "~/components/public-shell";
import { FormAlert, TextField } from "~/components/ui/field";
import { oneTimeTokens, users } from "~/db/schema";
import { db } from "~/lib/db.server";
import { hashPassword } from "~/lib/password.server";
import { endAllSessions, startSession } from "~/lib/session.server";
import { hashToken } from "~/lib/tokens.server";

export const meta: Route.MetaFunction = () => [{ title: "Set your password · Emberwright" }];

const passwordFormSchema = z
  .object({
    password: z.string().min(10, "Use at least 10 characters.").max(200, "Use at most 200 characters."),
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords do not match." });

async function findLiveToken(token: string) {
  const [row] = await db
    .select({ tokenHash: oneTimeTokens.tokenHash, userId: users.id, name: users.name, email: users.email, role: users.role })
    .from(oneTimeTokens)
    .innerJoin(users, eq(users.id, oneTimeTokens.userId))
    .where(
      and(
        eq(oneTimeTokens.tokenHash, hashToken(token)),
        isNull(oneTimeTokens.usedAt),
        gt(oneTimeTokens.expiresAt, new Date().toISOString()),
        eq(users.isActive, true),
      ),
    )
    .limit(1);
  return row ?? null;
}

export async function loader({ params }: Route.LoaderArgs) {
  const found = await findLiveToken(params.token);
  return { person: found ? { name: found.name, email: found.email } : null };
}

export async function action({ request, params }: Route.ActionArgs) {
  const found = await findLiveToken(params.token);
  if (!found) return data({ errors: { form: "This link has been used or has expired." } as Record<string, string> }, { status: 410 });
  const parsed = passwordFormSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    return data({ errors: fieldErrors(parsed.error) }, { status: 400 });
  }
  const passwordHash = await hashPassword(parsed.data.password);
  // Marking the token used and setting the password land together, or neither does.
  const [marked] = await db.batch([
    db
      .update(oneTimeTokens)
      .set({ usedAt: new Date().toISOString() })
      .where(and(eq(oneTimeTokens.tokenHash, found.tokenHash), isNull(oneTimeTokens.usedAt)))
      .returning({ tokenHash: oneTimeTokens.tokenHash }),
    db.update(users).set({ passwordHash }).where(eq(users.id, found.userId)),
  ]);
  if (marked.length === 0) return data({ errors: { form: "This link has been used or has expired." } as Record<string, string> }, { status: 410 });
  await endAllSessions(found.userId);
  const cookie = await startSession(found.userId);
  return redirect(found.role === "homeowner" ? "/my" : "/app", { headers: { "Set-Cookie": cookie } });
}

export default function WelcomeRoute({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const navigation = useNavigation();
  return (
    <PublicShell>
      <main className="mx-auto flex max-w-md flex-col gap-6 px-4 py-12">
        {loaderData.person ? (
          <>
            <div>
              <h1 className="text-3xl font-extrabold">Set your password</h1>
              <p className="mt-2 text-char-600">
                For {loaderData.person.name} ({loaderData.person.email}). You will sign in with this e-mail address.
              </p>
            </div>
            <Form method="post" className="card flex flex-col gap-5 p-6" noValidate>
              {errors.form ? <FormAlert>{errors.form}</FormAlert> : null}
              <TextField label="New password" name="password" type="password" autoComplete="new-password" hint="At least 10 characters." error={errors.password} />
              <TextField label="Type it again" name="confirm" type="password" autoComplete="new-password" error={errors.confirm} />
              <button type="submit" className="btn-primary py-2.5" disabled={navigation.state === "submitting"}>
                Save password and continue
              </button>
            </Form>
          </>
        ) : (
          <div className="card p-6">
            <h1 className="text-2xl font-extrabold">This link no longer works</h1>
            <p className="mt-2 text-char-600">It has been used already or is more than 7 days old. If you already set a password, sign in.</p>
            <a href="/login" className="btn-primary mt-4">Sign in</a>
          </div>
        )}
      </main>
    </PublicShell>
  );
}
