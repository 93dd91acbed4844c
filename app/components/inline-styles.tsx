import { createContext, useContext } from "react";

/**
 * The app's stylesheet, set in the document's head as a <style> element rather than linked, so the
 * first paint waits for no request (on a phone's first visit that request costs a round trip or
 * more). Only the server has the text (entry.server reads the built file); in the browser it is
 * read back from the document once, so it never travels in the JavaScript as well.
 */
const InlineStylesContext = createContext<string | null>(null);

export const InlineStylesProvider = InlineStylesContext.Provider;

export const INLINE_STYLES_ID = "app-styles";

const fromDocument =
  typeof document === "undefined" ? null : (document.getElementById(INLINE_STYLES_ID)?.textContent ?? null);

/** The stylesheet's text when the document carries it inline, else null (then it is linked). */
export function useInlineStyles(): string | null {
  return useContext(InlineStylesContext) ?? fromDocument;
}
