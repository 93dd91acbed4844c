/*
 * The configurator in Debian's Chromium (WebGL through SwiftShader): draw calls of the 3D preview
 * for a whole pit with a patio, and how long after a slider step the plan summary changes on screen.
 */
import { chromium, type Page } from "@playwright/test";

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

/**
 * One slider step: keydown to painted frame, split into the wait before the plan request, the request, and the rest.
 */
export type StepTiming = { totalMs: number; waitMs: number; requestMs: number; renderMs: number };

export type BrowserFigures = { drawCalls: number; triangles: number; steps: StepTiming[] };

type SceneWindow = Window & { __emberwrightScene?: { drawCalls: number; triangles: number } };

const SAMPLES = 5;

export async function measureConfiguratorInBrowser(origin: string): Promise<BrowserFigures> {
  const browser = await chromium.launch({
    executablePath: CHROMIUM_PATH,
    args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--enable-unsafe-swiftshader"],
  });
  try {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.goto(`${origin}/c/cinder-slate?patio=8&liner=firebrick`);
    const scene = await pollScene(page);
    // Until hydration the form offers a no-JS submit button; its absence means React is in charge.
    await page.getByRole("button", { name: "Update the design" }).waitFor({ state: "detached", timeout: 20_000 });
    const steps: StepTiming[] = [];
    const slider = page.getByRole("slider", { name: /Inside diameter/ });
    await slider.focus();
    for (let i = 0; i < SAMPLES; i++) {
      // Start each step from a settled page: no plan request in flight, no pending frame.
      await page
        .locator('section[aria-labelledby="plan-summary-title"][aria-busy="false"]')
        .waitFor({ timeout: 10_000 });
      await page.waitForTimeout(300);
      steps.push(await timeOneStep(page));
    }
    return { drawCalls: scene.drawCalls, triangles: scene.triangles, steps };
  } finally {
    await browser.close();
  }
}

async function pollScene(page: Page) {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const stats = await page.evaluate(() => (window as SceneWindow).__emberwrightScene ?? null);
    if (stats && stats.drawCalls > 0) return stats;
    await page.waitForTimeout(200);
  }
  throw new Error("The 3D preview reported no draw calls within 30 s.");
}

/*
 * Runs in the page. Kept as a string: tsx compiles functions with a `__name` helper that does not
 * exist in the page, so a function handed to page.evaluate could not declare named helpers.
 */
const ARM_STEP_TIMER = `(() => {
  performance.setResourceTimingBufferSize(5000);
  const summary = () => document.querySelector('[data-testid="plan-summary"]')?.textContent ?? "";
  const before = summary();
  window.__benchStep = new Promise((resolve, reject) => {
    let startedAt = 0;
    document.addEventListener("keydown", () => { startedAt = performance.now(); }, { capture: true, once: true });
    const observer = new MutationObserver(() => {
      if (!startedAt || summary() === before) return;
      observer.disconnect();
      requestAnimationFrame(() => {
        const paintedAt = performance.now();
        // The request's timing entry can land a moment after its response is used: look a little later.
        setTimeout(() => {
          const request = performance.getEntriesByType("resource").filter((e) => e.name.includes("/api/plan") && e.startTime >= startedAt).pop();
          resolve({
            totalMs: paintedAt - startedAt,
            waitMs: request ? request.startTime - startedAt : NaN,
            requestMs: request ? request.responseEnd - request.startTime : NaN,
            renderMs: request ? paintedAt - request.responseEnd : NaN,
          });
        }, 200);
      });
    });
    observer.observe(document.body, { subtree: true, childList: true, characterData: true });
    setTimeout(() => { observer.disconnect(); reject(new Error("The plan summary did not change within 5 s of a slider step.")); }, 5000);
  });
})()`;

/**
 * Milliseconds from the keydown to the first animation frame after the summary's text changed: the
 * clock starts in the page at the key event and stops at the frame after the DOM change. The plan
 * request's resource timing splits that into waiting, the request itself and rendering.
 */
async function timeOneStep(page: Page): Promise<StepTiming> {
  await page.evaluate(ARM_STEP_TIMER);
  await page.keyboard.press("ArrowRight");
  return page.evaluate("window.__benchStep") as Promise<StepTiming>;
}
