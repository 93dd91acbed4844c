import { redirect } from "react-router";
import type { Route } from "./+types/app-index";
import { STAFF_ROLES } from "~/db/schema";
import { requireUser } from "~/lib/session.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requireUser(request, { roles: STAFF_ROLES });
  return redirect("/app/catalog");
}
