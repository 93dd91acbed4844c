import { useRef, useState } from "react";
import { useFetcher } from "react-router";
import type { CompanyFactors } from "~/domain/factors";
import type { CatalogChoice, Design } from "~/lib/design/design";
import { designToSearchParams } from "~/lib/design/design";
import { designToPlanRequest, planLocally, type PublicPlan } from "~/lib/design/design-plan";
import type { PlanFieldError } from "~/lib/design/plan-schema";

// A change is sent at once; further changes within this window (a slider drag) are folded into
// one trailing request, so the screen answers the first step without waiting.
const UPDATE_WINDOW_MS = 60;

/**
 * A design being edited with its plan kept current. Each change redraws at once from the engine run
 * in the browser (geometry only, the last price kept), then asks POST /api/plan through a fetcher
 * for the priced answer (throttled; an answer for an older design than the latest is dropped).
 * Pages that use it should skip revalidating their loader for "/api/plan" submissions.
 */
export function useLivePlan(args: {
  initial: { design: Design | null; plan: PublicPlan | null; planErrors: PlanFieldError[] };
  companySlug: string;
  catalog: CatalogChoice[];
  /** The company's factors the browser may see (publicFactors), so the instant redraw matches the server's plan. */
  factors?: Partial<CompanyFactors>;
  onDesignChange?: (design: Design) => void;
}) {
  const { initial, companySlug, catalog, factors, onDesignChange } = args;
  const [design, setDesign] = useState(initial.design);
  const [plan, setPlan] = useState(initial.plan);
  const [planErrors, setPlanErrors] = useState(initial.planErrors);
  const fetcher = useFetcher<PublicPlan | { errors: PlanFieldError[] }>();
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const pending = useRef<Design | null>(null);
  // The last edit's key and the key of the last design sent: an answer counts only while they match.
  const [latestKey, setLatestKey] = useState<string | null>(null);
  const [sentKey, setSentKey] = useState<string | null>(null);

  // New loader data (a revalidation, another lead) replaces the design being edited. Adjusted while
  // rendering rather than in an effect, so the stale design is never painted.
  const [shownInitial, setShownInitial] = useState(initial);
  if (
    shownInitial.design !== initial.design ||
    shownInitial.plan !== initial.plan ||
    shownInitial.planErrors !== initial.planErrors
  ) {
    setShownInitial(initial);
    setDesign(initial.design);
    setPlan(initial.plan);
    setPlanErrors(initial.planErrors);
  }
  // Each priced answer is taken once, when it arrives, unless a newer edit is still waiting to go.
  const [seenAnswer, setSeenAnswer] = useState(fetcher.data);
  if (fetcher.data !== seenAnswer) {
    setSeenAnswer(fetcher.data);
    if (fetcher.data && sentKey === latestKey) {
      if ("errors" in fetcher.data) setPlanErrors(fetcher.data.errors);
      else {
        setPlan(fetcher.data);
        setPlanErrors([]);
      }
    }
  }

  const send = (next: Design) => {
    setSentKey(designToSearchParams(next).toString());
    // The body is a typed plan request; React Router's JSON type does not accept optional fields,
    // hence the cast (the server parses it with planRequestSchema).
    fetcher.submit(designToPlanRequest(next, companySlug, catalog, factors) as never, {
      method: "post",
      action: "/api/plan",
      encType: "application/json",
    });
  };
  const flush = () => {
    timer.current = null;
    const next = pending.current;
    if (!next) return;
    pending.current = null;
    send(next);
    timer.current = setTimeout(flush, UPDATE_WINDOW_MS);
  };
  const changeDesign = (patch: Partial<Design>) => {
    if (!design) return;
    const next = { ...design, ...patch };
    setDesign(next);
    setLatestKey(designToSearchParams(next).toString());
    const local = planLocally(next, catalog, factors);
    if (local) setPlan((previous) => ({ ...local, price: previous?.price ?? null }));
    onDesignChange?.(next);
    if (timer.current) {
      pending.current = next;
      return;
    }
    send(next);
    timer.current = setTimeout(flush, UPDATE_WINDOW_MS);
  };

  return { design, plan, planErrors, changeDesign, isUpdating: fetcher.state !== "idle" };
}
