import { useSyncExternalStore } from "react";

const noSubscription = () => () => {};

/**
 * A value only the browser knows (its time zone, WebGL, the address's fragment): `serverValue` in
 * the server's HTML and while hydrating, so the markup matches, then `read()` in the browser. No
 * effect and no second render of state: React switches over itself once hydration is done.
 * `read` must return the same value (a primitive, or a cached object) each time it is called.
 */
export function useBrowserValue<T>(read: () => T, serverValue: T): T {
  return useSyncExternalStore(noSubscription, read, () => serverValue);
}

/** False in the server's HTML and during hydration, true afterwards. */
export function useHydrated(): boolean {
  return useBrowserValue(() => true, false);
}
