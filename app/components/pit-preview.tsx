import { Component, Suspense, lazy, startTransition, useEffect, useState, type ErrorInfo, type ReactNode } from "react";
import { PitPlanSvg } from "~/components/pit-plan-svg";
import type { LengthUnit } from "~/domain/units";
import type { PitSceneInput } from "~/domain/pit-layout";

export type PitPreviewProps = {
  input: PitSceneInput;
  /** Key dimensions in words, shown under the preview. */
  caption: string;
  unit: LengthUnit;
  formatLength: (inches: number) => string;
  /** Sizes the drawing's frame (default: square on phones, 4:3 from small screens up). */
  frameClassName?: string;
  /** An id for the figure, so a link can bring it into view. */
  id?: string;
};

// three.js and react-three-fiber arrive only through this import, after hydration, on the client.
// The server build drops the branch entirely, so no 3D code lands in the server bundle either.
const PitScene = import.meta.env.SSR ? null : lazy(() => import("~/scene/pit-scene"));

/** How long the page stays as loaded (plan drawing) before the 3D code starts, unless the visitor reaches for it. */
const SETTLE_MS = 2500;
/** How long the browser may stay busy after that before the 3D preview starts loading anyway. */
const IDLE_TIMEOUT_MS = 3000;

let sceneModule: Promise<unknown> | undefined;
let hurry = () => {};

/**
 * Loads the 3D code once the page has loaded, settled for a moment and the browser is idle, in two steps
 * (three.js first, then the scene with react-three-fiber), so neither the first paint nor hydration
 * waits for it and its parsing is split over two tasks instead of one long one. Shared by every
 * preview on the page.
 */
function loadSceneWhenIdle(): Promise<unknown> {
  sceneModule ??= new Promise<void>((resolve) => {
    hurry = resolve;
    void afterLoad()
      .then(() => new Promise((settled) => setTimeout(settled, SETTLE_MS)))
      .then(idle)
      .then(resolve);
  })
    .then(() => import("~/scene/three-core"))
    .then(idle)
    .then(() => import("~/scene/pit-scene"));
  return sceneModule;
}

/** The visitor reached for the preview: stop waiting for the page to settle. */
function loadSceneSoon() {
  void loadSceneWhenIdle();
  hurry();
}

function afterLoad(): Promise<void> {
  return new Promise((resolve) => {
    if (document.readyState === "complete") resolve();
    else window.addEventListener("load", () => resolve(), { once: true });
  });
}

function idle(): Promise<void> {
  return new Promise((resolve) => {
    if (typeof window.requestIdleCallback === "function")
      window.requestIdleCallback(() => resolve(), { timeout: IDLE_TIMEOUT_MS });
    else setTimeout(resolve, 200);
  });
}

const UNAVAILABLE_NOTE = "3D preview unavailable on this device; showing the plan";

let hasWebGl: boolean | undefined;

/** True when this browser can create a WebGL context; the test context is released at once. Asked once a page load. */
function detectWebGl(): boolean {
  hasWebGl ??= probeWebGl();
  return hasWebGl;
}

function probeWebGl(): boolean {
  try {
    const canvas = document.createElement("canvas");
    const gl = canvas.getContext("webgl2") ?? canvas.getContext("webgl");
    if (!gl) return false;
    gl.getExtension("WEBGL_lose_context")?.loseContext();
    return true;
  } catch {
    return false;
  }
}

/** `?preview=2d` forces the plan drawing (for tests, and for anyone who prefers it). */
function isPlanForced(search: string): boolean {
  return new URLSearchParams(search).get("preview") === "2d";
}

type SceneBoundaryProps = { fallback: ReactNode; onError: () => void; children: ReactNode };

/** Keeps a failing 3D scene (lost context, driver trouble) from taking the whole page down. */
class SceneBoundary extends Component<SceneBoundaryProps, { hasFailed: boolean }> {
  state = { hasFailed: false };

  static getDerivedStateFromError() {
    return { hasFailed: true };
  }

  componentDidCatch(error: unknown, info: ErrorInfo) {
    console.warn("The 3D pit preview failed; showing the plan instead.", error, info.componentStack);
    this.props.onError();
  }

  render() {
    return this.state.hasFailed ? this.props.fallback : this.props.children;
  }
}

type Support = "checking" | "webgl" | "none" | "forced-plan";

