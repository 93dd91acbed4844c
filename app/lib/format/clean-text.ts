/*
 * Text typed into a form, cleaned before anything stores it or builds an e-mail subject from it.
 * Removed: C0 and C1 control characters (CR and LF among them: a header injection needs them),
 * DEL, the Unicode line and paragraph separators, the bidirectional embeddings, overrides and
 * isolates with the LRM/RLM/ALM marks (Unicode Standard Annex #9: they reorder what a reader sees),
 * zero-width spaces and the byte-order mark. ZWJ and ZWNJ stay: scripts and emoji sequences use them.
 */
const SINGLE_LINE_JUNK =
  /[\u0000-\u001f\u007f-\u009f\u061c\u200b\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069\ufeff]/g;
const MULTI_LINE_JUNK =
  /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u061c\u200b\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069\ufeff]/g;

/** One line of text: every control or layout character becomes a space, runs of spaces become one. */
export function toSingleLine(value: string): string {
  return value.replace(SINGLE_LINE_JUNK, " ").replace(/ {2,}/g, " ");
}

/** Text with line breaks (notes): CRLF and CR become LF, tabs stay, every other control character goes. */
export function toCleanLines(value: string): string {
  return value.replace(/\r\n?/g, "\n").replace(MULTI_LINE_JUNK, "");
}
