import { z } from "zod";
import type { Route } from "./+types/app-inbox-seen";
import { requireApiUser, OFFICE_ROLES } from "~/lib/auth/staff.server";
import { markInboxSeen } from "~/lib/leads/inbox.server";
import { postOnly } from "~/lib/platform/post-only.server";
import { readTextFields } from "~/lib/platform/forms.server";

const seenSchema = z.object({
  at: z.iso.datetime({ error: "At must be an ISO 8601 UTC time like 2026-12-02T14:00:00.000Z." }),
});

export const loader = postOnly("The inbox page posts here when its list is shown.");

/**
 * POST /app/inbox/seen: the inbox page, once shown, records the moment its list was read, so the
 * next visit marks only newer requests. A time ahead of the server's clock counts as now.
 */
export async function action({ request }: Route.ActionArgs) {
  const user = await requireApiUser(request, OFFICE_ROLES);
  const parsed = seenSchema.safeParse(await readTextFields(request));
  if (!parsed.success)
    return Response.json({ errors: [{ path: "at", message: parsed.error.issues[0]!.message }] }, { status: 400 });
  const now = new Date();
  const at = new Date(parsed.data.at);
  await markInboxSeen(user.id, at > now ? now : at);
  return new Response(null, { status: 204 });
}
