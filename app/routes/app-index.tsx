import { redirect } from "react-router";
import type { Route } from "./+types/app-index";
import { STAFF_ROLES } from "~/db/enums";
import { requireUser } from "~/lib/auth/session.server";

// Each role starts where its work is: the office at the inbox, the crew at their jobs.
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  return redirect(user.role === "crew" ? "/app/jobs" : "/app/inbox");
}
