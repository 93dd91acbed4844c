import { useEffect, useEffectEvent } from "react";
import { data, Form, redirect, useFetcher, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/welcome";
import { fieldErrors } from "~/lib/format/form-fields";
import { PublicShell } from "~/components/public-shell";
import { useBrowserValue } from "~/components/use-browser-value";
import { FormAlert, TextField } from "~/components/ui/field";
import { hashPassword } from "~/lib/auth/password.server";
import { endAllSessions, startSession } from "~/lib/auth/session.server";
import { confirmRequestWithToken, findLiveToken, setPasswordWithToken } from "~/lib/auth/tokens.server";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "Set your password · Emberwright" }];

/*
 * One-time links arrive as /welcome#<token>. Browsers never send a fragment to a server, so the
 * token is in no request line, access log or Referer; the page reads it and posts it in the body.
 */

const DEAD_LINK = "This link has been used or has expired.";

function readFragment(): string {
  try {
    return decodeURIComponent(window.location.hash.slice(1));
  } catch {
    return "";
  }
}

const tokenField = z.string({ error: DEAD_LINK }).min(1, DEAD_LINK).max(200, DEAD_LINK);

const welcomeSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({ intent: z.literal("check"), token: tokenField }),
    z.object({ intent: z.literal("confirm"), token: tokenField }),
    z
      .object({
        intent: z.literal("set"),
        token: tokenField,
        password: z
          .string({ error: "Use at least 10 characters." })
          .min(10, "Use at least 10 characters.")
          .max(200, "Use at most 200 characters."),
        confirm: z.string({ error: "Type the password again." }),
      })
      .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords do not match." }),
  ],
  { error: "Open the link from your e-mail again." },
);

type Person = {
  name: string;
  email: string;
  purpose: "set-password" | "invite" | "confirm-request";
  hasPassword: boolean;
};
type WelcomeAnswer = { errors?: Record<string, string>; person?: Person; confirmed?: { hasPassword: boolean } };

// Links sent before tokens moved into the fragment: pass the token on as a fragment.
export async function loader({ params }: Route.LoaderArgs) {
  if (params.token) throw redirect(`/welcome#${encodeURIComponent(params.token)}`);
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const fields = await readTextFields(request);
  const parsed = welcomeSchema.safeParse(fields);
  if (!parsed.success) {
    const errors = fieldErrors(parsed.error);
    // Without a usable token there is nothing to fix on the page: say so once.
    if (errors.token || errors.intent)
      return data<WelcomeAnswer>({ errors: { form: errors.token ?? errors.intent! } }, { status: 410 });
    return data<WelcomeAnswer>({ errors }, { status: 400 });
  }
  const input = parsed.data;
  const dead = () => data<WelcomeAnswer>({ errors: { form: DEAD_LINK } }, { status: 410 });

  if (input.intent === "check") {
    const found = await findLiveToken(input.token);
    if (!found) return dead();
    return data<WelcomeAnswer>({
      person: { name: found.name, email: found.email, purpose: found.purpose, hasPassword: found.hasPassword },
    });
  }
  if (input.intent === "confirm") {
    const confirmed = await confirmRequestWithToken(input.token);
    if (!confirmed) return dead();
    return data<WelcomeAnswer>({ confirmed: { hasPassword: confirmed.hasPassword } });
  }
  if (!(await findLiveToken(input.token))) return dead();
  const passwordHash = await hashPassword(input.password);
  // Using the link and setting the password are one transaction; a second use changes nothing.
  const user = await setPasswordWithToken(input.token, passwordHash);
  if (!user) return dead();
  await endAllSessions(user.id);
  const cookie = await startSession(user.id);
  return redirect(user.role === "homeowner" ? "/my" : "/app", { headers: { "Set-Cookie": cookie } });
}

