import { Link } from "react-router";
import type { Route } from "./+types/app-jobs";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { STAFF_ROLES } from "~/db/enums";
import { formatInches } from "~/domain/units";
import { listWonJobs } from "~/lib/leads/won-jobs.server";
import { currentVersion } from "~/lib/leads/lead-workspace.server";
import { requireUser } from "~/lib/auth/session.server";
import { isOfficeRole } from "~/lib/auth/staff.server";

export const meta: Route.MetaFunction = () => [{ title: "Jobs · Emberwright" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const isOffice = isOfficeRole(user.role);
  // Crew see only the signed jobs given to them; the office sees every signed job of the company.
  const rows = await listWonJobs(user);
  const jobs = await Promise.all(
    rows.map(async ({ lead, crewName }) => {
      const { plan } = await currentVersion(lead);
      return {
        id: lead.id,
        customerName: lead.customerName,
        street: lead.street,
        town: lead.town,
        crewName,
        summary: `${formatInches(plan.ring.bowlDiameterIn)} bowl, ${lead.stoneName}, ${plan.ring.unitsPerCourse} a course × ${plan.ring.courses}${plan.caps ? `, ${plan.caps.count} caps` : ""}${plan.patio ? ", patio" : ""}`,
      };
    }),
  );
  return { jobs, isOffice };
}

export default function JobsRoute({ loaderData }: Route.ComponentProps) {
  const { jobs, isOffice } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-extrabold">{isOffice ? "Won jobs" : "My jobs"}</h1>
        <p className="text-char-600">
          {isOffice
            ? "Every signed job and the crew building it."
            : "The jobs you are building: the cut sheet, the cap template and the material order."}
        </p>
      </div>
      {jobs.length === 0 ? (
        <p className="card p-6 text-char-600">
          {isOffice ? "No signed jobs yet." : "No jobs are assigned to you yet."}
        </p>
      ) : (
        <ul className="grid gap-4 md:grid-cols-2">
          {jobs.map((job) => (
            <li key={job.id} className="flex flex-col gap-3 card p-5">
              <div>
                <h2 className="text-lg font-extrabold">
                  <Link to={`/app/leads/${job.id}`} className="hover:underline">
                    {job.customerName}
                  </Link>
                </h2>
                <p className="text-sm text-char-700">
                  {job.street}, {job.town}
                </p>
              </div>
              <p className="text-sm">{job.summary}</p>
              {isOffice ? <p className="text-sm text-char-600">Crew: {job.crewName ?? "not given yet"}</p> : null}
              <div className="mt-auto flex flex-wrap gap-2">
                <Link to={`/app/leads/${job.id}/cut-sheet`} className="btn-primary">
                  Cut sheet
                </Link>
                <a href={`/app/leads/${job.id}/cut-sheet.pdf`} className="btn-quiet" download>
                  PDF with cap template
                </a>
                <Link to={`/app/leads/${job.id}`} className="btn-quiet">
                  Job details
                </Link>
              </div>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