function detectSupport(): Support {
  if (isPlanForced(window.location.search)) return "forced-plan";
  return PitScene && detectWebGl() ? "webgl" : "none";
}

/**
 * What this browser can show, asked in the first idle moment after hydration rather than while
 * rendering: creating a WebGL context to find out takes one long task on a phone, and the plan
 * drawing the server sent stays in place until then either way.
 */
function useSupport(): Support {
  const [support, setSupport] = useState<Support>(() => (hasWebGl === undefined ? "checking" : detectSupport()));
  useEffect(() => {
    if (support !== "checking") return;
    let isCurrent = true;
    void idle().then(() => isCurrent && startTransition(() => setSupport(detectSupport())));
    return () => {
      isCurrent = false;
    };
    // Once, when the preview first runs in the browser.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);
  return support;
}

/**
 * The pit preview on a page: the plan on the server and until the 3D view is ready, then a 3D view with a plan toggle.
 */
export function PitPreview({
  input,
  caption,
  unit,
  formatLength,
  frameClassName = "aspect-square sm:aspect-[4/3]",
  id,
}: PitPreviewProps) {
  const support = useSupport();
  const [view, setView] = useState<"3d" | "plan">("3d");
  const [hasSceneFailed, setHasSceneFailed] = useState(false);
  const [resetSignal, setResetSignal] = useState(0);
  // The plan drawing (same frame, same size) stays until the 3D code has arrived in an idle moment.
  const [isSceneLoaded, setIsSceneLoaded] = useState(false);
  const wantsScene = support === "webgl" && !hasSceneFailed && view === "3d";
  useEffect(() => {
    if (!wantsScene || isSceneLoaded) return;
    let isCurrent = true;
    loadSceneWhenIdle().then(
      () => isCurrent && setIsSceneLoaded(true),
      () => isCurrent && setHasSceneFailed(true),
    );
    return () => {
      isCurrent = false;
    };
  }, [wantsScene, isSceneLoaded]);
  const loadSceneNow = () => {
    if (wantsScene && !isSceneLoaded) loadSceneSoon();
  };

  const can3d = support === "webgl" && !hasSceneFailed && PitScene !== null;
  const shows3d = can3d && view === "3d" && isSceneLoaded;
  const showsNote = support === "none" || hasSceneFailed;
  const plan = (
    <PitPlanSvg input={input} unit={unit} formatLength={formatLength} className="h-full w-full" tabIndex={0} />
  );
  const planWithNote = (
    <div className="flex h-full w-full flex-col">
      <div className="min-h-0 flex-1">{plan}</div>
      <p role="status" className="px-3 pb-2 text-center text-xs font-semibold text-char-600">
        {UNAVAILABLE_NOTE}
      </p>
    </div>
  );

  return (
    <figure className="overflow-hidden card" id={id}>
      <div
        className={`relative w-full bg-ash-100 ${frameClassName}`}
        data-preview={shows3d ? "3d" : "plan"}
        onPointerEnter={loadSceneNow}
        onFocus={loadSceneNow}
      >
        {shows3d && PitScene ? (
          <SceneBoundary fallback={planWithNote} onError={() => setHasSceneFailed(true)}>
            <Suspense fallback={plan}>
              <PitScene input={input} resetSignal={resetSignal} className="h-full w-full" description={caption} />
            </Suspense>
          </SceneBoundary>
        ) : showsNote ? (
          planWithNote
        ) : (
          plan
        )}
      </div>
      <div className="flex flex-wrap items-center justify-between gap-2 border-t border-ash-200 bg-ash-50 px-3 py-2">
        <div role="group" aria-label="Preview" className="inline-flex gap-1">
          <button
            type="button"
            className={view === "3d" && can3d ? "btn-primary" : "btn-quiet"}
            aria-pressed={view === "3d" && can3d}
            disabled={!can3d}
            onClick={() => setView("3d")}
          >
            3D view
          </button>
          <button
            type="button"
            className={view === "3d" && can3d ? "btn-quiet" : "btn-primary"}
            aria-pressed={!(view === "3d" && can3d)}
            onClick={() => setView("plan")}
          >
            Plan view
          </button>
        </div>
        <button type="button" className="btn-quiet" disabled={!shows3d} onClick={() => setResetSignal((n) => n + 1)}>
          Reset view
        </button>
      </div>
      <figcaption className="px-4 py-3 text-sm text-char-700">{caption}</figcaption>
    </figure>
  );
}