function DeadLink() {
  return (
    <div className="card p-6">
      <h1 className="text-2xl font-extrabold">This link no longer works</h1>
      <p className="mt-2 text-char-600">
        It has been used already, a newer e-mail replaced it, or it is more than 7 days old. If you already set a
        password, sign in.
      </p>
      <a href="/login" className="mt-4 btn-primary">
        Sign in
      </a>
    </div>
  );
}

export default function WelcomeRoute({ actionData }: Route.ComponentProps) {
  // null until the browser has read the fragment; "" when there is none (or it is garbled).
  const token = useBrowserValue<string | null>(readFragment, null);
  const check = useFetcher<WelcomeAnswer>();
  const confirm = useFetcher<WelcomeAnswer>();
  const navigation = useNavigation();
  const checkToken = useEffectEvent(
    (value: string) => void check.submit({ intent: "check", token: value }, { method: "post" }),
  );
  useEffect(() => {
    // Once, on arrival: the fragment is the link.
    if (token) checkToken(token);
  }, [token]);
  const errors: Record<string, string> = actionData?.errors ?? {};
  const person = check.data?.person;
  const isChecking = token === null || (token !== "" && !check.data);

  let body: React.ReactNode;
  if (isChecking) {
    body = (
      <div className="card p-6" role="status">
        <h1 className="text-2xl font-extrabold">Checking your link…</h1>
        <noscript>
          <p className="mt-2 text-char-600">This page needs JavaScript to read the link from your e-mail.</p>
        </noscript>
      </div>
    );
  } else if (!person || errors.form === DEAD_LINK) {
    body = <DeadLink />;
  } else if (person.purpose === "confirm-request") {
    const done = confirm.data?.confirmed;
    body = (
      <div className="flex flex-col gap-4 card p-6">
        <h1 className="text-2xl font-extrabold">
          {done ? "Added to your requests" : "Add this request to your account"}
        </h1>
        {confirm.data?.errors?.form ? <FormAlert>{confirm.data.errors.form}</FormAlert> : null}
        {done ? (
          <>
            <p className="text-char-600">
              {done.hasPassword
                ? "Sign in with your e-mail address to follow it and book a design consult."
                : "To follow it, set your password with the link in the newest e-mail we sent you."}
            </p>
            {done.hasPassword ? (
              <a href="/login?redirectTo=/my" className="btn-primary self-start">
                Sign in
              </a>
            ) : null}
          </>
        ) : (
          <>
            <p className="text-char-600">
              A fire-pit request was sent with {person.email}. If it was you, add it to the requests you follow; if not,
              close this page and nothing changes.
            </p>
            <confirm.Form method="post">
              <input type="hidden" name="intent" value="confirm" />
              <input type="hidden" name="token" value={token ?? ""} />
              <button type="submit" className="btn-primary" disabled={confirm.state !== "idle"}>
                Yes, it was me: add it
              </button>
            </confirm.Form>
          </>
        )}
      </div>
    );
  } else {
    body = (
      <>
        <div>
          <h1 className="text-3xl font-extrabold">Set your password</h1>
          <p className="mt-2 text-char-600">
            For {person.name} ({person.email}). You will sign in with this e-mail address.
          </p>
        </div>
        <Form method="post" className="flex flex-col gap-5 card p-6" noValidate>
          {errors.form ? <FormAlert>{errors.form}</FormAlert> : null}
          <input type="hidden" name="intent" value="set" />
          <input type="hidden" name="token" value={token ?? ""} />
          <TextField
            label="New password"
            name="password"
            type="password"
            autoComplete="new-password"
            hint="At least 10 characters."
            error={errors.password}
          />
          <TextField
            label="Type it again"
            name="confirm"
            type="password"
            autoComplete="new-password"
            error={errors.confirm}
          />
          <button type="submit" className="btn-primary py-2.5" disabled={navigation.state === "submitting"}>
            Save password and continue
          </button>
        </Form>
      </>
    );
  }

  return (
    <PublicShell>
      <main className="mx-auto flex max-w-md flex-col gap-6 px-4 py-12">{body}</main>
    </PublicShell>
  );
}
