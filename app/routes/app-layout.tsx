import { Outlet } from "react-router";
import type { Route } from "./+types/app-layout";
import { WorkspaceShell } from "~/components/workspace-shell";
import { STAFF_ROLES } from "~/db/schema";
import { getCompany } from "~/lib/catalog.server";
import { requireUser } from "~/lib/session.server";

// The shell needs the user for its header; each child loader still checks access itself.
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const company = await getCompany(user.companyId);
  return { user: { name: user.name, role: user.role }, companyName: company.name };
}

export default function AppLayoutRoute({ loaderData }: Route.ComponentProps) {
  return (
    <WorkspaceShell user={loaderData.user} companyName={loaderData.companyName}>
      <Outlet />
    </WorkspaceShell>
  );
}
