import { data, Form, redirect, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/login";
import { PublicShell } from "~/components/public-shell";
import { FormAlert, TextField } from "~/components/ui/field";
import { authenticateWithPassword, SIGN_IN_FAILED, SignInError } from "~/lib/auth/auth.server";
import { clientAddress } from "~/lib/platform/rate-limit.server";
import { getSessionUser, safeRedirectPath, startSession, sweepExpiredSessions } from "~/lib/auth/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Emberwright" }];

// Document responses take their headers from here: pass the action's Retry-After through.
export const headers: Route.HeadersFunction = ({ actionHeaders }) => actionHeaders;

function homeFor(role: string): string {
  return role === "homeowner" ? "/my" : "/app";
}

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getSessionUser(request);
  if (user) {
    const target = safeRedirectPath(new URL(request.url).searchParams.get("redirectTo"), homeFor(user.role));
    // A homeowner sent here from a staff page stays on the sign-in page instead of looping.
    if (user.role !== "homeowner" || !target.startsWith("/app")) throw redirect(target);
  }
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  let form: FormData;
  try {
    // The strategy reads the body itself; the form is read from a copy for redirectTo and the e-mail.
    form = await request.clone().formData();
  } catch {
    return data({ message: SIGN_IN_FAILED, email: "" }, { status: 400 });
  }
  try {
    const user = await authenticateWithPassword(request, clientAddress(request, context));
    // The target is settled before a session row exists, so nothing is left half-written.
    const target = safeRedirectPath(String(form.get("redirectTo") ?? ""), homeFor(user.role));
    const allowed = user.role === "homeowner" && target.startsWith("/app") ? "/my" : target;
    await sweepExpiredSessions();
    const cookie = await startSession(user.id);
    return redirect(allowed, { headers: { "Set-Cookie": cookie } });
  } catch (error) {
    if (error instanceof SignInError) {
      const headers: HeadersInit = error.retryAfterSeconds ? { "Retry-After": String(error.retryAfterSeconds) } : {};
      return data(
        { message: error.message, email: String(form.get("email") ?? "") },
        { status: error.status, headers },
      );
    }
    if (error instanceof Response) throw error;
    console.error(error);
    return data({ message: SIGN_IN_FAILED, email: "" }, { status: 401 });
  }
}

export default function LoginRoute({ actionData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  const navigation = useNavigation();
  const isSubmitting = navigation.state === "submitting";
  return (
    <PublicShell right={<span />}>
      <main className="mx-auto flex max-w-md flex-col gap-6 px-4 py-12 sm:py-20">
        <div>
          <h1 className="text-3xl font-extrabold">Sign in</h1>
          <p className="mt-2 text-char-600">For contractor staff and homeowners with an Emberwright account.</p>
        </div>
        <Form method="post" className="flex flex-col gap-5 card p-6" noValidate>
          {actionData?.message ? <FormAlert>{actionData.message}</FormAlert> : null}
          {params.get("signedOut") ? (
            <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
              You are signed out.
            </p>
          ) : null}
          <input type="hidden" name="redirectTo" value={params.get("redirectTo") ?? ""} />
          <TextField
            label="E-mail"
            name="email"
            type="email"
            autoComplete="username"
            required
            defaultValue={actionData?.email ?? ""}
          />
          <TextField label="Password" name="password" type="password" autoComplete="current-password" required />
          <button type="submit" className="btn-primary py-2.5 text-base" disabled={isSubmitting}>
            {isSubmitting ? "Signing in…" : "Sign in"}
          </button>
        </Form>
      </main>
    </PublicShell>
  );
}
