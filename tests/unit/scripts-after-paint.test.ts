import { Readable } from "node:stream";
import { runInNewContext } from "node:vm";
import { expect, test } from "vitest";
import { scriptsAfterFirstPaint, START_AT_THE_LATEST_MS } from "~/lib/platform/scripts-after-paint.server";

// The markup is what React Router 7's <Scripts /> renders (module preloads hoisted into the head by
// React 19, then one inline module script); "modulepreload" is the HTML standard's link type
// (https://html.spec.whatwg.org/multipage/links.html#link-type-modulepreload).
const MODULE_CODE =
  ';\nimport * as route0 from "/assets/root-B.js";\nwindow.__m = {"é":"</p>\\u2028"};\nimport("/assets/entry.client-A.js");';
const HTML =
  '<!DOCTYPE html><html><head><meta charSet="utf-8"/><title>Feuerstelle · Grillplatz</title>' +
  '<link rel="modulepreload" href="/assets/entry.client-A.js" nonce="n+/="/>' +
  '<link rel="modulepreload" href="/assets/root-B.js" nonce="n+/="/>' +
  '</head><body><p>Text mentioning &lt;link rel="modulepreload"&gt; stays.</p>' +
  '<script nonce="n+/=">const s = \'<link rel="modulepreload" href="/x.js">\';</script>' +
  `<script nonce="n+/=" type="module" async="">${MODULE_CODE}</script>` +
  '<script nonce="n+/=">window.__later = 1;</script></body></html>';

async function through(chunks: Buffer[], stylesheets?: string[]): Promise<string> {
  let finals = 0;
  const out: Buffer[] = [];
  const stream = Readable.from(chunks).pipe(scriptsAfterFirstPaint(() => finals++, { stylesheets }));
  for await (const chunk of stream) out.push(chunk as Buffer);
  expect(finals).toBe(1);
  return Buffer.concat(out).toString("utf8");
}

type Added = { tag: string; rel?: string; href?: string; type?: string; nonce?: string; textContent?: string };

/**
 * Runs the page's start script against a stand-in document: what it adds to the head, and the
 * callbacks it left waiting (timers, animation frames, a paint observer).
 */
