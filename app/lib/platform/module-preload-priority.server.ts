import { StringDecoder } from "node:string_decoder";
import { Transform } from "node:stream";

const PRELOAD = '<link rel="modulepreload"';
const LOW = '<link rel="modulepreload" fetchpriority="low"';
const HEAD_END = "</head>";

/**
 * The page's HTML with React Router's module preload links at low fetch priority. The first paint
 * needs none of that JavaScript (the page is rendered on the server and its stylesheet is inline),
 * so on a slow connection the document and the fonts go first and the code, needed only to make the
 * page interactive, after. Only the head is rewritten; the rest streams through untouched.
 * `onFinal` runs when the stream ends (the caller's render timeout).
 */
export function lowPriorityModulePreloads(onFinal: () => void = () => undefined): Transform {
  const decoder = new StringDecoder("utf8");
  // The end of the previous chunk, in case a link's opening is split across two chunks.
  let carry = "";
  let inHead = true;
  return new Transform({
    transform(chunk: Buffer, _encoding, callback) {
      if (!inHead) return callback(null, chunk);
      const text = carry + decoder.write(chunk);
      carry = "";
      const headEnd = text.indexOf(HEAD_END);
      if (headEnd !== -1) {
        inHead = false;
        const cut = headEnd + HEAD_END.length;
        return callback(null, text.slice(0, cut).replaceAll(PRELOAD, LOW) + text.slice(cut));
      }
      const out = text.replaceAll(PRELOAD, LOW);
      // Hold back a tail that may be a link's opening or "</head>" cut off by the chunk's end.
      const lastTag = out.lastIndexOf("<");
      const tail = lastTag === -1 ? "" : out.slice(lastTag);
      if (tail.length < PRELOAD.length && (PRELOAD.startsWith(tail) || HEAD_END.startsWith(tail))) {
        carry = tail;
        return callback(null, out.slice(0, lastTag));
      }
      callback(null, out);
    },
    flush(callback) {
      const rest = carry + decoder.end();
      onFinal();
      callback(null, inHead ? rest.replaceAll(PRELOAD, LOW) : rest);
    },
  });
}
