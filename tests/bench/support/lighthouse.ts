/*
 * Lighthouse 12.2.3 with its default config (the mobile preset: a phone-sized screen, simulated
 * slow 4G and a 4x slower CPU) against Debian's Chromium, started through chrome-launcher.
 */
import { writeFile } from "node:fs/promises";
import path from "node:path";
import { killAll, launch } from "chrome-launcher";
import lighthouse from "lighthouse";
import { CHROMIUM_PATH } from "./browser";
import { freePort } from "./processes";

export type LighthouseFigures = {
  score: number;
  lcpMs: number;
  cls: number;
  tbtMs: number;
  fcpMs: number;
  /** Audits Lighthouse could not compute (diagnostics only when the metrics above are numbers). */
  auditErrors: string[];
};

/**
 * Audits each URL in turn, each in a fresh Chromium so one page's leftovers (the configurator's
 * WebGL work) cannot disturb the next; `headers` go with every request (e.g. a session cookie).
 * Each full report is kept as `<saveDir>/lighthouse-<name>.json` for a closer look. A page whose
 * audit fails gets its Error in place of figures, so one bad page does not cost the others.
 */
export async function runLighthouse(
  pages: { name: string; url: string; headers?: Record<string, string> }[],
  saveDir: string,
): Promise<(LighthouseFigures | Error)[]> {
  const figures: (LighthouseFigures | Error)[] = [];
  for (const page of pages) {
    const lhr = await withChromium((port) => auditOnce(page.url, port, page.headers)).catch((error: Error) => error);
    if (lhr instanceof Error) {
      figures.push(lhr);
      continue;
    }
    await writeFile(path.join(saveDir, `lighthouse-${page.name}.json`), JSON.stringify(lhr));
    const metric = (id: string) => Number(lhr.audits[id]?.numericValue ?? Number.NaN);
    figures.push({
      score: Math.round((lhr.categories.performance?.score ?? 0) * 100),
      lcpMs: metric("largest-contentful-paint"),
      cls: metric("cumulative-layout-shift"),
      tbtMs: metric("total-blocking-time"),
      fcpMs: metric("first-contentful-paint"),
      auditErrors: Object.values(lhr.audits).flatMap((a) =>
        a.scoreDisplayMode === "error" ? [`${a.id}: ${a.errorMessage ?? "error"}`] : [],
      ),
    });
  }
  return figures;
}

/**
 * A fresh headless Chromium through chrome-launcher (Lighthouse's own launcher) on a port from
 * freePort (so BENCH_PORTS applies), with a throwaway profile; killed (also on Ctrl-C: the
 * launcher's SIGINT handler and `killAllChromium` below) when the audit is done.
 */
async function withChromium<T>(work: (port: number) => Promise<T>): Promise<T> {
  const chrome = await launch({
    chromePath: CHROMIUM_PATH,
    port: await freePort(),
    chromeFlags: ["--headless=new", "--no-sandbox", "--disable-gpu", "--disable-quic", "--enable-unsafe-swiftshader"],
    logLevel: "silent",
  });
  try {
    return await work(chrome.port);
  } finally {
    chrome.kill();
  }
}

/** Ends every Chromium chrome-launcher started (for exit and signal handlers). */
export const killAllChromium = () => void killAll();

/**
 * One audit, tried up to three times when Lighthouse reports a runtime error: on a busy machine its
 * trace recording sometimes misses the navigation start (NO_NAVSTART) and asks to be run again.
 */
async function auditOnce(url: string, port: number, headers?: Record<string, string>) {
  let message = "";
  for (let attempt = 1; attempt <= 3; attempt++) {
    const result = await lighthouse(url, {
      port,
      logLevel: "error",
      output: "json",
      onlyCategories: ["performance"],
      extraHeaders: headers,
    });
    const lhr = result?.lhr;
    if (lhr && !lhr.runtimeError) return lhr;
    message = lhr?.runtimeError ? `${lhr.runtimeError.code} ${lhr.runtimeError.message}` : "no report";
    process.stderr.write(`bench: Lighthouse on ${url}, attempt ${attempt}: ${message}\n`);
  }
  throw new Error(`Lighthouse on ${url}: ${message}`);
}
