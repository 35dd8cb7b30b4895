import { createContext, useContext } from "react";

/** This response's script nonce, provided by the server entry; undefined in the browser. */
export const NonceContext = createContext<string | undefined>(undefined);

export function useNonce(): string | undefined {
  return useContext(NonceContext);
}
