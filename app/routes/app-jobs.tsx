import { Link } from "react-router";
import type { Route } from "./+types/app-jobs";
import { WorkspaceProblem } from "~/components/workspace-problem";
import { STAFF_ROLES } from "~/db/enums";
import { formatInches } from "~/domain/units";
import { listWonJobs, orderCrewJobs } from "~/lib/leads/won-jobs.server";
import { currentVersion } from "~/lib/leads/lead-workspace.server";
import { describeBuildDays } from "~/lib/builds/builds.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { zonedDay } from "~/lib/format/zoned-time";
import { STATUS_LABEL } from "~/lib/leads/lead-status";
import { requireUser } from "~/lib/auth/session.server";
import { isOfficeRole } from "~/lib/auth/staff.server";

export const meta: Route.MetaFunction = () => [{ title: "Jobs · Emberwright" }];

type Group = "coming" | "undated" | "past";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const isOffice = isOfficeRole(user.role);
  const company = await getCompany(user.companyId);
  const today = zonedDay(new Date(), company.timeZone);
  // Crew see the signed jobs given to them or whose booked build they are on, the next build day
  // first; the office sees every signed job of the company, the latest change first.
  const rows = await listWonJobs(user);
  const ordered = isOffice ? rows : orderCrewJobs(rows, today);
  const jobs = await Promise.all(
    ordered.map(async ({ lead, crewName, buildDays }) => {
      const { plan } = await currentVersion(lead);
      const group: Group = buildDays.length === 0 ? "undated" : buildDays.some((d) => d >= today) ? "coming" : "past";
      return {
        id: lead.id,
        customerName: lead.customerName,
        street: lead.street,
        town: lead.town,
        stage: STATUS_LABEL[lead.status],
        crewName,
        group,
        buildDays: buildDays.length ? describeBuildDays(buildDays) : null,
        isToday: buildDays.includes(today),
        summary: `${formatInches(plan.ring.bowlDiameterIn)} bowl, ${lead.stoneName}, ${plan.ring.unitsPerCourse} a course × ${plan.ring.courses}${plan.caps ? `, ${plan.caps.count} caps` : ""}${plan.patio ? ", patio" : ""}`,
      };
    }),
  );
  return { jobs, isOffice };
}

const GROUP_TITLE: Record<Group, string> = {
  coming: "Coming up",
  undated: "Not on the calendar yet",
  past: "Build days past",
};

type Job = Route.ComponentProps["loaderData"]["jobs"][number];

export default function JobsRoute({ loaderData }: Route.ComponentProps) {
  const { jobs, isOffice } = loaderData;
  const groups = (["coming", "undated", "past"] as const)
    .map((g) => ({ group: g, jobs: jobs.filter((j) => j.group === g) }))
    .filter((g) => g.jobs.length);
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-extrabold">{isOffice ? "Won jobs" : "My jobs"}</h1>
        <p className="text-char-600">
          {isOffice
            ? "Every signed job, its build days and the crew building it."
            : "The jobs you are building, the next build day first: the day's checklist, the cut sheet and the material order."}
        </p>
      </div>
      {jobs.length === 0 ? (
        <p className="card p-6 text-char-600">
          {isOffice ? "No signed jobs yet." : "No jobs are assigned to you yet."}
        </p>
      ) : isOffice ? (
        <JobList jobs={jobs} isOffice />
      ) : (
        groups.map(({ group, jobs: inGroup }) => (
          <section key={group} aria-labelledby={`jobs-${group}`} className="flex flex-col gap-3">
            <h2 id={`jobs-${group}`} className="text-lg font-extrabold">
              {GROUP_TITLE[group]}
            </h2>
            <JobList jobs={inGroup} isOffice={false} />
          </section>
        ))
      )}
    </div>
  );
}

function JobList({ jobs, isOffice }: { jobs: Job[]; isOffice: boolean }) {
  // The office's list sits under the page title; the crew's under a group's heading.
  const Heading = isOffice ? "h2" : "h3";
  return (
    <ul className="grid gap-4 md:grid-cols-2">
      {jobs.map((job) => (
        <li key={job.id} className="flex flex-col gap-3 card p-5">
          <div>
            <Heading className="text-lg font-extrabold">
              <Link to={`/app/leads/${job.id}`} className="hover:underline">
                {job.customerName}
              </Link>
            </Heading>
            <p className="text-sm text-char-700">
              {job.street}, {job.town}
            </p>
          </div>
          <p className={`text-sm ${job.isToday ? "font-extrabold text-ember-700" : "font-bold"}`}>
            {job.buildDays
              ? `${job.isToday ? "Building today. " : ""}Build days: ${job.buildDays}`
              : "No build days yet"}
          </p>
          <p className="text-sm">{job.summary}</p>
          <p className="text-sm text-char-600">
            {job.stage}
            {isOffice ? ` · Crew: ${job.crewName ?? "not given yet"}` : ""}
          </p>
          <div className="mt-auto flex flex-wrap gap-2">
            <Link to={`/app/jobs/${job.id}`} className="btn-primary">
              On site
            </Link>
            <Link to={`/app/leads/${job.id}/cut-sheet`} className="btn-quiet">
              Cut sheet
            </Link>
            <a href={`/app/leads/${job.id}/cut-sheet.pdf`} className="btn-quiet" download>
              PDF with cap template
            </a>
          </div>
        </li>
      ))}
    </ul>
  );
}

/** A missing or forbidden record shows its problem inside the workspace, navigation kept. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <WorkspaceProblem error={error} />;
}
