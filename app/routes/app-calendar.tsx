import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/app-calendar";
import { FormAlert } from "~/components/ui/field";
import { requireUser } from "~/lib/auth/session.server";
import { hasCalendarFeed, issueCalendarFeed, revokeCalendarFeed } from "~/lib/builds/builds.server";
import { appOrigin } from "~/lib/platform/email.server";
import { readTextFields } from "~/lib/platform/forms.server";

export const meta: Route.MetaFunction = () => [{ title: "My build calendar · Emberwright" }];

const CALENDAR_ROLES = ["owner", "estimator", "crew"] as const;

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: CALENDAR_ROLES });
  return { hasLink: await hasCalendarFeed(user.id) };
}

const intentSchema = z.object({
  intent: z.enum(["issue", "revoke"], { error: "Choose to make a link or to stop sharing." }),
});

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request, { roles: CALENDAR_ROLES });
  const parsed = intentSchema.safeParse(await readTextFields(request));
  if (!parsed.success)
    return data({ error: parsed.error.issues[0]!.message, link: null, revoked: false }, { status: 400 });
  if (parsed.data.intent === "revoke") {
    await revokeCalendarFeed(user.id, user.companyId);
    return data({ error: null, link: null, revoked: true });
  }
  const token = await issueCalendarFeed(user.id, user.companyId);
  return data({ error: null, link: `${appOrigin(request)}/calendar/${token}.ics`, revoked: false });
}

export default function CalendarRoute({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const isBusy = navigation.state === "submitting";
  const link = actionData?.link ?? null;
  return (
    <div className="flex max-w-2xl flex-col gap-6">
      <div>
        <h1 className="text-2xl font-extrabold">My build calendar</h1>
        <p className="text-char-600">
          A private link your phone's calendar can subscribe to: it shows the builds you are on, and follows every move.
          Anyone with the link sees those builds' days and addresses, so keep it to yourself; a new link ends the old
          one.
        </p>
      </div>
      {actionData?.error ? <FormAlert>{actionData.error}</FormAlert> : null}
      {link ? (
        <div className="flex flex-col gap-2 card p-4">
          <p className="font-extrabold">Your link (shown once: copy it now)</p>
          <input
            readOnly
            aria-label="Calendar link"
            value={link}
            className="field-input font-mono text-sm"
            onFocus={(e) => e.currentTarget.select()}
          />
          <p className="text-sm text-char-600">
            In your calendar app, choose “add calendar from URL” (or “subscribe”) and paste it.
          </p>
        </div>
      ) : null}
      {actionData?.revoked ? (
        <p role="status" className="rounded-lg bg-moss-100 px-4 py-3 text-sm font-semibold text-moss-700">
          Sharing stopped: the old link no longer works.
        </p>
      ) : null}
      <div className="flex flex-wrap gap-3">
        <Form method="post">
          <input type="hidden" name="intent" value="issue" />
          <button type="submit" className="btn-primary" disabled={isBusy}>
            {loaderData.hasLink || link ? "Make a new link" : "Make my calendar link"}
          </button>
        </Form>
        {loaderData.hasLink || link ? (
          <Form method="post">
            <input type="hidden" name="intent" value="revoke" />
            <button type="submit" className="btn-quiet" disabled={isBusy}>
              Stop sharing
            </button>
          </Form>
        ) : null}
      </div>
    </div>
  );
}
