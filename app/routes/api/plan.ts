import type { Route } from "./+types/plan";
import { formatPlanErrors, planRequestSchema } from "~/lib/design/plan-schema";
import { PlanRequestError, publicPlan, resolvePlanRequest, runPlan } from "~/lib/design/plan.server";
import { getSessionUser } from "~/lib/auth/session.server";
import { postOnly } from "~/lib/platform/post-only.server";

const MAX_BODY_BYTES = 64 * 1024;

const json = (body: unknown, status = 200) => Response.json(body, { status, headers: { "Cache-Control": "no-store" } });

export const loader = postOnly("Send the design with POST as JSON.");

// The estimating engine over HTTP: the configurator, the inbox and outside clients call this.
export async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return json({ errors: [{ path: "", message: "Use POST." }] }, 405);
  const text = await request.text();
  if (text.length > MAX_BODY_BYTES) {
    return json({ errors: [{ path: "", message: "The request body is larger than 64 KB." }] }, 413);
  }
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    return json({ errors: [{ path: "", message: "The request body is not valid JSON." }] }, 400);
  }
  const parsed = planRequestSchema.safeParse(body);
  if (!parsed.success) return json({ errors: formatPlanErrors(parsed.error) }, 422);
  try {
    const resolved = await resolvePlanRequest(parsed.data);
    const plan = runPlan(resolved);
    // Staff of the same company see the cost breakdown; everyone else the range only.
    const user = resolved.company ? await getSessionUser(request) : null;
    const isOwnStaff =
      user && user.companyId === resolved.company?.id && (user.role === "owner" || user.role === "estimator");
    return json(isOwnStaff ? plan : publicPlan(plan));
  } catch (error) {
    if (error instanceof PlanRequestError) return json({ errors: error.errors }, error.status);
    throw error;
  }
}
