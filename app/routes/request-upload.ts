import type { Route } from "./+types/request-upload";
import { receiveLeadRequest } from "~/lib/leads/lead-request.server";
import { postOnly } from "~/lib/platform/post-only.server";

/*
 * The request form's upload endpoint for browsers with JavaScript: the same checks as the
 * configurator's own action (a plain form post, which keeps working without JavaScript), answered
 * in JSON so the page can show the upload's progress and then go to the sent page, or show the
 * refusal beside each field without a reload.
 */

export const loader = postOnly("Send the request form from the contractor's page.");

export async function action({ request, params, context }: Route.ActionArgs) {
  const outcome = await receiveLeadRequest({ request, companySlug: params.companySlug, context });
  if (outcome.ok) return Response.json({ location: outcome.location });
  return Response.json(
    { errors: outcome.errors, values: outcome.values },
    { status: outcome.status, headers: outcome.headers },
  );
}