function runStartScript(html: string, browser: { visible: boolean; paintTiming: boolean; painted?: boolean }) {
  const script = /<script nonce="n\+\/=">(\(function\(p,c,n,q\)[\s\S]*?)<\/script>/.exec(html)?.[1];
  expect(script).toBeDefined();
  const added: Added[] = [];
  const timers: { fn: () => void; ms: number }[] = [];
  const frames: (() => void)[] = [];
  const observers: ((list: { getEntriesByName: (n: string) => unknown[] }, o: { disconnect(): void }) => void)[] = [];
  const element = (tag: string) => {
    const el: Added = { tag };
    added.push(el);
    return el;
  };
  class PerformanceObserver {
    static supportedEntryTypes = browser.paintTiming ? ["paint", "largest-contentful-paint"] : ["navigation"];
    constructor(public callback: (typeof observers)[number]) {
      observers.push(callback);
    }
    observe() {}
  }
  const context = {
    document: {
      visibilityState: browser.visible ? "visible" : "hidden",
      createElement: element,
      head: { appendChild: () => undefined },
    },
    window: {} as Record<string, unknown>,
    performance: { getEntriesByName: () => (browser.painted ? [{}] : []) },
    setTimeout: (fn: () => void, ms: number) => timers.push({ fn, ms }),
    requestAnimationFrame: (fn: () => void) => frames.push(fn),
  };
  context.window.PerformanceObserver = PerformanceObserver;
  runInNewContext(script!, context);
  return { added, timers, frames, observers };
}

test("the head loses its module preloads; the module script becomes a start script with the same nonce", async () => {
  const result = await through([Buffer.from(HTML)]);
  expect(result.slice(0, result.indexOf("</head>"))).not.toContain("modulepreload");
  expect(result).not.toContain('type="module" async');
  // Untouched: text and other scripts that merely mention a preload, and everything after.
  expect(result).toContain('<p>Text mentioning &lt;link rel="modulepreload"&gt; stays.</p>');
  expect(result).toContain('const s = \'<link rel="modulepreload" href="/x.js">\';</script>');
  expect(result).toContain('<script nonce="n+/=">window.__later = 1;</script></body></html>');
  // The start script cannot end early: "</" inside the module's text is escaped.
  const start = result.slice(result.indexOf("(function(p,c,n,q)"));
  expect(start.indexOf("</script>")).toBe(start.indexOf(')</script><script nonce="n+/=">window.__later') + 1);
});

test("after the first contentful paint the preloads and the module script come back, the module code unchanged", async () => {
  const result = await through([Buffer.from(HTML)]);
  const page = runStartScript(result, { visible: true, paintTiming: true });
  expect(page.added).toHaveLength(0);
  expect(page.timers.map((t) => t.ms)).toEqual([START_AT_THE_LATEST_MS]);
  // A paint that is not the first contentful one changes nothing.
  page.observers[0]!({ getEntriesByName: () => [] }, { disconnect: () => undefined });
  expect(page.timers).toHaveLength(1);
  let disconnected = false;
  page.observers[0]!({ getEntriesByName: () => [{}] }, { disconnect: () => (disconnected = true) });
  expect(disconnected).toBe(true);
  page.timers[1]!.fn();
  // The module script first, then one preload per task.
  expect(page.added).toEqual([
    { tag: "script", type: "module", nonce: "n+/=", textContent: MODULE_CODE },
    { tag: "link", rel: "modulepreload", href: "/assets/entry.client-A.js" },
  ]);
  page.timers[2]!.fn();
  expect(page.added.at(-1)).toEqual({ tag: "link", rel: "modulepreload", href: "/assets/root-B.js" });
  page.timers[3]!.fn();
  expect(page.timers).toHaveLength(4);
  // The fallback timer later does not add them twice.
  page.timers[0]!.fn();
  expect(page.added).toHaveLength(3);
});

test("stylesheets given to the start script (the web fonts) are added first, after the first paint too", async () => {
  const result = await through([Buffer.from(HTML)], ["/assets/fonts-C.css"]);
  expect(result.slice(0, result.indexOf("</head>"))).not.toContain("fonts-C.css");
  const page = runStartScript(result, { visible: true, paintTiming: true });
  expect(page.added).toHaveLength(0);
  page.observers[0]!({ getEntriesByName: () => [{}] }, { disconnect: () => undefined });
  page.timers[1]!.fn();
  expect(page.added.slice(0, 2)).toEqual([
    { tag: "link", rel: "stylesheet", href: "/assets/fonts-C.css" },
    { tag: "script", type: "module", nonce: "n+/=", textContent: MODULE_CODE },
  ]);
});

test("a hidden page starts at once; without paint timing, one frame after the start script ran", async () => {
  const result = await through([Buffer.from(HTML)]);
  const hidden = runStartScript(result, { visible: false, paintTiming: true });
  for (const timer of [...hidden.timers]) timer.fn();
  expect(hidden.added).toHaveLength(3);
  const old = runStartScript(result, { visible: true, paintTiming: false });
  expect(old.added).toHaveLength(0);
  old.frames[0]!();
  old.timers.find((t) => t.ms === 0)!.fn();
  while (old.timers.length > 2) old.timers.splice(2, 1)[0]!.fn();
  expect(old.added).toHaveLength(3);
  // Already painted by the time the script runs: also one frame later.
  const late = runStartScript(result, { visible: true, paintTiming: true, painted: true });
  expect(late.frames).toHaveLength(1);
  expect(late.observers).toHaveLength(0);
});

test("the same for every split of the document into two chunks, also inside a tag or a UTF-8 character", async () => {
  const whole = await through([Buffer.from(HTML)]);
  const bytes = Buffer.from(HTML);
  for (let cut = 1; cut < bytes.length; cut++) {
    expect(await through([bytes.subarray(0, cut), bytes.subarray(cut)])).toBe(whole);
  }
});

test("a document cut off inside the module script is sent as it came, without the preloads", async () => {
  const cutOff = HTML.slice(0, HTML.indexOf("import * as route0") + 10);
  const result = await through([Buffer.from(cutOff)]);
  const head = cutOff.slice(0, cutOff.indexOf("</head>"));
  expect(result).toBe(head.replace(/<link rel="modulepreload"[^>]*>/g, "") + cutOff.slice(head.length));
});
