import type { Route } from "./+types/proposal-opened";
import { getSessionUser } from "~/lib/auth/session.server";
import { countsAsOpen, findProposalByToken, recordOpened } from "~/lib/proposals/proposals.server";
import { postOnly } from "~/lib/platform/post-only.server";

/**
 * POST /p/:token/opened: the proposal page, once shown, counts the homeowner's visit. The link is the
 * credential; staff of the company previewing it, and links withdrawn or expired, are not counted.
 */
export const loader = postOnly("The proposal page posts here when it is shown.");

export async function action({ request, params }: Route.ActionArgs) {
  const found = await findProposalByToken(params.token);
  if (!found) return new Response("Not found", { status: 404 });
  const now = new Date();
  if (countsAsOpen(found.proposal, await getSessionUser(request), now)) await recordOpened(found.proposal.id, now);
  return new Response(null, { status: 204 });
}
