import { Readable } from "node:stream";
import { expect, test } from "vitest";
import { lowPriorityModulePreloads } from "~/lib/platform/module-preload-priority.server";

// The attribute is the HTML standard's fetchpriority on <link>
// (https://html.spec.whatwg.org/multipage/urls-and-fetching.html#fetch-priority-attributes).
const HTML =
  '<!DOCTYPE html><html><head><meta charSet="utf-8"/><title>Feuerstelle · Grillplatz</title>' +
  '<link rel="modulepreload" href="/assets/entry.client-A.js" nonce="n"/>' +
  '<link rel="modulepreload" href="/assets/root-B.js" nonce="n"/>' +
  '</head><body><p>Text mentioning &lt;link rel="modulepreload"&gt; stays.</p>' +
  '<script>const s = \'<link rel="modulepreload" href="/x.js">\';</script></body></html>';

async function through(chunks: Buffer[]): Promise<string> {
  let finals = 0;
  const out: Buffer[] = [];
  const stream = Readable.from(chunks).pipe(lowPriorityModulePreloads(() => finals++));
  for await (const chunk of stream) out.push(chunk as Buffer);
  expect(finals).toBe(1);
  return Buffer.concat(out).toString("utf8");
}

const expected = HTML.replace(
  /<link rel="modulepreload" href="\/assets/g,
  '<link rel="modulepreload" fetchpriority="low" href="/assets',
);

test("the head's module preloads get fetchpriority=low; the body is untouched", async () => {
  const result = await through([Buffer.from(HTML)]);
  expect(result).toBe(expected);
  expect(result.match(/fetchpriority="low"/g)).toHaveLength(2);
  expect(result).toContain('const s = \'<link rel="modulepreload" href="/x.js">\'');
});

test("the same for every split of the document into two chunks, also inside a link or a UTF-8 character", async () => {
  const bytes = Buffer.from(HTML);
  for (let cut = 1; cut < bytes.length; cut++) {
    expect(await through([bytes.subarray(0, cut), bytes.subarray(cut)])).toBe(expected);
  }
});
