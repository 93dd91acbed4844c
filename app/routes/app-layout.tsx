import { Link, Outlet } from "react-router";
import type { Route } from "./+types/app-layout";
import { WorkspaceShell } from "~/components/workspace-shell";
import { STAFF_ROLES } from "~/db/enums";
import { getCompany } from "~/lib/catalog/catalog.server";
import { countFailedWork } from "~/lib/jobs/attention.server";
import { requireUser } from "~/lib/auth/session.server";

// The shell needs the user for its header; each child loader still checks access itself.
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const company = await getCompany(user.companyId);
  // Owners are told when background work (e-mails, refunds) gave up; the list is at /app/attention.
  const failedWork = user.role === "owner" ? await countFailedWork(user.companyId) : 0;
  return { user: { name: user.name, role: user.role }, companyName: company.name, failedWork };
}

export default function AppLayoutRoute({ loaderData }: Route.ComponentProps) {
  return (
    <WorkspaceShell user={loaderData.user} companyName={loaderData.companyName}>
      {loaderData.failedWork > 0 ? (
        <p
          role="status"
          className="mb-4 rounded-lg border border-ember-300 bg-ember-50 px-4 py-3 text-sm font-semibold text-char-800"
        >
          {loaderData.failedWork === 1 ? "One e-mail or refund" : `${loaderData.failedWork} e-mails or refunds`} could
          not go through.{" "}
          <Link to="/app/attention" className="text-ember-700 underline">
            See what needs attention
          </Link>
        </p>
      ) : null}
      <Outlet />
    </WorkspaceShell>
  );
}
