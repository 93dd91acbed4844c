import { redirect } from "react-router";
import type { Route } from "./+types/logout";
import { endSession } from "~/lib/auth/session.server";

export async function loader() {
  return redirect("/login");
}

// Sign-out is an action: a link or image cannot sign anybody out.
export async function action({ request }: Route.ActionArgs) {
  const cookie = await endSession(request);
  return redirect("/login?signedOut=1", { headers: { "Set-Cookie": cookie } });
}
