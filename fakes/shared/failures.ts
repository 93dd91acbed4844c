/**
 * Failure injection shared by the fakes: tests arm a failure for the next N requests, or for every
 * request until a time; each request that fails uses one up, and a spent or lapsed plan ends itself.
 */
export interface FailurePlan {
  /** Requests left to fail, or null when failing by time. */
  remaining: number | null;
  /** Epoch milliseconds when a timed failure ends, or null when failing by count. */
  untilMs: number | null;
}

/** The plan still in force at `nowMs`, or null once spent or lapsed. */
export function activeFailure<P extends FailurePlan>(plan: P | null, nowMs: number): P | null {
  if (!plan) return null;
  if (plan.remaining !== null && plan.remaining <= 0) return null;
  if (plan.untilMs !== null && nowMs >= plan.untilMs) return null;
  return plan;
}

/** Whether this request fails under `plan`; a counted failure is used up. */
export function takeFailure(plan: FailurePlan | null, nowMs: number): boolean {
  const active = activeFailure(plan, nowMs);
  if (!active) return false;
  if (active.remaining !== null) active.remaining -= 1;
  return true;
}
