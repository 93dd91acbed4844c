import { createContext, useContext } from "react";

// The CSP nonce reaches the document only on the server; browsers hide it from scripts anyway.
const NonceContext = createContext("");

export const NonceProvider = NonceContext.Provider;

export function useNonce(): string {
  return useContext(NonceContext);
}
