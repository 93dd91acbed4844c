import { useEffect, useState, type RefObject } from "react";
import { PitPlanSvg } from "~/components/pit-plan-svg";
import type { PitSceneInput } from "~/domain/pit-layout";
import { formatLength, type LengthUnit } from "~/domain/units";
import type { PublicPlan } from "~/lib/design/design-plan";
import { formatMoneyWhole } from "~/lib/format/money";

// The strip's height plus a little air: focused controls scroll clear of it (WCAG 2.2 SC 2.4.11).
const STRIP_CLEARANCE = "5.5rem";

/**
 * On phones, once the preview and price have scrolled out of view, a slim strip at the top of the
 * screen keeps the price, a small plan and the key sizes in sight while the controls below change
 * them. It is fixed (it moves nothing on the page, so no layout shift), shown only after hydration,
 * and hidden from wide screens, where the preview column itself stays in view.
 */
export function PreviewStrip({
  watch,
  plan,
  sceneInput,
  unit,
  previewId,
}: {
  /** The element (the price card) whose leaving the screen brings the strip in. */
  watch: RefObject<HTMLElement | null>;
  plan: PublicPlan;
  sceneInput: PitSceneInput | null;
  unit: LengthUnit;
  previewId: string;
}) {
  const [isShown, setIsShown] = useState(false);

  useEffect(() => {
    const target = watch.current;
    if (!target || typeof IntersectionObserver === "undefined") return;
    const observer = new IntersectionObserver(([entry]) => {
      // Shown only once the card is above the screen, not while the page is still above it.
      setIsShown(Boolean(entry && !entry.isIntersecting && entry.boundingClientRect.bottom <= 0));
    });
    observer.observe(target);
    return () => observer.disconnect();
  }, [watch]);

  useEffect(() => {
    const narrow = window.matchMedia("(max-width: 1023.98px)").matches;
    if (!isShown || !narrow) return;
    const root = document.documentElement;
    const before = root.style.scrollPaddingTop;
    root.style.scrollPaddingTop = STRIP_CLEARANCE;
    return () => {
      root.style.scrollPaddingTop = before;
    };
  }, [isShown]);

  if (!isShown) return null;
  const f = (inches: number) => formatLength(inches, unit);
  return (
    <div
      className="fixed inset-x-0 top-0 z-30 border-b border-ash-300 bg-white/95 shadow-md backdrop-blur lg:hidden"
      data-testid="preview-strip"
    >
      <div className="mx-auto flex max-w-3xl items-center gap-3 px-3 py-2">
        {sceneInput ? (
          <div
            className="h-14 w-14 shrink-0 overflow-hidden rounded-md border border-ash-200 bg-ash-100"
            aria-hidden="true"
          >
            <PitPlanSvg input={sceneInput} unit={unit} className="h-full w-full" />
          </div>
        ) : null}
        <div className="min-w-0 flex-1">
          <p className="text-lg leading-tight font-extrabold text-char-900 tabular-nums">
            {plan.price
              ? `${formatMoneyWhole(plan.price.lowCents)} – ${formatMoneyWhole(plan.price.highCents)}`
              : "Price on request"}
          </p>
          <p className="truncate text-xs text-char-700">
            Bowl {f(plan.ring.bowlDiameterIn)} · {f(plan.ring.wallHeightIn)} high
            {plan.patio ? " · with patio" : ""}
          </p>
        </div>
        <a href={`#${previewId}`} className="btn-quiet shrink-0 text-sm">
          See it
        </a>
      </div>
    </div>
  );
}
