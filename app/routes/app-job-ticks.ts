import type { Route } from "./+types/app-job-ticks";
import { findLeadFor, parseLeadId, requireApiUser } from "~/lib/auth/staff.server";
import { tickSyncSchema } from "~/lib/builds/job-site-schema";
import { applyTickChanges, jobBuildSteps } from "~/lib/builds/job-site.server";
import { isSignedStage } from "~/lib/leads/lead-status";
import { postOnly } from "~/lib/platform/post-only.server";

/*
 * The checklist's sync: a phone posts the tick changes it kept (JSON), each with its own id and the
 * phone's time; the answer says which were recorded, which a later change had overtaken, which
 * named no step of this job, and the checklist as it now stands.
 */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireApiUser(request, ["owner", "crew"]);
  const lead = await findLeadFor(user, parseLeadId(params.leadId));
  if (!lead || !isSignedStage(lead.status))
    return Response.json({ errors: [{ path: "", message: "We could not find that job." }] }, { status: 404 });
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    return Response.json(
      { errors: [{ path: "", message: 'Send the changes as JSON: {"changes": [...]}.' }] },
      { status: 400 },
    );
  }
  const parsed = tickSyncSchema.safeParse(body);
  if (!parsed.success) {
    const errors = parsed.error.issues.map((i) => ({ path: i.path.join("."), message: i.message }));
    return Response.json({ errors }, { status: 400 });
  }
  const { steps } = await jobBuildSteps(lead);
  const result = await applyTickChanges(user, lead, parsed.data.changes, steps);
  return Response.json(result);
}

/** The sync takes posts only. */
export const loader = postOnly("The job page posts its checklist ticks here.");
