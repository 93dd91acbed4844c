import { startTransition, useEffect, useState } from "react";

/** Set once the first page has hydrated: later pages render browser values from the start. */
let hasHydrated = false;

/**
 * A value only the browser knows (its time zone, WebGL, the address's fragment): `serverValue` in
 * the server's HTML and while hydrating, so the markup matches, then `read()` in the browser.
 *
 * The switch is a transition, which React renders in slices between the browser's own work; a
 * store read instead (useSyncExternalStore) re-renders the whole page in one synchronous pass right
 * after hydration, one long task on a phone. Parts of a page shown after the first one has hydrated
 * (client navigation) read the browser's value straight away. `read` should be cheap; work such as a
 * WebGL probe belongs in an idle callback of its own.
 */
export function useBrowserValue<T>(read: () => T, serverValue: T): T {
  const [value, setValue] = useState<T>(() => (hasHydrated ? read() : serverValue));
  useEffect(() => {
    hasHydrated = true;
    const current = read();
    if (!Object.is(current, value)) startTransition(() => setValue(current));
    // Once, when the part first runs in the browser.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);
  return value;
}

const isBrowser = () => true;

/** False in the server's HTML and during hydration, true afterwards. */
export function useHydrated(): boolean {
  return useBrowserValue(isBrowser, false);
}
