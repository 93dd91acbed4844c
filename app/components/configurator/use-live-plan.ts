import { useEffect, useRef, useState } from "react";
import { useFetcher } from "react-router";
import type { CatalogChoice, Design } from "~/lib/design";
import { designToPlanRequest, type PublicPlan } from "~/lib/design-plan";
import type { PlanFieldError } from "~/lib/plan-schema";

// A change is sent at once; further changes within this window (a slider drag) are folded into
// one trailing request, so the screen answers the first step without waiting.
const UPDATE_WINDOW_MS = 60;

/**
 * A design being edited with its plan kept current: each change asks POST /api/plan through a
 * fetcher (throttled; a newer submission cancels an older one, so stale answers never land).
 * Pages that use it should skip revalidating their loader for "/api/plan" submissions.
 */
export function useLivePlan(args: {
  initial: { design: Design | null; plan: PublicPlan | null; planErrors: PlanFieldError[] };
  companySlug: string;
  catalog: CatalogChoice[];
  onDesignChange?: (design: Design) => void;
}) {
  const { initial, companySlug, catalog, onDesignChange } = args;
  const [design, setDesign] = useState(initial.design);
  const [plan, setPlan] = useState(initial.plan);
  const [planErrors, setPlanErrors] = useState(initial.planErrors);
  const fetcher = useFetcher<PublicPlan | { errors: PlanFieldError[] }>();
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const pending = useRef<Design | null>(null);

  useEffect(() => {
    setDesign(initial.design);
    setPlan(initial.plan);
    setPlanErrors(initial.planErrors);
  }, [initial.design, initial.plan, initial.planErrors]);
  useEffect(() => {
    if (!fetcher.data) return;
    if ("errors" in fetcher.data) setPlanErrors(fetcher.data.errors);
    else {
      setPlan(fetcher.data);
      setPlanErrors([]);
    }
  }, [fetcher.data]);

  const send = (next: Design) =>
    fetcher.submit(designToPlanRequest(next, companySlug, catalog) as never, { method: "post", action: "/api/plan", encType: "application/json" });
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
