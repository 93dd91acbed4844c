import { StringDecoder } from "node:string_decoder";
import { Transform } from "node:stream";

const PRELOAD_LINK = /<link rel="modulepreload" href="([^"]+)"[^>]*>/g;
const HEAD_END = "</head>";
const MODULE_SCRIPT = /<script(?: nonce="([^"]*)")? type="module" async="">/;
const SCRIPT_END = "</script>";

/**
 * The page's HTML with its JavaScript started after the first paint. The page is rendered on the
 * server and its stylesheet is inline, so the first paint needs none of the code, which only makes
 * the page interactive; on a slow connection the route modules would otherwise share the line with
 * the rest of the document and hold back its paint.
 *
 * React Router's module preload links are taken out of the head, and its module script (the one
 * that imports the route modules and hydrates) becomes a small classic script with the same nonce
 * that, once the first frame is painted (a timer set in an animation frame), adds the module script
 * back and then the preload links, one per task: added all at once they made one long task
 * (65–130 ms with the CPU slowed four times, measured in Chromium's trace). A page that is not
 * visible paints no frame and starts at once. Everything else streams through untouched. `onFinal`
 * runs when the stream ends (the caller's render timeout). `stylesheets` (the web fonts) are added
 * by the start script too, first.
 */
export function scriptsAfterFirstPaint(
  onFinal: () => void = () => undefined,
  { stylesheets = [] }: { stylesheets?: string[] } = {},
): Transform {
  const decoder = new StringDecoder("utf8");
  const preloads: string[] = [];
  let state: "head" | "body" | "module" | "rest" = "head";
  // Text not yet sent: the start of a tag cut off by a chunk's end, or the module script so far.
  let pending = "";
  let nonce = "";

  /** Sends what is complete; keeps back from a "<" whose tag has not closed yet. */
  function splitAtOpenTag(text: string): [send: string, keep: string] {
    const lastOpen = text.lastIndexOf("<");
    if (lastOpen === -1 || text.indexOf(">", lastOpen) !== -1) return [text, ""];
    return [text.slice(0, lastOpen), text.slice(lastOpen)];
  }

  function take(text: string): string {
    let out = "";
    let rest = text;
    while (rest) {
      if (state === "rest") return out + rest;
      if (state === "head") {
        const end = rest.indexOf(HEAD_END);
        const head = end === -1 ? rest : rest.slice(0, end + HEAD_END.length);
        const [complete, keep] = end === -1 ? splitAtOpenTag(head) : [head, ""];
        out += complete.replace(PRELOAD_LINK, (_link, href: string) => {
          preloads.push(href);
          return "";
        });
        if (end === -1) return ((pending = keep), out);
        state = "body";
        rest = rest.slice(end + HEAD_END.length);
        continue;
      }
      if (state === "body") {
        const match = MODULE_SCRIPT.exec(rest);
        if (!match) {
          const [complete, keep] = splitAtOpenTag(rest);
          pending = keep;
          return out + complete;
        }
        out += rest.slice(0, match.index);
        nonce = match[1] ?? "";
        state = "module";
        rest = rest.slice(match.index + match[0].length);
        continue;
      }
      // state === "module": the script's text runs to the first "</script>" (a script cannot contain one).
      const end = rest.indexOf(SCRIPT_END);
      if (end === -1) return ((pending = rest), out);
      out += startAfterFirstPaint(rest.slice(0, end), preloads, nonce, stylesheets);
      state = "rest";
      rest = rest.slice(end + SCRIPT_END.length);
    }
    return out;
  }

  return new Transform({
    transform(chunk: Buffer, _encoding, callback) {
      if (state === "rest") return callback(null, chunk);
      const text = pending + decoder.write(chunk);
      pending = "";
      callback(null, take(text));
    },
    flush(callback) {
      const text = pending + decoder.end();
      pending = "";
      onFinal();
      if (state === "module") {
        // Cut off inside the module script (the render timed out): send it as it came.
        return callback(null, `<script${nonce ? ` nonce="${nonce}"` : ""} type="module" async="">${text}`);
      }
      callback(null, state === "rest" ? text : take(text) + pending);
    },
  });
}

/** A JSON string safe inside an inline script: no "</script>", "<!--" or line separators. */
const scriptString = (value: unknown) =>
  JSON.stringify(value)
    .replace(/</g, "\\u003c")
    .replace(/\u2028/g, "\\u2028")
    .replace(/\u2029/g, "\\u2029");

/** How long the code waits at most for a first contentful paint (a page with nothing to paint). */
export const START_AT_THE_LATEST_MS = 2000;

/**
 * The classic script that adds `stylesheets` (the web fonts), then puts the module script and the
 * preloads back once the first contentful
 * paint is done (seen through a PerformanceObserver; where the browser reports no paint timing, one
 * frame later), at the latest after START_AT_THE_LATEST_MS, and at once in a page that is not visible.
 */
export function startAfterFirstPaint(
  moduleCode: string,
  preloads: string[],
  nonce: string,
  stylesheets: string[] = [],
): string {
  const attribute = nonce ? ` nonce="${nonce}"` : "";
  return (
    `<script${attribute}>(function(p,c,n,q){var d=document,w=window,O=w.PerformanceObserver,f="first-contentful-paint",done=0;` +
    `function s(){if(done)return;done=1;` +
    `q.forEach(function(h){var l=d.createElement("link");l.rel="stylesheet";l.href=h;d.head.appendChild(l)});` +
    `var e=d.createElement("script");e.type="module";if(n)e.nonce=n;e.textContent=c;d.head.appendChild(e);` +
    `var i=0;(function a(){if(i>=p.length)return;var l=d.createElement("link");l.rel="modulepreload";l.href=p[i++];d.head.appendChild(l);setTimeout(a,0)})()}` +
    `if(d.visibilityState!=="visible")return s();` +
    `setTimeout(s,${START_AT_THE_LATEST_MS});` +
    `if(!O||!O.supportedEntryTypes||O.supportedEntryTypes.indexOf("paint")<0||performance.getEntriesByName(f).length)` +
    `return requestAnimationFrame(function(){setTimeout(s,0)});` +
    `new O(function(l,o){if(l.getEntriesByName(f).length){o.disconnect();setTimeout(s,0)}}).observe({type:"paint",buffered:true})})` +
    `(${scriptString(preloads)},${scriptString(moduleCode)},${scriptString(nonce)},${scriptString(stylesheets)})</script>`
  );
}
